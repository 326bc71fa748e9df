package org.roundtable.statistics.descriptive;

import org.roundtable.statistics.Checks;

/**
 * Classical descriptive statistics computed with two-pass (centred) sums.
 *
 * <p>Numerical choice: every sum of squares is formed from deviations about the mean computed
 * in a first pass (plus a correction term, the sum of the deviations, that removes the residual
 * rounding of the mean). The one-pass form {@code Σx² − (Σx)²/p} is never used: it loses all
 * digits on data such as NIST StRD NumAcc4 ({@code 10000000.2 ± 0.1}).
 *
 * <p>References: Chan T.F., Golub G.H., LeVeque R.J. (1983) Algorithms for computing the sample
 * variance: analysis and recommendations. The American Statistician 37:242–247 (corrected
 * two-pass algorithm); NIST Statistical Reference Datasets, Univariate Summary Statistics.
 */
public final class Descriptive {

    private Descriptive() {
    }

    /**
     * Arithmetic mean.
     *
     * <p>Definition: {@code x̄ = Σx_i / p}, computed as a shift by the first value plus the mean
     * of the shifted values, then corrected by the mean residual (two passes).
     *
     * @throws IllegalArgumentException if {@code values} is empty or holds a non-finite value
     */
    public static double mean(double[] values) {
        Checks.requireFinite(values, 1, "mean");
        return meanUnchecked(values);
    }

    static double meanUnchecked(double[] values) {
        int p = values.length;
        double shift = values[0];
        double sum = 0;
        for (double v : values) {
            sum += v - shift;
        }
        double mean = shift + sum / p;
        double correction = 0;
        for (double v : values) {
            correction += v - mean;
        }
        return mean + correction / p;
    }

    /**
     * Sample variance with divisor p − 1.
     *
     * <p>Definition: {@code s² = [Σ(x_i − x̄)² − (Σ(x_i − x̄))²/p] / (p − 1)} (corrected
     * two-pass; the second term is the rounding error of x̄ and is tiny).
     *
     * @throws IllegalArgumentException if fewer than 2 values or a non-finite value
     */
    public static double variance(double[] values) {
        Checks.requireFinite(values, 2, "variance");
        double mean = meanUnchecked(values);
        return sumOfSquaredDeviations(values, mean) / (values.length - 1);
    }

    /**
     * Sample standard deviation, divisor p − 1: {@code s = sqrt(variance)}.
     *
     * @throws IllegalArgumentException if fewer than 2 values or a non-finite value
     */
    public static double standardDeviation(double[] values) {
        return Math.sqrt(variance(values));
    }

    /**
     * Corrected two-pass sum of squared deviations about {@code centre}:
     * {@code Σ(x_i − c)² − (Σ(x_i − c))²/p}. When c is the mean the second term removes its
     * rounding error; the result is clamped at 0.
     */
    public static double sumOfSquaredDeviations(double[] values, double centre) {
        double ss = 0;
        double s = 0;
        for (double v : values) {
            double d = v - centre;
            ss += d * d;
            s += d;
        }
        return Math.max(0, ss - s * s / values.length);
    }

    /**
     * Lag-1 autocorrelation coefficient (needed only for the NIST StRD check).
     *
     * <p>Definition: {@code r(1) = Σ_{i<p}(x_i − x̄)(x_{i+1} − x̄) / Σ_i(x_i − x̄)²}.
     *
     * <p>Special case: all values equal gives 0/0; this throws.
     *
     * @throws IllegalArgumentException fewer than 2 values, a non-finite value, or zero spread
     * <p>References: NIST StRD, Univariate Summary Statistics, definition of r(1).
     */
    public static double lag1Autocorrelation(double[] values) {
        Checks.requireFinite(values, 2, "lag-1 autocorrelation");
        double mean = meanUnchecked(values);
        double numerator = 0;
        for (int i = 0; i + 1 < values.length; i++) {
            numerator += (values[i] - mean) * (values[i + 1] - mean);
        }
        double denominator = sumOfSquaredDeviations(values, mean);
        if (denominator == 0) {
            throw new IllegalArgumentException("lag-1 autocorrelation: all values are equal");
        }
        return numerator / denominator;
    }
}
