package org.roundtable.statistics.robust;

import java.util.List;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;

/**
 * Algorithm A: robust mean x* and robust standard deviation s* by iterated winsorisation
 * (a Huber-type M-estimator with k = 1.5).
 *
 * <p>Definition:
 * <ol>
 * <li>Start: {@code x* = median(x_i)}, {@code s* = 1.483 · median|x_i − x*|}.</li>
 * <li>{@code δ = 1.5·s*}; {@code x_i' = x* − δ} if {@code x_i < x* − δ}, {@code x* + δ} if
 * {@code x_i > x* + δ}, else {@code x_i}. The clipping interval uses the old x* and s*.</li>
 * <li>{@code x* = Σx_i'/p}; then {@code s* = 1.134·sqrt(Σ(x_i' − x*)²/(p − 1))} about the new
 * x*.</li>
 * <li>Repeat 2–3 until the stopping rule holds.</li>
 * </ol>
 *
 * <p>Symbols: p number of values; 1.5 the Huber constant k; 1.134 ≈ 1/sqrt(β) with
 * {@code β = θ + (1 − θ)k² − 2kφ(k)}, {@code θ = 2Φ(k) − 1}, the consistency factor of the
 * winsorised SD; 1.25 the factor in {@code u(x_pt) = 1.25·s* / sqrt(p)}.
 *
 * <p>Stopping rule (our choice, see {@link StoppingRule}): by default iterate to the fixed point,
 * {@code |Δx*| ≤ 1e-10·s*} and {@code |Δs*| ≤ 1e-10·s*} (new s*), at most 1000 iterations;
 * the result says whether it converged. The standard's wording, "until the third significant
 * figure of s* and the corresponding figure of x* no longer change", is available as
 * {@link StoppingRule#THIRD_SIGNIFICANT_FIGURE} to reproduce legacy reports only: on small sets
 * it stops well short of the fixed point.
 *
 * <p>Special cases:
 * <ul>
 * <li>p = 1: no standard deviation; throws.</li>
 * <li>p = 2: no clipping can happen; x* is the mean and s* = 1.134·SD. Defined, meaningless;
 * the result carries a {@code too-few-values} warning below 10 values (common practice, no
 * source; the earlier citation of ISO Guide 35:2017 B.5.1 c was not checked and is dropped).</li>
 * <li>MADe = 0 at the start (more than half of the values identical): no scale. The result
 * has {@code scaleEstimable() == false}, x* = median, s* = 0, 0 iterations, not converged, and
 * a {@code zero-spread} warning; no scores may be computed from it. The bare-number methods
 * throw in that case.</li>
 * <li>NaN or infinite values: rejected (censored values and blunders must be removed by the
 * caller before robust estimation).</li>
 * </ul>
 *
 * @throws IllegalArgumentException (all methods) fewer than 2 values or a non-finite value
 *
 * <p>References: ISO 13528:2015, Statistical methods for use in proficiency testing by
 * interlaboratory comparison, Annex C.3 (Algorithm A), 7.7.3 (u(x_pt)); ISO 5725-5:1998,
 * clause 6.2; ISO 13528:2005, Annex C.1 (stopping rule wording); Huber P.J. (1981) Robust
 * Statistics, Wiley.
 */
public final class AlgorithmA {

    /** Huber constant k: values beyond x* ± 1.5·s* are winsorised. */
    public static final double HUBER_K = 1.5;
    /** Consistency factor 1/sqrt(β) for k = 1.5, as rounded in ISO 13528 (exact 1.13339…). */
    public static final double SD_FACTOR = 1.134;
    /** Factor of the standard uncertainty of a robust mean, u(x_pt) = 1.25·s* / sqrt(p). */
    public static final double UNCERTAINTY_FACTOR = 1.25;
    /** Relative tolerance of the default (full convergence) stopping rule. */
    public static final double DEFAULT_TOLERANCE = 1e-10;
    /** Iteration cap of the default stopping rule. */
    public static final int DEFAULT_MAX_ITERATIONS = 1000;
    /** Below this number of values robust consensus statistics are unreliable (ISO Guide 35). */
    public static final int RECOMMENDED_MINIMUM = 10;

    /** How the iteration stops. */
    public enum StoppingRule {
        /** Default: |Δx*| ≤ tol·s* and |Δs*| ≤ tol·s*, tol = 1e-10, at most 1000 iterations. */
        FULL_CONVERGENCE,
        /**
         * Legacy: stop when s* rounded to three significant figures, and x* rounded to the same
         * decimal place, are equal in two successive iterations. Never the default.
         */
        THIRD_SIGNIFICANT_FIGURE
    }

    /**
     * Outcome of Algorithm A with its diagnostics.
     *
     * @param robustMean           x*
     * @param robustSd             s* (0 when the scale is not estimable)
     * @param count                p, number of values used
     * @param iterations           number of update steps done
     * @param converged            whether the stopping rule was met within the cap
     * @param scaleEstimable       false when the starting MADe was 0
     * @param stoppingRule         the rule used
     * @param warnings             diagnostics ({@code zero-spread}, {@code too-few-values},
     *                             {@code not-converged})
     */
    public record Result(double robustMean, double robustSd, int count, int iterations,
            boolean converged, boolean scaleEstimable, StoppingRule stoppingRule,
            List<StatisticsWarning> warnings) {

        public Result {
            warnings = List.copyOf(warnings);
        }

        /**
         * Standard uncertainty of x* used as an assigned value: {@code u(x_pt) = 1.25·s* / sqrt(p)}.
         *
         * <p>References: ISO 13528:2015, 7.7.3.
         */
        public double assignedValueUncertainty() {
            return UNCERTAINTY_FACTOR * robustSd / Math.sqrt(count);
        }
    }

    private static final AlgorithmA DEFAULT = new AlgorithmA(StoppingRule.FULL_CONVERGENCE,
            DEFAULT_TOLERANCE, DEFAULT_MAX_ITERATIONS);

    private final StoppingRule stoppingRule;
    private final double tolerance;
    private final int maxIterations;

    private AlgorithmA(StoppingRule stoppingRule, double tolerance, int maxIterations) {
        this.stoppingRule = stoppingRule;
        this.tolerance = tolerance;
        this.maxIterations = maxIterations;
    }

    /** The default configuration: full convergence to 1e-10·s*, at most 1000 iterations. */
    public static AlgorithmA fullConvergence() {
        return DEFAULT;
    }

    /**
     * Full convergence with a chosen relative tolerance and iteration cap.
     *
     * @throws IllegalArgumentException tolerance not &gt; 0 or cap &lt; 1
     */
    public static AlgorithmA fullConvergence(double tolerance, int maxIterations) {
        Checks.requirePositive(tolerance, "tolerance");
        if (maxIterations < 1) {
            throw new IllegalArgumentException("maxIterations must be >= 1, got " + maxIterations);
        }
        return new AlgorithmA(StoppingRule.FULL_CONVERGENCE, tolerance, maxIterations);
    }

    /** The legacy rule on the third significant figure (documented in ISO 13528), cap 1000. */
    public static AlgorithmA thirdSignificantFigure() {
        return new AlgorithmA(StoppingRule.THIRD_SIGNIFICANT_FIGURE, DEFAULT_TOLERANCE,
                DEFAULT_MAX_ITERATIONS);
    }

    /**
     * Robust mean x* with the default rule.
     *
     * @throws IllegalArgumentException fewer than 2 values, a non-finite value, or zero spread
     */
    public static double robustMean(double[] values) {
        return requireScale(DEFAULT.evaluate(values)).robustMean();
    }

    /**
     * Robust standard deviation s* with the default rule.
     *
     * @throws IllegalArgumentException fewer than 2 values, a non-finite value, or zero spread
     */
    public static double robustSd(double[] values) {
        return requireScale(DEFAULT.evaluate(values)).robustSd();
    }

    private static Result requireScale(Result result) {
        if (!result.scaleEstimable()) {
            throw new IllegalArgumentException("Algorithm A: zero spread (MADe = 0), no robust scale");
        }
        return result;
    }

    /**
     * Runs Algorithm A on the values (not modified).
     *
     * @throws IllegalArgumentException fewer than 2 values or a non-finite value
     */
    public Result evaluate(double[] values) {
        Checks.requireFinite(values, 2, "Algorithm A");
        double[] sorted = SortedCopy.of(values);
        return evaluateSorted(sorted);
    }

    /**
     * Runs Algorithm A on finite values already sorted ascending (not checked; for callers that
     * have sorted the data for other estimators too).
     */
    public Result evaluateSorted(double[] sorted) {
        int p = sorted.length;
        if (p < 2) {
            throw new IllegalArgumentException("Algorithm A: needs at least 2 values, got " + p);
        }
        java.util.ArrayList<StatisticsWarning> warnings = new java.util.ArrayList<>();
        if (p < RECOMMENDED_MINIMUM) {
            warnings.add(new StatisticsWarning("too-few-values", "Algorithm A on " + p
                    + " values: robust statistics are unreliable below " + RECOMMENDED_MINIMUM
                    + " values (common practice, no source)"));
        }
        double x = Median.ofSorted(sorted);
        double s = ScaledMad.MADE_FACTOR * ScaledMad.madOfSorted(sorted, x);
        if (s == 0) {
            warnings.add(new StatisticsWarning("zero-spread", "More than half of the " + p
                    + " values are identical (MADe = 0): no robust standard deviation, values"
                    + " must not be scored against it"));
            return new Result(x, 0, p, 0, false, false, stoppingRule, warnings);
        }
        // Numerical choice: the data are sorted, so the unclipped values of an iteration form one
        // contiguous run [a, b). Cumulative sums of the values centred on the median,
        // c_i = x_(i) - median (exact differences for nearby doubles), anchored at the middle
        // index (cum[mid] = 0), give the winsorised sums in O(log p) per iteration as
        // cum[b] - cum[a]; anchoring at the middle keeps far outliers out of both terms, so no
        // digits cancel. The sum of squares about the new x* is sum (w - m)^2 - p (x* - m)^2:
        // both terms are centred on the median, which lies within a fraction of s* of x*.
        double centre = x;
        int mid = p / 2;
        double[] cum = new double[p + 1];
        double[] cumSquares = new double[p + 1];
        for (int i = mid; i < p; i++) {
            double c = sorted[i] - centre;
            cum[i + 1] = cum[i] + c;
            cumSquares[i + 1] = cumSquares[i] + c * c;
        }
        for (int i = mid - 1; i >= 0; i--) {
            double c = sorted[i] - centre;
            cum[i] = cum[i + 1] - c;
            cumSquares[i] = cumSquares[i + 1] - c * c;
        }
        int iterations = 0;
        boolean converged = false;
        while (iterations < maxIterations) {
            double delta = HUBER_K * s;
            double low = x - delta;
            double high = x + delta;
            int lowCount = firstIndexNotBelow(sorted, low);
            int highStart = firstIndexAbove(sorted, high);
            int highCount = p - highStart;
            double lowDev = low - centre;
            double highDev = high - centre;
            double sum = lowCount * lowDev + (cum[highStart] - cum[lowCount]) + highCount * highDev;
            double squares = lowCount * lowDev * lowDev
                    + (cumSquares[highStart] - cumSquares[lowCount]) + highCount * highDev * highDev;
            double shift = sum / p;
            double newX = centre + shift;
            double ss = Math.max(0, squares - p * shift * shift);
            double newS = SD_FACTOR * Math.sqrt(ss / (p - 1));
            iterations++;
            boolean stop = stoppingRule == StoppingRule.FULL_CONVERGENCE
                    ? Math.abs(newX - x) <= tolerance * newS && Math.abs(newS - s) <= tolerance * newS
                    : sameToThirdFigure(x, s, newX, newS);
            x = newX;
            s = newS;
            if (stop) {
                converged = true;
                break;
            }
        }
        if (!converged) {
            warnings.add(new StatisticsWarning("not-converged", "Algorithm A did not converge in "
                    + maxIterations + " iterations"));
        }
        return new Result(x, s, p, iterations, converged, true, stoppingRule, warnings);
    }

    /** Number of sorted values strictly below {@code key}. */
    private static int firstIndexNotBelow(double[] sorted, double key) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] < key) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /** Index of the first sorted value strictly above {@code key}. */
    private static int firstIndexAbove(double[] sorted, double key) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= key) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /**
     * Legacy comparison: s* to three significant figures (rounded half-up), x* rounded at the
     * decimal place of the third significant figure of the new s*.
     */
    private static boolean sameToThirdFigure(double oldX, double oldS, double newX, double newS) {
        if (newS <= 0) {
            return oldS == newS && oldX == newX;
        }
        int exponent = (int) Math.floor(Math.log10(newS)) - 2;
        java.math.BigDecimal step = java.math.BigDecimal.ONE.scaleByPowerOfTen(exponent);
        return round(oldS, step).equals(round(newS, step)) && round(oldX, step).equals(round(newX, step));
    }

    private static java.math.BigDecimal round(double value, java.math.BigDecimal step) {
        return new java.math.BigDecimal(value).divide(step, 0, java.math.RoundingMode.HALF_UP);
    }
}
