package org.roundtable.statistics.precision;

import java.util.ArrayList;
import java.util.List;

/**
 * The evaluation of one measurand over all levels of a precision experiment: each level by
 * {@link PrecisionLevelEvaluation}, then, when asked, the relationships of s_r and s_R to the
 * level m by {@link PrecisionLevelRelationship}. The server and the offline {@code evaluate}
 * command both call this, so they give the same numbers.
 *
 * <p>Special cases: a level the caller cannot evaluate is the caller's to leave out; with fewer
 * than 2 levels no relationship is fitted; with 2, only the proportional one.
 *
 * @throws IllegalArgumentException as {@link PrecisionLevelEvaluation#of(double[][], boolean[],
 *                                  double, double)} for any level
 *
 * <p>References: ISO 5725-2:1994, clauses 7.3 to 7.5 (from memory).
 */
public final class PrecisionStudyEvaluation {

    /**
     * One level's input.
     *
     * @param name     the level's name (the material), for the caller
     * @param cells    one array of replicate results per laboratory
     * @param excluded cells excluded by the coordinator's decision
     */
    public record LevelInput(String name, double[][] cells, boolean[] excluded) {
    }

    /** One level's evaluation. */
    public record LevelResult(String name, PrecisionLevelEvaluation.Result result) {
    }

    /**
     * The study of one measurand.
     *
     * @param repeatabilityFits   s_r against m (empty when not fitted)
     * @param reproducibilityFits s_R against m (empty when not fitted)
     */
    public record Result(List<LevelResult> levels, List<PrecisionLevelRelationship.Fit> repeatabilityFits,
            List<PrecisionLevelRelationship.Fit> reproducibilityFits) {

        public Result {
            levels = List.copyOf(levels);
            repeatabilityFits = List.copyOf(repeatabilityFits);
            reproducibilityFits = List.copyOf(reproducibilityFits);
        }
    }

    private PrecisionStudyEvaluation() {
    }

    /** Evaluates every level, then fits the relationships when {@code fitRelationship}. */
    public static Result of(List<LevelInput> levels, double alphaStraggler, double alphaOutlier,
            boolean fitRelationship) {
        List<LevelResult> results = new ArrayList<>();
        for (LevelInput l : levels) {
            results.add(new LevelResult(l.name(),
                    PrecisionLevelEvaluation.of(l.cells(), l.excluded(), alphaStraggler, alphaOutlier)));
        }
        List<PrecisionLevelRelationship.Fit> rFits = List.of();
        List<PrecisionLevelRelationship.Fit> bigRFits = List.of();
        if (fitRelationship && results.size() >= 2) {
            double[] m = new double[results.size()];
            double[] sr = new double[results.size()];
            double[] sR = new double[results.size()];
            for (int j = 0; j < m.length; j++) {
                PrecisionLevelEvaluation.Result r = results.get(j).result();
                m[j] = r.generalMean();
                sr[j] = r.precision().repeatabilitySd();
                sR[j] = r.precision().reproducibilitySd();
            }
            rFits = PrecisionLevelRelationship.fitAll(m, sr);
            bigRFits = PrecisionLevelRelationship.fitAll(m, sR);
        }
        return new Result(results, rFits, bigRFits);
    }
}
