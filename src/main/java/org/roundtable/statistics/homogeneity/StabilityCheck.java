package org.roundtable.statistics.homogeneity;

import org.roundtable.statistics.Checks;
import org.roundtable.statistics.descriptive.Descriptive;

/**
 * Stability check: compares the mean of results at the start of the round with the mean of
 * results at or after its end.
 *
 * <p>Definition: adequately stable if {@code |ȳ1 − ȳ2| ≤ 0.3·σ_pt} (simple criterion); when the
 * check measurements carry appreciable uncertainty, the expanded criterion
 * {@code |ȳ1 − ȳ2| ≤ 0.3·σ_pt + 2·sqrt(u²(ȳ1) + u²(ȳ2))}.
 *
 * <p>Symbols and our choice for the uncertainties: when ȳ1 is the mean of homogeneity data
 * (g items in replicate), {@code u(ȳ1) = s_x/√g} with s_x the SD of the item means — treating
 * the g·m results as independent ({@code s/√(gm)}) understates it when items differ. For plain
 * lists of results {@code u(ȳ) = s/√n}.
 *
 * <p>Special cases: same method and laboratory for both sets, ideally the same run; otherwise
 * drift of the measurement system is confounded with instability (not checked here).
 *
 * @throws IllegalArgumentException fewer than 2 values in a set, non-finite values, σ_pt not &gt; 0
 *
 * <p>References: ISO 13528:2015, Annex B (B.5 stability, sub-clause from memory).
 */
public final class StabilityCheck {

    /** Factor 0.3 of the criterion. */
    public static final double CRITERION_FACTOR = 0.3;
    /** Coverage factor 2 of the expanded criterion. */
    public static final double COVERAGE_FACTOR = 2.0;

    /**
     * Outcome.
     *
     * @param startMean      ȳ1
     * @param startUncertainty u(ȳ1)
     * @param endMean        ȳ2
     * @param endUncertainty u(ȳ2)
     * @param difference     |ȳ1 − ȳ2|
     * @param simpleLimit    0.3·σ_pt
     * @param expandedLimit  0.3·σ_pt + 2·sqrt(u²(ȳ1) + u²(ȳ2))
     */
    public record Result(double startMean, double startUncertainty, double endMean,
            double endUncertainty, double difference, double simpleLimit, double expandedLimit,
            boolean stable, boolean stableExpanded) {
    }

    private StabilityCheck() {
    }

    /** From means and their standard uncertainties. */
    public static Result evaluate(double startMean, double startUncertainty, double endMean,
            double endUncertainty, double sigmaPt) {
        Checks.requireFinite(startMean, "start mean");
        Checks.requireFinite(endMean, "end mean");
        Checks.requirePositive(sigmaPt, "sigma_pt");
        if (!(startUncertainty >= 0 && endUncertainty >= 0)) {
            throw new IllegalArgumentException("uncertainties must be >= 0");
        }
        double diff = Math.abs(startMean - endMean);
        double simple = CRITERION_FACTOR * sigmaPt;
        double expanded = simple + COVERAGE_FACTOR * Math.hypot(startUncertainty, endUncertainty);
        return new Result(startMean, startUncertainty, endMean, endUncertainty, diff, simple,
                expanded, diff <= simple, diff <= expanded);
    }

    /**
     * From homogeneity data (start; {@code u(ȳ1) = s_x/√g}) and a list of stability results
     * (end; {@code u(ȳ2) = s/√n}).
     */
    public static Result evaluate(double[][] homogeneityItems, double[] endResults, double sigmaPt) {
        if (homogeneityItems == null || homogeneityItems.length < 2) {
            throw new IllegalArgumentException("stability check needs at least 2 homogeneity items");
        }
        int g = homogeneityItems.length;
        double[] itemMeans = new double[g];
        int total = 0;
        for (int t = 0; t < g; t++) {
            itemMeans[t] = Descriptive.mean(homogeneityItems[t]);
            total += homogeneityItems[t].length;
        }
        double[] all = new double[total];
        int k = 0;
        for (double[] item : homogeneityItems) {
            for (double v : item) {
                all[k++] = v;
            }
        }
        double start = Descriptive.mean(all);
        double uStart = Descriptive.standardDeviation(itemMeans) / Math.sqrt(g);
        double end = Descriptive.mean(endResults);
        double uEnd = Descriptive.standardDeviation(endResults) / Math.sqrt(endResults.length);
        return evaluate(start, uStart, end, uEnd, sigmaPt);
    }
}
