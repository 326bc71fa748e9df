package org.roundtable.submission.intake;

import java.util.Objects;

/**
 * One reason an upload was rejected.
 *
 * @param row     the row as a spreadsheet shows it: 1 is the header row of CSV/XLSX, for JSON the result's index + 1;
 *                0 for a problem with the file as a whole
 * @param column  the column name (CSV/XLSX header name in our spelling, JSON field name; for an unknown header the
 *                name as written, shortened like {@code value}), or {@code null} when the problem concerns the whole
 *                row or file
 * @param value   the offending text, shortened to at most 80 characters with control characters made visible, or
 *                {@code null}
 * @param key     a stable error key, one of {@link IntakeKey#key()}
 * @param message a plain English message for the laboratory
 */
public record IntakeProblem(int row, String column, String value, String key, String message) {

    public IntakeProblem {
        Objects.requireNonNull(key, "key");
        Objects.requireNonNull(message, "message");
        if (row < 0) {
            throw new IllegalArgumentException("row must be >= 0");
        }
    }

    static IntakeProblem of(int row, String column, String value, IntakeKey key, String message) {
        return new IntakeProblem(row, Texts.shown(column), Texts.shown(value), key.key(), message);
    }

    static IntakeProblem ofFile(IntakeKey key, String message) {
        return new IntakeProblem(0, null, null, key.key(), message);
    }
}
