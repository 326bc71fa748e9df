package org.roundtable.submission.intake;

import java.math.BigDecimal;

/**
 * The range of the coverage factor k, between {@value #COVERAGE_FACTOR_MIN_TEXT} and {@value #COVERAGE_FACTOR_MAX_TEXT}
 * ({@code coverage-factor.out-of-range}). The other range rules (at most 100 %, negative values per measurand) live in
 * {@link ResultValidator}, which every channel runs — the offline {@code evaluate} command through
 * {@link ResultCheck}.
 */
public final class ResultRanges {

    static final String COVERAGE_FACTOR_MIN_TEXT = "1";
    static final String COVERAGE_FACTOR_MAX_TEXT = "4";
    /** Smallest coverage factor accepted. */
    public static final BigDecimal COVERAGE_FACTOR_MIN = new BigDecimal(COVERAGE_FACTOR_MIN_TEXT);
    /** Largest coverage factor accepted. */
    public static final BigDecimal COVERAGE_FACTOR_MAX = new BigDecimal(COVERAGE_FACTOR_MAX_TEXT);

    private ResultRanges() {
    }

    /** Whether k lies between 1 and 4 (inclusive). */
    public static boolean coverageFactorInRange(BigDecimal k) {
        return k.compareTo(COVERAGE_FACTOR_MIN) >= 0 && k.compareTo(COVERAGE_FACTOR_MAX) <= 0;
    }

    /** The message for a coverage factor out of range. */
    public static String coverageFactorMessage() {
        return "The coverage factor k must lie between " + COVERAGE_FACTOR_MIN_TEXT + " and " + COVERAGE_FACTOR_MAX_TEXT
                + ".";
    }
}
