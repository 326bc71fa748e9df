package org.roundtable.statistics.precision;

import org.roundtable.statistics.Checks;

/**
 * One-way analysis of variance of groups (laboratories, items) of possibly unequal size.
 *
 * <p>Definition: with groups i = 1..g of n_i values, group means ȳ_i and grand mean ȳ (weighted
 * by n_i): {@code SS_between = Σn_i(ȳ_i − ȳ)²}, {@code SS_within = ΣΣ(y_ij − ȳ_i)²},
 * {@code df_between = g − 1}, {@code df_within = N − g}, mean squares SS/df,
 * {@code F = MS_between/MS_within}, {@code R² = SS_between/(SS_between + SS_within)}, residual
 * SD {@code sqrt(MS_within)}.
 *
 * <p>Numerical choice: all values are first shifted by a provisional centre (the first value)
 * and every sum is two-pass about the group or grand mean; NIST StRD SmLs07–09 (13 constant
 * leading digits) need this.
 *
 * <p>Special cases: F is {@code +∞} when MS_within = 0 and MS_between &gt; 0, NaN when both are
 * 0 (only in {@link Result#f()}; callers decide).
 *
 * @throws IllegalArgumentException fewer than 2 groups, an empty group, N − g &lt; 1, or a
 *                                  non-finite value
 *
 * <p>References: NIST Statistical Reference Datasets, Analysis of Variance (certified values);
 * ISO 5725-2:1994, clause 7.4.
 */
public final class OneWayAnova {

    /**
     * ANOVA table.
     *
     * @param groupMeans group means ȳ_i
     * @param groupSizes n_i
     */
    public record Result(int dfBetween, int dfWithin, double ssBetween, double ssWithin,
            double msBetween, double msWithin, double f, double rSquared, double residualSd,
            double grandMean, double[] groupMeans, int[] groupSizes) {
    }

    private OneWayAnova() {
    }

    /** Computes the ANOVA table (arrays are not modified). */
    public static Result of(double[][] groups) {
        if (groups == null || groups.length < 2) {
            throw new IllegalArgumentException("one-way ANOVA needs at least 2 groups");
        }
        int g = groups.length;
        int total = 0;
        for (int i = 0; i < g; i++) {
            Checks.requireFinite(groups[i], 1, "ANOVA group " + (i + 1));
            total += groups[i].length;
        }
        if (total - g < 1) {
            throw new IllegalArgumentException("one-way ANOVA needs at least one group with 2 values");
        }
        double shift = groups[0][0];
        double[] means = new double[g];
        int[] sizes = new int[g];
        double ssWithin = 0;
        double grandSum = 0;
        for (int i = 0; i < g; i++) {
            double[] y = groups[i];
            double sum = 0;
            for (double v : y) {
                sum += v - shift;
            }
            double mean = sum / y.length;
            double ss = 0;
            double residual = 0;
            for (double v : y) {
                double d = (v - shift) - mean;
                ss += d * d;
                residual += d;
            }
            mean += residual / y.length;
            ssWithin += Math.max(0, ss - residual * residual / y.length);
            means[i] = mean;
            sizes[i] = y.length;
            grandSum += mean * y.length;
        }
        double grand = grandSum / total;
        double ssBetween = 0;
        for (int i = 0; i < g; i++) {
            double d = means[i] - grand;
            ssBetween += sizes[i] * d * d;
        }
        int dfB = g - 1;
        int dfW = total - g;
        double msB = ssBetween / dfB;
        double msW = ssWithin / dfW;
        double[] shiftedBack = new double[g];
        for (int i = 0; i < g; i++) {
            shiftedBack[i] = means[i] + shift;
        }
        double ssTotal = ssBetween + ssWithin;
        return new Result(dfB, dfW, ssBetween, ssWithin, msB, msW, msB / msW,
                ssTotal == 0 ? Double.NaN : ssBetween / ssTotal, Math.sqrt(msW), grand + shift,
                shiftedBack, sizes);
    }
}
