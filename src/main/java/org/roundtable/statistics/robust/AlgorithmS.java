package org.roundtable.statistics.robust;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.hipparchus.distribution.continuous.ChiSquaredDistribution;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;

/**
 * Algorithm S: robust pooled value w* of standard deviations or ranges (e.g. a robust
 * repeatability SD from the duplicate ranges of many laboratories).
 *
 * <p>Definition: inputs w_i (i = 1..p), each with ν degrees of freedom.
 * <ol>
 * <li>{@code w* = median(w_i)}.</li>
 * <li>{@code ψ = η·w*}; {@code w_i' = min(w_i, ψ)} (only large values are limited).</li>
 * <li>{@code w* = ξ·sqrt(Σ(w_i')²/p)}.</li>
 * <li>Repeat 2–3 until {@code |Δw*| ≤ 1e-10·w*} (at most 1000 iterations).</li>
 * </ol>
 *
 * <p>Symbols: limit factor {@code η = sqrt(χ²_{0.90,ν}/ν)}; adjustment factor
 * {@code ξ = 1/sqrt(E[min(χ²_ν/ν, η²)])} with
 * {@code E[min(X, c)] = P(χ²_{ν+2} ≤ cν) + c·P(χ²_ν > cν)}, c = η². ISO 13528 tabulates η and ξ
 * rounded to three decimals for ν = 1..10; {@link #withFactors} takes such printed values. For
 * duplicates (ν = 1) the range is √2 times the SD, so a robust repeatability SD is w* / √2.
 *
 * <p>Special cases: w* = 0 at the start (more than half of the inputs zero) gives a
 * {@code zero-spread} warning and w* = 0; negative inputs are refused.
 *
 * @throws IllegalArgumentException fewer than 1 value, negative or non-finite values, ν &lt; 1
 *
 * <p>References: ISO 13528:2015, Annex C.4 (Algorithm S and its factor table); ISO 5725-5:1998,
 * clause 6.3.
 */
public final class AlgorithmS {

    /** Probability of the χ² quantile in η. */
    public static final double LIMIT_PROBABILITY = 0.90;

    /**
     * Outcome.
     *
     * @param pooledValue w*
     * @param limitFactor η used
     * @param adjustmentFactor ξ used
     */
    public record Result(double pooledValue, int count, int iterations, boolean converged,
            double limitFactor, double adjustmentFactor, List<StatisticsWarning> warnings) {

        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    private final double eta;
    private final double xi;
    private final double tolerance;
    private final int maxIterations;

    private AlgorithmS(double eta, double xi, double tolerance, int maxIterations) {
        this.eta = eta;
        this.xi = xi;
        this.tolerance = tolerance;
        this.maxIterations = maxIterations;
    }

    /** Factors computed from ν by the χ² formulas, tolerance 1e-10, cap 1000. */
    public static AlgorithmS forDegreesOfFreedom(int degreesOfFreedom) {
        return new AlgorithmS(limitFactor(degreesOfFreedom), adjustmentFactor(degreesOfFreedom), 1e-10, 1000);
    }

    /** Given factors (e.g. ISO 13528's printed η, ξ), tolerance and iteration cap. */
    public static AlgorithmS withFactors(double eta, double xi, double tolerance, int maxIterations) {
        Checks.requirePositive(eta, "eta");
        Checks.requirePositive(xi, "xi");
        Checks.requirePositive(tolerance, "tolerance");
        return new AlgorithmS(eta, xi, tolerance, maxIterations);
    }

    /** η = sqrt(χ²_{0.90,ν}/ν). */
    public static double limitFactor(int nu) {
        requireDf(nu);
        return Math.sqrt(new ChiSquaredDistribution(nu).inverseCumulativeProbability(LIMIT_PROBABILITY) / nu);
    }

    /** ξ = 1/sqrt(E[min(χ²_ν/ν, η²)]). */
    public static double adjustmentFactor(int nu) {
        requireDf(nu);
        double c = limitFactor(nu) * limitFactor(nu);
        double expectation = new ChiSquaredDistribution(nu + 2.0).cumulativeProbability(c * nu)
                + c * (1 - new ChiSquaredDistribution(nu).cumulativeProbability(c * nu));
        return 1 / Math.sqrt(expectation);
    }

    private static void requireDf(int nu) {
        if (nu < 1) {
            throw new IllegalArgumentException("degrees of freedom must be >= 1, got " + nu);
        }
    }

    /** Runs the algorithm on SDs or ranges w_i (not modified). */
    public Result evaluate(double[] values) {
        Checks.requireFinite(values, 1, "Algorithm S");
        for (double v : values) {
            if (v < 0) {
                throw new IllegalArgumentException("Algorithm S: SDs and ranges must be >= 0, got " + v);
            }
        }
        List<StatisticsWarning> warnings = new ArrayList<>();
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        double w = Median.ofSorted(sorted);
        int p = values.length;
        if (w == 0) {
            warnings.add(new StatisticsWarning("zero-spread", "The median SD/range is 0: no pooled value"));
            return new Result(0, p, 0, false, eta, xi, warnings);
        }
        int iterations = 0;
        boolean converged = false;
        while (iterations < maxIterations) {
            double psi = eta * w;
            double sum = 0;
            for (double v : values) {
                double c = Math.min(v, psi);
                sum += c * c;
            }
            double next = xi * Math.sqrt(sum / p);
            iterations++;
            boolean stop = Math.abs(next - w) <= tolerance * next;
            w = next;
            if (stop) {
                converged = true;
                break;
            }
        }
        if (!converged) {
            warnings.add(new StatisticsWarning("not-converged", "Algorithm S did not converge in "
                    + maxIterations + " iterations"));
        }
        return new Result(w, p, iterations, converged, eta, xi, warnings);
    }
}
