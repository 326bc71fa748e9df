package org.roundtable.evaluation;

import java.time.OffsetDateTime;
import java.util.List;

/** What the evaluation API returns: runs, their measurands and the participants' scores. */
public final class EvaluationViews {

    private EvaluationViews() {
    }

    /** A run without its outputs (the list view). */
    public record RunSummary(long roundId, int version, boolean preview, String roundState, int planVersion,
                             String planSha256, String inputsSha256, String outputsSha256, String codeVersion,
                             String createdBy, OffsetDateTime createdAt) {
    }

    /** A run with all its outputs. */
    public record Run(RunSummary run, List<MeasurandOutcome> measurands) {
    }

    /** Statistics of one method group's results for a measurand (null where not computable). */
    public record MethodGroupStatistics(String methodGroup, int n, Double median, Double robustMean, Double robustSd) {
    }

    /** A warning with its code. */
    public record Warning(String code, String message) {
    }

    /**
     * The evaluation of one measurand of one item. {@code n} counts the results in the statistics; {@code excluded}
     * the results left out of them (late results not scored, blunders marked by the coordinator — these are scored).
     */
    public record MeasurandOutcome(String element, String itemLabel, String unit, int n, int censored, int excluded,
                                   String assignedValueMethod, Double assignedValue, Double assignedValueUncertainty,
                                   Double sigmaPt, String sigmaPtMethod, String sigmaPtSource, String scoreUsed,
                                   String scoreUsedReason, Double median, Double madE, Double nIqr, Double robustMean,
                                   Double robustSd, Integer iterations, Boolean converged, List<Warning> warnings,
                                   List<MethodGroupStatistics> methodGroups, List<Score> scores, Rules rules) {
    }

    /**
     * How a measurand was evaluated, for a report's "how the evaluation was done": the plan's quartile rule (nIQR),
     * Algorithm A stopping rule and classification boundary rule, the plan's exclusion rules in words (null if it
     * states none), the measurand's qualification decision in force (null if none), the components of u(x_pt)
     * ({@code u_char}, and {@code u_hom} when the decision adds it) and whether σpt was widened by s_s; the score
     * decimals scores were printed and classified with, the coverage factor k of En, and whether the scores are
     * for information only (no classification: a consensus or data-derived σpt below the plan's minimum), and the
     * plan's two minimums. Null for
     * runs stored before it was recorded; the last three null/false for runs stored before they were.
     */
    public record Rules(String quartileRule, String stoppingRule, String boundaryRule, String exclusionRules,
                        String qualificationDecision, List<String> assignedValueUncertaintyComponents,
                        boolean sigmaPtWidened, Integer scoreDecimals, Double scoreCoverageFactor,
                        boolean informationOnly, Integer minimumParticipants, Integer minimumForDataDerivedSigmaPt) {

        /** Rules of a run stored before score decimals, En's k and information-only scores were recorded. */
        public Rules(String quartileRule, String stoppingRule, String boundaryRule, String exclusionRules,
                     String qualificationDecision, List<String> assignedValueUncertaintyComponents,
                     boolean sigmaPtWidened) {
            this(quartileRule, stoppingRule, boundaryRule, exclusionRules, qualificationDecision,
                    assignedValueUncertaintyComponents, sigmaPtWidened, null, null, false, null, null);
        }

        /** Score decimals of the run (2 for runs stored before they were recorded). */
        public int decimalsOfScores() {
            return scoreDecimals == null ? org.roundtable.platform.NumberFormats.DEFAULT_SCORE_DECIMALS : scoreDecimals;
        }
    }

    /** One participant's result and scores; {@code excludedReason} set when the result was left out. */
    public record Score(long laboratoryId, String participantCode, String reported, String methodGroup, Double value,
                        Double z, Double zPrime, Double zeta, Double en, String classification,
                        String excludedReason) {
    }
}
