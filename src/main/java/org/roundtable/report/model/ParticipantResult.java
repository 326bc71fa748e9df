package org.roundtable.report.model;

import java.util.Objects;
import org.roundtable.statistics.score.Classification;

/**
 * One participant's result for one measurand, with its scores.
 *
 * <p>Only the participant code identifies the laboratory. Scores are {@code null} when not
 * computed (no uncertainty reported, a censored "&lt;" result, an excluded or late result).
 *
 * @param participantCode the participant code, e.g. {@code P07}
 * @param itemLabel label of the item the result is for (paired rounds: A or B)
 * @param reportedValue the value as reported, a decimal string (with "&lt;" for a censored result)
 * @param value the reported value as a number (the limit for a censored result)
 * @param unit unit as printed, {@code %} or {@code mg/kg}
 * @param expandedUncertainty U as reported, or {@code null}
 * @param coverageFactor k as reported, or {@code null}
 * @param methodGroup method group of the participant's method
 * @param z z score, or {@code null}
 * @param zPrime z′ score, or {@code null}
 * @param zeta ζ score, or {@code null}
 * @param en E_n number, or {@code null}
 * @param classification the classification of the score the round uses, made on the score as printed; {@code null} if not scored or scored for information only
 * @param lessThan whether the result was reported as "&lt; limit"
 * @param lessThanCheck the verdict on a censored result, e.g. "consistent with x_pt"; empty otherwise
 * @param excluded whether the result was excluded from the statistics
 * @param exclusionReason why; empty when not excluded
 * @param late whether the result arrived after the deadline
 */
public record ParticipantResult(String participantCode, String itemLabel, String reportedValue, double value,
        String unit, Double expandedUncertainty, Double coverageFactor, String methodGroup,
        Double z, Double zPrime, Double zeta, Double en, Classification classification,
        boolean lessThan, String lessThanCheck, boolean excluded, String exclusionReason, boolean late) {

    public ParticipantResult {
        Objects.requireNonNull(participantCode, "participantCode");
        Objects.requireNonNull(reportedValue, "reportedValue");
        itemLabel = itemLabel == null ? "" : itemLabel;
        unit = unit == null ? "" : unit;
        methodGroup = methodGroup == null ? "" : methodGroup;
        lessThanCheck = lessThanCheck == null ? "" : lessThanCheck;
        exclusionReason = exclusionReason == null ? "" : exclusionReason;
    }
}
