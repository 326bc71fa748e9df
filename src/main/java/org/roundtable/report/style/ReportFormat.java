package org.roundtable.report.style;

import java.math.BigDecimal;
import java.math.RoundingMode;

/**
 * Number formatting for reports.
 *
 * <p>Values are rounded half up (ASTM E29 rounding, from memory) to the measurand's reporting
 * digits; scores to two decimals. Rounding starts from the shortest decimal representation of the
 * double ({@link BigDecimal#valueOf(double)}), so 0.125 prints as 0.13. Negative numbers use the
 * minus sign U+2212, not the hyphen-minus; a value that rounds to zero prints without a sign.
 * Formatting is only for display: classifications are made on unrounded scores elsewhere.
 */
public final class ReportFormat {

    /** The minus sign U+2212. */
    public static final String MINUS = "\u2212";
    /** Printed where a number does not exist. */
    public static final String NONE = "\u2013";

    private ReportFormat() {
    }

    /** {@code value} with {@code digits} decimals, or {@link #NONE} for {@code null} or a non-finite value. */
    public static String decimal(Double value, int digits) {
        if (value == null || !Double.isFinite(value)) {
            return NONE;
        }
        BigDecimal rounded = BigDecimal.valueOf(value).setScale(digits, RoundingMode.HALF_UP);
        if (rounded.signum() == 0) {
            return rounded.abs().toPlainString();
        }
        String text = rounded.toPlainString();
        return text.startsWith("-") ? MINUS + text.substring(1) : text;
    }

    /** A score with two decimals. */
    public static String score(Double score) {
        return decimal(score, 2);
    }

    /** A score with an explicit sign: {@code +1.25}, {@code −0.40}, {@code 0.00}. */
    public static String signedScore(Double score) {
        String text = score(score);
        if (score == null || text.startsWith(MINUS) || text.equals(NONE) || BigDecimal.valueOf(score)
                .setScale(2, RoundingMode.HALF_UP).signum() == 0) {
            return text;
        }
        return "+" + text;
    }

    /** Replaces every hyphen-minus that stands for a negative sign in free text by U+2212. */
    public static String minusSigns(String text) {
        StringBuilder out = new StringBuilder(text.length());
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            boolean negative = c == '-' && i + 1 < text.length() && Character.isDigit(text.charAt(i + 1))
                    && (i == 0 || " (=±[".indexOf(text.charAt(i - 1)) >= 0);
            out.append(negative ? MINUS : String.valueOf(c));
        }
        return out.toString();
    }
}
