package org.roundtable.web;

import java.util.List;

/**
 * The error body of every JSON endpoint: status, a short title and a plain detail. Never a class name
 * or a stack trace. {@code errors} lists field- or row-level problems where there are several.
 */
public record Problem(int status, String title, String detail, String requestId, List<FieldError> errors) {

    /** One specific problem: row (1 = header; null where not applicable), field or column, value, key, message. */
    public record FieldError(Integer row, String field, String value, String key, String message) {
    }

    public static Problem of(int status, String title, String detail, String requestId) {
        return new Problem(status, title, detail, requestId, List.of());
    }
}
