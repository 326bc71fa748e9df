package org.roundtable.statistics;

import java.util.Objects;

/**
 * A diagnostic attached to a statistical result: a stable machine-readable code and a sentence
 * for people.
 *
 * @param code    stable identifier, lower case with hyphens (e.g. {@code zero-spread})
 * @param message explanation for a report reader
 */
public record StatisticsWarning(String code, String message) {

    public StatisticsWarning {
        Objects.requireNonNull(code, "code");
        Objects.requireNonNull(message, "message");
    }
}
