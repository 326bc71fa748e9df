package org.roundtable.statistics.robust;

import org.roundtable.statistics.Checks;

/**
 * Normalised interquartile range (nIQR), a robust standard deviation.
 *
 * <p>Definition: {@code nIQR = 0.7413 · (Q3 − Q1)}, with the quartiles Q1, Q3 computed by a
 * named {@link QuartileRule} (default {@link QuartileRule#HYNDMAN_FAN_7}, R's default).
 *
 * <p>Symbols: 0.7413 ≈ 1/(2Φ⁻¹(0.75)) = 0.741301…, as rounded in ISO 13528.
 *
 * <p>Special cases: for small p the quartile rule changes nIQR a lot (ISO 5725-5 creosote
 * cell means: 0.62 with type 7, 0.94 with type 6), so the rule is always reported. When the
 * middle half of the data are equal nIQR is 0; the value is returned and the caller must not use
 * it as a scale.
 *
 * <p>References: ISO 13528:2015, Annex C (nIQR); Hyndman R.J., Fan Y. (1996) The American
 * Statistician 50:361–365.
 */
public final class NormalizedIqr {

    /** Normalising factor for the interquartile range, as rounded in ISO 13528. */
    public static final double NIQR_FACTOR = 0.7413;

    private NormalizedIqr() {
    }

    /**
     * nIQR with the default quartile rule (Hyndman–Fan type 7).
     *
     * @throws IllegalArgumentException if empty or a value is not finite
     */
    public static double of(double[] values) {
        return of(values, QuartileRule.DEFAULT);
    }

    /**
     * nIQR with the given quartile rule.
     *
     * @throws IllegalArgumentException if empty or a value is not finite
     */
    public static double of(double[] values, QuartileRule rule) {
        Checks.requireFinite(values, 1, "nIQR");
        double[] sorted = SortedCopy.of(values);
        return ofSorted(sorted, rule);
    }

    /** nIQR of values already sorted ascending (not checked). */
    public static double ofSorted(double[] sorted, QuartileRule rule) {
        return NIQR_FACTOR * (rule.quantileOfSorted(sorted, 0.75) - rule.quantileOfSorted(sorted, 0.25));
    }
}
