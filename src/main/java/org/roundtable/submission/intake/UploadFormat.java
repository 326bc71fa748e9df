package org.roundtable.submission.intake;

import java.util.Locale;
import java.util.Optional;

/** The three channels of a result upload; all share one validation path. */
public enum UploadFormat {
    CSV,
    XLSX,
    JSON;

    /**
     * The format a file name declares by its extension ({@code .csv}, {@code .xlsx}, {@code .json}, any case).
     * The content is still checked against the declared type ({@code file.type-mismatch}).
     */
    public static Optional<UploadFormat> fromFileName(String fileName) {
        if (fileName == null) {
            return Optional.empty();
        }
        String lower = fileName.toLowerCase(Locale.ROOT);
        if (lower.endsWith(".csv")) {
            return Optional.of(CSV);
        }
        if (lower.endsWith(".xlsx")) {
            return Optional.of(XLSX);
        }
        if (lower.endsWith(".json")) {
            return Optional.of(JSON);
        }
        return Optional.empty();
    }
}
