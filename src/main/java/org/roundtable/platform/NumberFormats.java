package org.roundtable.platform;

import java.math.BigDecimal;
import java.math.RoundingMode;

/**
 * The product's one set of number rules: reports, exports, the {@code evaluate} command and the pages'
 * template extension all call this class, so that a number prints the same everywhere.
 *
 * <ul>
 *   <li><b>Results</b> (a laboratory's value, an assigned value as a result) at the measurand's reporting
 *       digits (decimals).</li>
 *   <li><b>Statistics and uncertainties</b> (x_pt, σpt, u(x_pt), robust SD, U) at reporting digits + 1.</li>
 *   <li><b>Scores</b> (z, z′, ζ, En) at the plan's score decimals (default {@value #DEFAULT_SCORE_DECIMALS}).</li>
 * </ul>
 *
 * <p>Rounding is half away from zero ({@link RoundingMode#HALF_UP} on the magnitude), starting from the
 * shortest decimal representation of the double ({@link BigDecimal#valueOf(double)}), so 0.125 prints as
 * 0.13 and −0.125 as −0.13. A value that rounds to zero prints without a sign. Text for people uses the
 * minus sign U+2212; text for machines (CSV, JSON strings) uses the ASCII hyphen-minus. No form ever uses
 * an exponent. Common practice (ASTM E29 "rounding method", from memory); no further source.
 */
public final class NumberFormats {

    /** Score decimals when a plan does not set them. */
    public static final int DEFAULT_SCORE_DECIMALS = 2;
    /** The minus sign U+2212, for text read by people. */
    public static final String MINUS = "\u2212";
    /** Printed for people where a number does not exist. */
    public static final String NONE = "\u2013";

    private NumberFormats() {
    }

    /**
     * {@code value} rounded half away from zero to {@code decimals} decimals, or {@code null} for a null or
     * non-finite value. Negative zero becomes zero.
     */
    public static BigDecimal rounded(Double value, int decimals) {
        if (value == null || !Double.isFinite(value)) {
            return null;
        }
        BigDecimal rounded = BigDecimal.valueOf(value).setScale(decimals, RoundingMode.HALF_UP);
        return rounded.signum() == 0 ? rounded.abs() : rounded;
    }

    /** For people: {@code decimals} decimals with U+2212 for negatives, {@link #NONE} where there is no number. */
    public static String decimal(Double value, int decimals) {
        BigDecimal rounded = rounded(value, decimals);
        if (rounded == null) {
            return NONE;
        }
        String text = rounded.toPlainString();
        return text.startsWith("-") ? MINUS + text.substring(1) : text;
    }

    /** For machines: {@code decimals} decimals with an ASCII minus, empty where there is no number. */
    public static String plain(Double value, int decimals) {
        BigDecimal rounded = rounded(value, decimals);
        return rounded == null ? "" : rounded.toPlainString();
    }

    /**
     * For machines at full precision: the shortest decimal that reads back as the same double, never with an
     * exponent ({@code 2.959826895276144E-4} becomes {@code 0.0002959826895276144}); empty where there is no
     * number.
     */
    public static String full(Double value) {
        if (value == null || !Double.isFinite(value)) {
            return "";
        }
        BigDecimal exact = BigDecimal.valueOf(value);
        if (exact.signum() == 0) {
            return "0";
        }
        String text = exact.stripTrailingZeros().toPlainString();
        return text;
    }

    /**
     * For people: {@code significant} significant digits (half away from zero, never an exponent, U+2212 for
     * negatives), for numbers that are not a measurand's quantity — a share in per cent, a ratio, a p-value.
     * {@code 0.01335989289173295} at 3 digits prints as {@code 0.0134}; {@code 1234.5} at 4 as {@code 1235}, at 3
     * as {@code 1230}.
     */
    public static String significant(Double value, int significant) {
        if (value == null || !Double.isFinite(value)) {
            return NONE;
        }
        BigDecimal exact = BigDecimal.valueOf(value);
        if (exact.signum() == 0) {
            return "0";
        }
        BigDecimal rounded = exact.round(new java.math.MathContext(significant, RoundingMode.HALF_UP));
        if (rounded.scale() < 0) {
            rounded = rounded.setScale(0, RoundingMode.HALF_UP);
        }
        String text = rounded.toPlainString();
        return text.startsWith("-") ? MINUS + text.substring(1) : text;
    }

    /** A laboratory's result (or any value stated like one) at the measurand's reporting digits. */
    public static String result(Double value, int reportingDigits) {
        return decimal(value, reportingDigits);
    }

    /** A statistic or an uncertainty (x_pt, σpt, u(x_pt), s*, U) at reporting digits + 1. */
    public static String statistic(Double value, int reportingDigits) {
        return decimal(value, reportingDigits + 1);
    }

    /** A score (z, z′, ζ, En) at the plan's score decimals. */
    public static String score(Double score, int scoreDecimals) {
        return decimal(score, scoreDecimals);
    }

    /** A score with an explicit sign for people: {@code +1.25}, {@code −0.40}, {@code 0.00}. */
    public static String signedScore(Double score, int scoreDecimals) {
        BigDecimal rounded = rounded(score, scoreDecimals);
        String text = decimal(score, scoreDecimals);
        return rounded != null && rounded.signum() > 0 ? "+" + text : text;
    }

    /** Machine forms of the three kinds, for CSV cells and JSON strings. */
    public static String plainResult(Double value, int reportingDigits) {
        return plain(value, reportingDigits);
    }

    /** A statistic or an uncertainty for machines at reporting digits + 1. */
    public static String plainStatistic(Double value, int reportingDigits) {
        return plain(value, reportingDigits + 1);
    }

    /** A score for machines at the plan's score decimals. */
    public static String plainScore(Double score, int scoreDecimals) {
        return plain(score, scoreDecimals);
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
