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

    /** The evaluation of one measurand of one item. */
    public record MeasurandOutcome(String element, String itemLabel, String unit, int n, int censored, int excluded,
                                   String assignedValueMethod, Double assignedValue, Double assignedValueUncertainty,
                                   Double sigmaPt, String sigmaPtMethod, String sigmaPtSource, String scoreUsed,
                                   String scoreUsedReason, Double median, Double madE, Double nIqr, Double robustMean,
                                   Double robustSd, Integer iterations, Boolean converged, List<Warning> warnings,
                                   List<MethodGroupStatistics> methodGroups, List<Score> scores) {
    }

    /** One participant's result and scores; {@code excludedReason} set when the result was left out. */
    public record Score(long laboratoryId, String participantCode, String reported, String methodGroup, Double value,
                        Double z, Double zPrime, Double zeta, Double en, String classification,
                        String excludedReason) {
    }
}
