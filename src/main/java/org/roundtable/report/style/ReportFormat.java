package org.roundtable.report.style;

import org.roundtable.platform.NumberFormats;

/**
 * Number formatting for reports: delegates to the product's one number-rules class
 * {@link NumberFormats} (rounding half away from zero, U+2212 for negatives, no exponent).
 */
public final class ReportFormat {

    /** The minus sign U+2212. */
    public static final String MINUS = NumberFormats.MINUS;
    /** Printed where a number does not exist. */
    public static final String NONE = NumberFormats.NONE;

    private ReportFormat() {
    }

    /** {@code value} with {@code digits} decimals, or {@link #NONE} for {@code null} or a non-finite value. */
    public static String decimal(Double value, int digits) {
        return NumberFormats.decimal(value, digits);
    }

    /** A score with the default score decimals. */
    public static String score(Double score) {
        return NumberFormats.score(score, NumberFormats.DEFAULT_SCORE_DECIMALS);
    }

    /** A score with the plan's score decimals. */
    public static String score(Double score, int scoreDecimals) {
        return NumberFormats.score(score, scoreDecimals);
    }

    /** A score with an explicit sign at the plan's score decimals. */
    public static String signedScore(Double score, int scoreDecimals) {
        return NumberFormats.signedScore(score, scoreDecimals);
    }

    /** A score with an explicit sign: {@code +1.25}, {@code −0.40}, {@code 0.00}. */
    public static String signedScore(Double score) {
        return NumberFormats.signedScore(score, NumberFormats.DEFAULT_SCORE_DECIMALS);
    }

    /** Replaces every hyphen-minus that stands for a negative sign in free text by U+2212. */
    public static String minusSigns(String text) {
        return NumberFormats.minusSigns(text);
    }
}
