package org.roundtable.report.model;

import java.util.Objects;

/**
 * The report for one participant: its own results and scores, the round's key figures per measurand
 * and the charts with its own bar or point highlighted. Other participants appear only by code, in
 * the charts; the table of every participant's results is in the round report, to which the
 * laboratory report points by its report id.
 *
 * @param round the round's model, carrying this laboratory report's own identity (report id, status)
 * @param ownParticipantCode the code of the participant this report is for
 * @param roundReportId the report id of the round report with every participant's results
 */
public record LaboratoryReport(RoundReport round, String ownParticipantCode, String roundReportId) {

    public LaboratoryReport {
        Objects.requireNonNull(round, "round");
        Objects.requireNonNull(ownParticipantCode, "ownParticipantCode");
        Objects.requireNonNull(roundReportId, "roundReportId");
        boolean present = round.measurands().stream()
                .flatMap(m -> m.results().stream())
                .anyMatch(r -> r.participantCode().equals(ownParticipantCode));
        if (!present) {
            throw new IllegalArgumentException("participant " + ownParticipantCode + " has no results in the round");
        }
    }

    /** A laboratory report drawn from the round report itself (same identity; previews and tests). */
    public LaboratoryReport(RoundReport round, String ownParticipantCode) {
        this(round, ownParticipantCode, round.identity().reportId());
    }
}
