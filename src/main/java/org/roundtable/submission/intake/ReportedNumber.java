package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.Objects;

/**
 * A number as the laboratory wrote it and as parsed.
 *
 * @param asReported the text exactly as in the upload (e.g. {@code 0,120} from a semicolon CSV); for an XLSX number
 *                   cell the text the sheet displays (with a General format: the plain decimal of the stored value);
 *                   for a JSON number the plain text of Jackson's {@link BigDecimal}
 * @param value      the parsed number; its scale keeps the reported decimals ({@code 0,120} → 0.120)
 */
public record ReportedNumber(String asReported, BigDecimal value) {

    public ReportedNumber {
        Objects.requireNonNull(asReported, "asReported");
        Objects.requireNonNull(value, "value");
    }

    /**
     * The decimal text used in the canonical payload: a decimal point, the reported decimals kept, at most one leading
     * zero ({@code 0,120} and {@code .120} both give {@code 0.120}). Equal across CSV, XLSX and JSON.
     */
    public String decimalText() {
        return value.toPlainString();
    }
}
