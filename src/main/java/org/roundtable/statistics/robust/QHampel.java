package org.roundtable.statistics.robust;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.hipparchus.distribution.continuous.NormalDistribution;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;

/**
 * PROVISIONAL — Q method (robust SD) and Hampel estimator (robust mean), written from a
 * remembered definition of ISO 13528 Annex C.5 that has not been checked against the standard
 * and has no published numeric example in our tests. Never used by default; every result carries
 * a {@code provisional} warning.
 *
 * <p>Definition (laboratories i = 1..p with results y_ik, k = 1..n_i):
 * <ul>
 * <li>{@code H1(x) = 2/(p(p−1)) · Σ_{i<j} (1/(n_i n_j)) · Σ_k Σ_m I(|y_ik − y_jm| ≤ x)}, the
 * empirical cdf of between-laboratory absolute differences.</li>
 * <li>With the discontinuity points {@code x_1 < … < x_r} of H1 (the distinct differences):
 * for each positive {@code x_k}, {@code G1(x_k) = ½[H1(x_k) + H1(x_{k−1})]}, where
 * {@code H1(x_0)} is taken as 0 for the first point; {@code G1(0) = 0}; G1 linear in between.</li>
 * <li>Q method: {@code s* = G1⁻¹(0.25 + 0.75·H1(0)) / (√2·Φ⁻¹(0.625 + 0.375·H1(0)))}; without
 * ties the denominator is {@code √2·Φ⁻¹(0.625) = 0.4506241}.</li>
 * <li>Hampel: x* solves {@code Σ_i ψ((ȳ_i − x)/s*) = 0} with the redescending ψ: q for
 * |q| ≤ 1.5; ±1.5 for 1.5 &lt; |q| ≤ 3; ±(4.5 − |q|) for 3 &lt; |q| ≤ 4.5; 0 beyond. Σψ is
 * piecewise linear in x with knots at ȳ_i and ȳ_i ± {1.5, 3, 4.5}·s*; it is evaluated at the
 * knots, sign changes are interpolated linearly (exact between knots) and the root nearest the
 * median is taken; with no root x* = median.</li>
 * <li>{@code u(x_pt) = 1.25·s* / √p} as for Algorithm A.</li>
 * </ul>
 *
 * <p>Special cases: H1(0) ≥ 0.75 or all differences zero: no scale ({@code zero-spread}
 * warning, s* = 0, x* = median of the laboratory means). p &lt; 2 refused.
 *
 * @throws IllegalArgumentException fewer than 2 laboratories, an empty laboratory, non-finite values
 *
 * <p>References: ISO 13528:2015, Annex C.5 (from memory, unverified); Müller C.H., Uhlig S.
 * (2001) Estimation of variance components with high breakdown point and high efficiency.
 * Biometrika 88:353–366; Rousseeuw P.J., Croux C. (1993) J. Am. Stat. Assoc. 88:1273–1283;
 * Hampel F.R. (1974) J. Am. Stat. Assoc. 69:383–393.
 */
public final class QHampel {

    /** Knots of Hampel's ψ (multiples of s*). */
    public static final double HAMPEL_A = 1.5;
    /** Second knot. */
    public static final double HAMPEL_B = 3.0;
    /** Third knot: ψ is 0 beyond. */
    public static final double HAMPEL_C = 4.5;

    /** Result of the provisional estimators. */
    public record Result(double robustMean, double robustSd, int laboratories, boolean scaleEstimable,
            List<StatisticsWarning> warnings) {

        public Result {
            warnings = List.copyOf(warnings);
        }

        /** u(x_pt) = 1.25·s* / √p. */
        public double assignedValueUncertainty() {
            return AlgorithmA.UNCERTAINTY_FACTOR * robustSd / Math.sqrt(laboratories);
        }
    }

    private static final StatisticsWarning PROVISIONAL = new StatisticsWarning("provisional",
            "Q method / Hampel estimator implemented from a remembered definition of ISO 13528"
            + " Annex C.5, not yet checked against the standard's example: provisional");

    private QHampel() {
    }

    /** One result per laboratory. */
    public static Result evaluate(double[] values) {
        Checks.requireFinite(values, 2, "Q/Hampel");
        double[][] labs = new double[values.length][];
        for (int i = 0; i < values.length; i++) {
            labs[i] = new double[] {values[i]};
        }
        return evaluate(labs);
    }

    /** Replicate results per laboratory. */
    public static Result evaluate(double[][] laboratories) {
        if (laboratories == null || laboratories.length < 2) {
            throw new IllegalArgumentException("Q/Hampel needs at least 2 laboratories");
        }
        int p = laboratories.length;
        double[] means = new double[p];
        for (int i = 0; i < p; i++) {
            Checks.requireFinite(laboratories[i], 1, "Q/Hampel laboratory " + (i + 1));
            means[i] = org.roundtable.statistics.descriptive.Descriptive.mean(laboratories[i]);
        }
        List<StatisticsWarning> warnings = new ArrayList<>();
        warnings.add(PROVISIONAL);
        double s = qMethod(laboratories);
        double median = Median.of(means);
        if (!(s > 0)) {
            warnings.add(new StatisticsWarning("zero-spread", "Too many identical between-laboratory"
                    + " differences: the Q method gives no scale"));
            return new Result(median, 0, p, false, warnings);
        }
        return new Result(hampel(means, s), s, p, true, warnings);
    }

    /** Q-method robust SD (0 when not estimable). */
    static double qMethod(double[][] labs) {
        int p = labs.length;
        // weighted differences: each pair of laboratories has total weight 1
        int count = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i + 1; j < p; j++) {
                count += labs[i].length * labs[j].length;
            }
        }
        double[] diff = new double[count];
        double[] weight = new double[count];
        int k = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i + 1; j < p; j++) {
                double w = 1.0 / (labs[i].length * labs[j].length);
                for (double a : labs[i]) {
                    for (double b : labs[j]) {
                        diff[k] = Math.abs(a - b);
                        weight[k++] = w;
                    }
                }
            }
        }
        Integer[] order = new Integer[count];
        for (int i = 0; i < count; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (a, b) -> Double.compare(diff[a], diff[b]));
        double norm = 2.0 / (p * (p - 1.0));
        // distinct jump points and H1 at each
        List<double[]> points = new ArrayList<>();
        double cumulative = 0;
        for (int idx = 0; idx < count; idx++) {
            int o = order[idx];
            cumulative += weight[o] * norm;
            if (idx + 1 == count || diff[order[idx + 1]] != diff[o]) {
                points.add(new double[] {diff[o], Math.min(1.0, cumulative)});
            }
        }
        double h0 = points.get(0)[0] == 0 ? points.get(0)[1] : 0;
        double target = 0.25 + 0.75 * h0;
        double normalArg = 0.625 + 0.375 * h0;
        if (h0 >= 0.75 || normalArg >= 1) {
            return 0;
        }
        // G1 knots: (0, 0), then each positive jump point
        double prevX = 0;
        double prevG = 0;
        double prevH = h0;
        boolean first = points.get(0)[0] > 0;
        for (double[] pt : points) {
            if (pt[0] == 0) {
                continue;
            }
            double g = first ? 0.5 * pt[1] : 0.5 * (pt[1] + prevH);
            first = false;
            if (g >= target) {
                double x = prevX + (target - prevG) / (g - prevG) * (pt[0] - prevX);
                return x / (Math.sqrt(2) * new NormalDistribution(0, 1).inverseCumulativeProbability(normalArg));
            }
            prevX = pt[0];
            prevG = g;
            prevH = pt[1];
        }
        return 0;
    }

    /** Hampel's ψ. */
    static double psi(double q) {
        double a = Math.abs(q);
        double v;
        if (a <= HAMPEL_A) {
            return q;
        } else if (a <= HAMPEL_B) {
            v = HAMPEL_A;
        } else if (a <= HAMPEL_C) {
            v = HAMPEL_C - a;
        } else {
            v = 0;
        }
        return Math.signum(q) * v;
    }

    static double sumPsi(double[] means, double x, double s) {
        double sum = 0;
        for (double m : means) {
            sum += psi((m - x) / s);
        }
        return sum;
    }

    /** Hampel M-estimate of location with fixed scale s (root of Σψ nearest the median). */
    static double hampel(double[] means, double s) {
        double median = Median.of(means);
        double[] offsets = {0, HAMPEL_A, -HAMPEL_A, HAMPEL_B, -HAMPEL_B, HAMPEL_C, -HAMPEL_C};
        double[] knots = new double[means.length * offsets.length];
        int k = 0;
        for (double m : means) {
            for (double o : offsets) {
                knots[k++] = m + o * s;
            }
        }
        Arrays.sort(knots);
        double best = Double.NaN;
        double bestDistance = Double.POSITIVE_INFINITY;
        double prevX = knots[0];
        double prevF = sumPsi(means, prevX, s);
        for (int i = 0; i < knots.length; i++) {
            double x = knots[i];
            double f = sumPsi(means, x, s);
            double root = Double.NaN;
            if (f == 0) {
                root = x;
            } else if (i > 0 && prevF != 0 && Math.signum(f) != Math.signum(prevF)) {
                root = prevX + (0 - prevF) * (x - prevX) / (f - prevF);
            }
            if (!Double.isNaN(root) && Math.abs(root - median) < bestDistance) {
                best = root;
                bestDistance = Math.abs(root - median);
            }
            prevX = x;
            prevF = f;
        }
        return Double.isNaN(best) ? median : best;
    }
}
