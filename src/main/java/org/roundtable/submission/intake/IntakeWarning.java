package org.roundtable.submission.intake;

import java.util.Objects;

/**
 * Something unusual in an accepted upload that the laboratory confirms before the submission is stored, e.g. a value
 * outside the expected range (a real unit slip must still reach the evaluation, where it shows as an outlier).
 *
 * @param row     the row as in {@link IntakeProblem#row()}; 0 for a warning about the upload as a whole
 * @param column  the column or field name, or {@code null}
 * @param value   the text concerned, or {@code null}
 * @param key     a stable warning key, one of the {@code WARNING_*} constants of {@link IntakeKey}
 * @param message a plain English message, naming the measurand and the range where that applies
 */
public record IntakeWarning(int row, String column, String value, String key, String message) {

    public IntakeWarning {
        Objects.requireNonNull(key, "key");
        Objects.requireNonNull(message, "message");
    }

    static IntakeWarning of(int row, String column, String value, IntakeKey key, String message) {
        return new IntakeWarning(row, column, Texts.shown(value), key.key(), message);
    }
}
