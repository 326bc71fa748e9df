package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.Optional;

/**
 * The range rules of a reported result that hold whatever the channel: the server's upload ({@link ResultValidator})
 * and the offline {@code evaluate} command both call them, so that both refuse the same numbers with the same words.
 *
 * <ul>
 *   <li>coverage factor k between {@value #COVERAGE_FACTOR_MIN_TEXT} and {@value #COVERAGE_FACTOR_MAX_TEXT}
 *       ({@code coverage-factor.out-of-range});</li>
 *   <li>a mass fraction (value or U) at most 100 % = 1 000 000 mg/kg ({@code value.above-100-percent});</li>
 *   <li>a mass fraction is not negative ({@code value.negative}).</li>
 * </ul>
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

    /**
     * Why a mass fraction in the unit with this symbol is out of range (above 100 %), or empty when it is in range
     * or the unit is not a mass-fraction unit ({@code %} or {@code mg/kg}).
     */
    public static Optional<String> aboveHundredPercent(BigDecimal value, String unitSymbol) {
        return MassFractionUnit.fromSymbol(unitSymbol).filter(u -> u.isAbove100Percent(value))
                .map(u -> IntakeKey.VALUE_ABOVE_100_PERCENT.defaultMessage());
    }

    /** The message for a negative mass fraction. */
    public static String negativeMessage() {
        return IntakeKey.VALUE_NEGATIVE.defaultMessage();
    }
}
