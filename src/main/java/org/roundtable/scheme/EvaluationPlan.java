package org.roundtable.scheme;

import java.util.List;

/**
 * The evaluation plan of a round as a coordinator writes it: one entry per measurand. Numbers are decimal
 * strings exactly as entered, so that the frozen plan — and its hash — says what was decided, digit for
 * digit. {@link PlanDocument} checks a plan against the scheme's catalogue, fills documented defaults and
 * writes the canonical JSON that is hashed and frozen.
 */
public record EvaluationPlan(List<MeasurandPlan> measurands, EarlyWarningPlan earlyWarnings) {

    /** A plan with the usual early warnings (all on, default numbers). */
    public EvaluationPlan(List<MeasurandPlan> measurands) {
        this(measurands, null);
    }

    /**
     * The early warnings that laboratories' histories raise over the scheme's rounds (see {@code docs/methods.md},
     * "Early warnings"): each rule switched on ({@code "true"}) or off ({@code "false"}) with its numbers, as
     * entered. Absent values take the defaults, which are common practice, no source: every unsatisfactory result;
     * 2 questionable results in a row; 6 scores of one sign in a row; |z| increasing over 3 rounds with the last
     * |z| ≥ 2.
     *
     * @param unsatisfactory     warn on every unsatisfactory result
     * @param questionable       warn on questionable results in a row
     * @param questionableInARow how many in a row (2 to 20)
     * @param bias               warn on scores of one sign in a row
     * @param sameSignRun        how many in a row (2 to 40)
     * @param drift              warn on |z| increasing round after round
     * @param driftRounds        over how many rounds (2 to 20)
     * @param driftLimit         the |z| the last of them reaches at least (a positive decimal number up to 10)
     */
    public record EarlyWarningPlan(String unsatisfactory, String questionable, String questionableInARow,
                                   String bias, String sameSignRun, String drift, String driftRounds,
                                   String driftLimit) {
    }

    /** How the assigned value x_pt is obtained. */
    public enum AssignedValueMethod {
        /** Algorithm A (ISO 13528 Annex C) over all participants' results. */
        CONSENSUS_ALL,
        /** Algorithm A over the results of one method group ({@code methodGroup}). */
        CONSENSUS_METHOD_GROUP,
        /** Certified value of a reference material with its expanded uncertainty U. */
        CERTIFIED_REFERENCE,
        /** Value of a reference laboratory with its expanded uncertainty U. */
        REFERENCE_LABORATORY,
        /** Algorithm A over the results of a named subset of expert laboratories. */
        EXPERT_CONSENSUS
    }

    /** How σpt is obtained. */
    public enum SigmaPtMethod {
        /** A fixed value ({@code sigmaPt}), by fitness for purpose. */
        FIXED,
        /** A percentage ({@code sigmaPtPercent}) of the assigned value. */
        PERCENT_OF_ASSIGNED,
        /** Horwitz function with Thompson's modification at low and high mass fractions. */
        HORWITZ_THOMPSON,
        /** From σR and σr of a precision experiment and the replicates n each laboratory reports. */
        PRECISION_DATA,
        /** A value taken from earlier rounds of the scheme ({@code sigmaPt}). */
        EARLIER_ROUNDS,
        /** The robust SD of this round's results: data-derived, so scores only rank (flagged). */
        ROBUST_SD_OF_ROUND
    }

    /** Scores to report. {@code Z_OR_Z_PRIME}: z, or z′ where u(x_pt) &gt; 0.3·σpt (chosen automatically). */
    public enum Score {
        Z_OR_Z_PRIME, ZETA, EN
    }

    /**
     * What happens to a measurand whose consensus x_pt, or data-derived σpt, rests on fewer results than the
     * plan's minimum.
     */
    public enum BelowMinimum {
        /** Nobody is scored against it; the run says why (the default). */
        NOT_SCORED,
        /** Scores are computed for information only: no classification anywhere. */
        INFORMATION_ONLY
    }

    /** Classification boundaries of z-like scores. */
    public enum BoundaryRule {
        /** |z| ≤ 2 satisfactory, 2 &lt; |z| &lt; 3 questionable, |z| ≥ 3 unsatisfactory (ISO/IEC 17043 Annex B). */
        SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3,
        /** |z| &lt; 2 satisfactory, 2 ≤ |z| ≤ 3 questionable, |z| &gt; 3 unsatisfactory. */
        SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3
    }

    /**
     * The plan for one measurand.
     *
     * @param element                      element symbol; must be in the scheme's catalogue
     * @param assignedValueMethod          {@link AssignedValueMethod} name
     * @param methodGroup                  for {@code CONSENSUS_METHOD_GROUP}: the group whose results count
     * @param referenceValue               for reference values: the value, in the measurand's unit
     * @param referenceExpandedUncertainty for reference values: U, in the measurand's unit
     * @param coverageFactor               k of U (default 2)
     * @param expertLaboratories           for {@code EXPERT_CONSENSUS}: laboratory ids of the experts
     * @param sigmaPtMethod                {@link SigmaPtMethod} name
     * @param sigmaPt                      for FIXED and EARLIER_ROUNDS: σpt in the measurand's unit
     * @param sigmaPtPercent               for PERCENT_OF_ASSIGNED: σpt as % of x_pt
     * @param reproducibilitySd            for PRECISION_DATA: σR
     * @param repeatabilitySd              for PRECISION_DATA: σr
     * @param replicates                   for PRECISION_DATA: n results each laboratory averages
     * @param provisionalSigmaPt           σpt for sample qualification when the σpt method depends on the
     *                                     round's data (required then)
     * @param scores                       {@link Score} names (default Z_OR_Z_PRIME)
     * @param minimumParticipants          fewest results for a consensus (default 10)
     * @param allowedMethodGroupDifference largest acceptable difference between method-group consensus values
     * @param exclusionRules               which results are excluded from the statistics, in words
     * @param quartileRule                 quartile definition (default HYNDMAN_FAN_7)
     * @param stoppingRule                 Algorithm A stopping rule (default FULL_CONVERGENCE)
     * @param boundaryRule                 {@link BoundaryRule} name (default SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3)
     * @param scoreDecimals                decimals scores are printed with and classified as printed (default 2)
     * @param scoreCoverageFactor          k at which En takes both expanded uncertainties (default 2)
     * @param minimumForDataDerivedSigmaPt fewest results for σpt = the round's robust SD (default 10)
     * @param belowMinimum                 {@link BelowMinimum} name: what happens below a minimum (default NOT_SCORED)
     * @param negativeAllowed              {@code "true"} when a negative result is a legitimate result of this
     *                                     measurand (a blank-corrected trace element); otherwise (the default) the
     *                                     intake refuses negative values
     */
    public record MeasurandPlan(String element, String assignedValueMethod, String methodGroup, String referenceValue,
                                String referenceExpandedUncertainty, String coverageFactor,
                                List<String> expertLaboratories, String sigmaPtMethod, String sigmaPt,
                                String sigmaPtPercent, String reproducibilitySd, String repeatabilitySd,
                                String replicates, String provisionalSigmaPt, List<String> scores,
                                String minimumParticipants, String allowedMethodGroupDifference,
                                String exclusionRules, String quartileRule, String stoppingRule,
                                String boundaryRule, String scoreDecimals, String scoreCoverageFactor,
                                String minimumForDataDerivedSigmaPt, String belowMinimum,
                                String negativeAllowed) {

        /** A plan entry that refuses negative results (the default). */
        public MeasurandPlan(String element, String assignedValueMethod, String methodGroup, String referenceValue,
                             String referenceExpandedUncertainty, String coverageFactor,
                             List<String> expertLaboratories, String sigmaPtMethod, String sigmaPt,
                             String sigmaPtPercent, String reproducibilitySd, String repeatabilitySd,
                             String replicates, String provisionalSigmaPt, List<String> scores,
                             String minimumParticipants, String allowedMethodGroupDifference,
                             String exclusionRules, String quartileRule, String stoppingRule,
                             String boundaryRule, String scoreDecimals, String scoreCoverageFactor,
                             String minimumForDataDerivedSigmaPt, String belowMinimum) {
            this(element, assignedValueMethod, methodGroup, referenceValue, referenceExpandedUncertainty,
                    coverageFactor, expertLaboratories, sigmaPtMethod, sigmaPt, sigmaPtPercent, reproducibilitySd,
                    repeatabilitySd, replicates, provisionalSigmaPt, scores, minimumParticipants,
                    allowedMethodGroupDifference, exclusionRules, quartileRule, stoppingRule, boundaryRule,
                    scoreDecimals, scoreCoverageFactor, minimumForDataDerivedSigmaPt, belowMinimum, null);
        }

        /** Whether the plan accepts negative results of this measurand. */
        public boolean negativeResultsAllowed() {
            return "true".equals(negativeAllowed);
        }

        /** A plan entry with the defaults for score decimals, En's k and the small-round rules. */
        public MeasurandPlan(String element, String assignedValueMethod, String methodGroup, String referenceValue,
                             String referenceExpandedUncertainty, String coverageFactor,
                             List<String> expertLaboratories, String sigmaPtMethod, String sigmaPt,
                             String sigmaPtPercent, String reproducibilitySd, String repeatabilitySd,
                             String replicates, String provisionalSigmaPt, List<String> scores,
                             String minimumParticipants, String allowedMethodGroupDifference,
                             String exclusionRules, String quartileRule, String stoppingRule,
                             String boundaryRule) {
            this(element, assignedValueMethod, methodGroup, referenceValue, referenceExpandedUncertainty,
                    coverageFactor, expertLaboratories, sigmaPtMethod, sigmaPt, sigmaPtPercent, reproducibilitySd,
                    repeatabilitySd, replicates, provisionalSigmaPt, scores, minimumParticipants,
                    allowedMethodGroupDifference, exclusionRules, quartileRule, stoppingRule, boundaryRule, null,
                    null, null, null, null);
        }
    }
}
