package org.roundtable.statistics.homogeneity;

import java.util.ArrayList;
import java.util.List;
import org.hipparchus.distribution.continuous.ChiSquaredDistribution;
import org.hipparchus.distribution.continuous.FDistribution;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;
import org.roundtable.statistics.precision.ConsistencyStatistics;
import org.roundtable.statistics.precision.OneWayAnova;

/**
 * Homogeneity check of PT items measured in replicate (normally g ≥ 10 items in duplicate).
 *
 * <p>Definition: with item results x_tk (t = 1..g items, k = 1..m replicates), from the one-way
 * ANOVA: {@code s_w² = MS_within} (for duplicates {@code Σ(x_t1 − x_t2)²/(2g)}),
 * {@code s_x} the SD of the item means, {@code s_s² = max(0, s_x² − s_w²/m)}
 * (= (MS_between − MS_within)/m).
 * <ol>
 * <li>Criterion 1: {@code s_s ≤ 0.3·σ_pt}: passes.</li>
 * <li>Otherwise the allowance for the check's own imprecision decides: sufficiently homogeneous
 * if {@code s_s² ≤ c = F1·σ_allow² + F2·s_w²}, {@code σ_allow = 0.3·σ_pt},
 * {@code F1 = χ²_{0.95, g−1}/(g − 1)}, {@code F2 = (F_{0.95; g−1, g} − 1)/2}.</li>
 * </ol>
 * Also reported: {@code s_w/σ_pt} (should be &lt; 0.5) and, for duplicates, Cochran's test of the
 * duplicate differences (an analytical outlier screen, to be done first).
 *
 * <p>Symbols: g items; m replicates per item; σ_pt standard deviation for proficiency
 * assessment.
 *
 * <p>Special cases: a negative {@code s_x² − s_w²/m} gives s_s = 0 and a
 * {@code negative-between-variance} warning. F1, F2 use the formulas for duplicates (m = 2);
 * for other m the allowance is reported for the same formulas and marked with a warning.
 * Fewer than 10 items: {@code few-items} warning.
 *
 * @throws IllegalArgumentException fewer than 2 items, unequal or fewer than 2 replicates,
 *                                  non-finite values, σ_pt not &gt; 0
 *
 * <p>References: ISO 13528:2015, Annex B (B.2 to B.3; F1/F2 table, sub-clause numbers from
 * memory); Fearn T., Thompson M. (2001) A new test for "sufficient homogeneity". Analyst
 * 126:1414–1417; Thompson M., Ellison S.L.R., Wood R. (2006) IUPAC Harmonized Protocol, Pure
 * Appl. Chem. 78:145–196, Appendix on homogeneity.
 */
public final class HomogeneityCheck {

    /** σ_allow = 0.3·σ_pt. */
    public static final double ALLOWANCE_FACTOR = 0.3;
    /** Recommended upper bound of s_w/σ_pt (IUPAC 2006, from memory). */
    public static final double ANALYTICAL_PRECISION_LIMIT = 0.5;
    /** Recommended minimum number of items. */
    public static final int RECOMMENDED_ITEMS = 10;

    /**
     * Outcome.
     *
     * @param itemCount                  g
     * @param replicates                 m
     * @param grandMean                  mean of all results
     * @param itemMeansSd                s_x
     * @param withinItemSd               s_w
     * @param betweenItemSd              s_s
     * @param betweenItemVariance        s_s² (after clamping)
     * @param passesSimpleCriterion      s_s ≤ 0.3·σ_pt
     * @param f1                         F1
     * @param f2                         F2
     * @param allowance                  c
     * @param passesAllowanceCriterion   s_s² ≤ c
     * @param sufficientlyHomogeneous    criterion 1, or else criterion 2
     * @param withinToSigmaRatio         s_w/σ_pt
     * @param cochran                    Cochran test of duplicate differences (null unless m = 2 and g ≥ 2)
     */
    public record Result(int itemCount, int replicates, double grandMean, double itemMeansSd,
            double withinItemSd, double betweenItemSd, double betweenItemVariance,
            boolean passesSimpleCriterion, double f1, double f2, double allowance,
            boolean passesAllowanceCriterion, boolean sufficientlyHomogeneous,
            double withinToSigmaRatio, ConsistencyStatistics.Test cochran,
            List<StatisticsWarning> warnings) {

        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    private HomogeneityCheck() {
    }

    /** F1 = χ²_{0.95, g−1}/(g − 1). */
    public static double f1(int items) {
        return new ChiSquaredDistribution(items - 1).inverseCumulativeProbability(0.95) / (items - 1);
    }

    /** F2 = (F_{0.95; g−1, g} − 1)/2. */
    public static double f2(int items) {
        return (new FDistribution(items - 1, items).inverseCumulativeProbability(0.95) - 1) / 2;
    }

    /** Runs the check on items (rows) of m replicate results each. */
    public static Result evaluate(double[][] items, double sigmaPt) {
        Checks.requirePositive(sigmaPt, "sigma_pt");
        if (items == null || items.length < 2) {
            throw new IllegalArgumentException("homogeneity check needs at least 2 items");
        }
        int g = items.length;
        int m = items[0] == null ? 0 : items[0].length;
        for (int t = 0; t < g; t++) {
            Checks.requireFinite(items[t], 2, "homogeneity item " + (t + 1));
            if (items[t].length != m) {
                throw new IllegalArgumentException("homogeneity check needs the same number of"
                        + " replicates for every item; item " + (t + 1) + " has " + items[t].length
                        + ", item 1 has " + m);
            }
        }
        List<StatisticsWarning> warnings = new ArrayList<>();
        if (g < RECOMMENDED_ITEMS) {
            warnings.add(new StatisticsWarning("few-items", g + " items: at least "
                    + RECOMMENDED_ITEMS + " are recommended (ISO 13528, Annex B)"));
        }
        if (m != 2) {
            warnings.add(new StatisticsWarning("not-duplicates", "F1 and F2 are tabulated for"
                    + " duplicates; " + m + " replicates per item"));
        }
        OneWayAnova.Result a = OneWayAnova.of(items);
        double sw2 = a.msWithin();
        double sx2 = a.msBetween() / m;
        double ss2 = sx2 - sw2 / m;
        if (ss2 < 0) {
            warnings.add(new StatisticsWarning("negative-between-variance", "s_x^2 - s_w^2/m < 0:"
                    + " the between-item SD is set to 0"));
            ss2 = 0;
        }
        double ss = Math.sqrt(ss2);
        double sw = Math.sqrt(sw2);
        double allow = ALLOWANCE_FACTOR * sigmaPt;
        boolean simple = ss <= allow;
        double f1 = f1(g);
        double f2 = f2(g);
        double c = f1 * allow * allow + f2 * sw2;
        boolean allowance = ss2 <= c;
        double ratio = sw / sigmaPt;
        if (ratio >= ANALYTICAL_PRECISION_LIMIT) {
            warnings.add(new StatisticsWarning("imprecise-method", String.format(java.util.Locale.ROOT,
                    "s_w/sigma_pt = %.3g >= 0.5: the method is not precise enough for the check", ratio)));
        }
        ConsistencyStatistics.Test cochran = null;
        if (m == 2) {
            double[] differences = new double[g];
            for (int t = 0; t < g; t++) {
                differences[t] = Math.abs(items[t][0] - items[t][1]);
            }
            boolean allZero = true;
            for (double d : differences) {
                allZero &= d == 0;
            }
            if (!allZero) {
                cochran = ConsistencyStatistics.cochran(differences, 2);
                if (cochran.verdict() != org.roundtable.statistics.precision.OutlierVerdict.ACCEPTED) {
                    warnings.add(new StatisticsWarning("duplicate-outlier", "Cochran's test flags the"
                            + " largest duplicate difference (" + cochran.verdict().name().toLowerCase(java.util.Locale.ROOT)
                            + "): check for an analytical outlier before judging homogeneity"));
                }
            }
        }
        return new Result(g, m, a.grandMean(), Math.sqrt(sx2), sw, ss, ss2, simple, f1, f2, c,
                allowance, simple || allowance, ratio, cochran, warnings);
    }
}
