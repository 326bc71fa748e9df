package org.roundtable.statistics.precision;

/**
 * ISO 5725-2 outcome of a consistency or outlier test.
 *
 * <p>Statistic within the 5 % critical value: accepted; between the 5 % and 1 % critical values:
 * straggler ({@code *}); beyond the 1 % critical value: statistical outlier ({@code **}).
 * Investigate before removing anything.
 *
 * <p>References: ISO 5725-2:1994, 7.3.2.
 */
public enum OutlierVerdict {
    ACCEPTED,
    STRAGGLER,
    OUTLIER,
    /** No critical value available: the statistic is reported without a verdict. */
    NOT_ASSESSED;

    /** Verdict for a test where large values are significant. */
    static OutlierVerdict upperTail(double statistic, double critical5, double critical1) {
        if (statistic <= critical5) {
            return ACCEPTED;
        }
        return statistic <= critical1 ? STRAGGLER : OUTLIER;
    }

    /** Verdict for a test where small values are significant (Grubbs double). */
    static OutlierVerdict lowerTail(double statistic, double critical5, double critical1) {
        if (statistic >= critical5) {
            return ACCEPTED;
        }
        return statistic >= critical1 ? STRAGGLER : OUTLIER;
    }

    /** True for a straggler or an outlier. */
    public boolean flagged() {
        return this == STRAGGLER || this == OUTLIER;
    }
}
