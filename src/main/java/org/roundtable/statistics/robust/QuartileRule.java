package org.roundtable.statistics.robust;

/**
 * How a sample quantile is interpolated between order statistics (Hyndman and Fan types).
 *
 * <p>With sorted values {@code x_(1) ≤ … ≤ x_(p)} and probability q, a position h is computed
 * and the quantile is {@code x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋))}, with h clamped to
 * [1, p].
 *
 * <p>References: Hyndman R.J., Fan Y. (1996) Sample quantiles in statistical packages. The
 * American Statistician 50:361–365.
 */
public enum QuartileRule {

    /** Type 5: h = p·q + 1/2 (piecewise linear, midpoints of the steps). */
    HYNDMAN_FAN_5,
    /** Type 6: h = (p + 1)·q (the "Weibull" plotting position). */
    HYNDMAN_FAN_6,
    /**
     * Type 7: h = (p − 1)·q + 1, the default of R's {@code quantile} and NumPy's
     * {@code percentile} ("linear"). Roundtable's default quartile rule.
     */
    HYNDMAN_FAN_7;

    /** The rule Roundtable uses unless told otherwise. */
    public static final QuartileRule DEFAULT = HYNDMAN_FAN_7;

    /**
     * The q-quantile of sorted values under this rule.
     *
     * @param sorted ascending values, at least one
     * @param q      probability in [0, 1]
     */
    public double quantileOfSorted(double[] sorted, double q) {
        int p = sorted.length;
        double h = switch (this) {
            case HYNDMAN_FAN_5 -> p * q + 0.5;
            case HYNDMAN_FAN_6 -> (p + 1) * q;
            case HYNDMAN_FAN_7 -> (p - 1) * q + 1;
        };
        if (h <= 1) {
            return sorted[0];
        }
        if (h >= p) {
            return sorted[p - 1];
        }
        int lower = (int) Math.floor(h);
        double fraction = h - lower;
        double a = sorted[lower - 1];
        double b = sorted[lower];
        return a + fraction * (b - a);
    }
}
