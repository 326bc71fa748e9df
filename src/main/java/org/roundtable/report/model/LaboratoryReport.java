package org.roundtable.report.model;

import java.util.Objects;

/**
 * The report for one participant: the round's figures, the participant's own results and scores,
 * and charts in which its own bar or point is highlighted. Other participants appear only by code.
 *
 * @param round the round report the laboratory report is drawn from
 * @param ownParticipantCode the code of the participant this report is for
 */
public record LaboratoryReport(RoundReport round, String ownParticipantCode) {

    public LaboratoryReport {
        Objects.requireNonNull(round, "round");
        Objects.requireNonNull(ownParticipantCode, "ownParticipantCode");
        boolean present = round.measurands().stream()
                .flatMap(m -> m.results().stream())
                .anyMatch(r -> r.participantCode().equals(ownParticipantCode));
        if (!present) {
            throw new IllegalArgumentException("participant " + ownParticipantCode + " has no results in the round");
        }
    }
}
