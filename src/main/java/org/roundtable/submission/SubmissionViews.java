package org.roundtable.submission;

import java.math.BigDecimal;
import java.time.OffsetDateTime;
import java.util.List;

/** What the submission feature shows: receipts, revisions and their results. Plain records, no entities. */
public final class SubmissionViews {

    private SubmissionViews() {
    }

    /** Something the laboratory confirmed (or must confirm) before its results are accepted. */
    public record Warning(int row, String column, String value, String key, String message) {
    }

    /**
     * Proof that a revision was stored: given only after its transaction committed.
     *
     * @param sha256   SHA-256 of the canonical payload (the accepted results as canonical JSON)
     * @param detected  how the upload was read, e.g. "CSV, UTF-8 with byte order mark, delimiter ';', decimal ','"
     * @param unchanged the values sent were those of the current revision: nothing new was stored, and this is
     *                  the current revision's receipt
     */
    public record Receipt(long submissionId, int revision, String receiptId, String sha256, OffsetDateTime serverTime,
                          boolean late, String channel, List<Warning> confirmedWarnings, String detected,
                          boolean unchanged) {
    }

    /** One result as the laboratory reported it, with the value converted exactly to the measurand's unit. */
    public record Result(String measurand, String item, String valueAsReported, String unitAsReported, boolean lessThan,
                         BigDecimal valueInMeasurandUnit, String expandedUncertaintyAsReported,
                         BigDecimal expandedUncertaintyInMeasurandUnit, BigDecimal coverageFactor, String method,
                         Integer replicates, String replicateValues) {
    }

    public record Revision(int revision, String receiptId, String sha256, String channel, OffsetDateTime submittedAt,
                           String submittedBy, boolean late, String correctionReason, List<Result> results) {
    }

    public record RevisionSummary(int revision, String receiptId, String sha256, String channel,
                                  OffsetDateTime submittedAt, String submittedBy, boolean late) {
    }

    /** A laboratory's own view of its submission in a round. */
    public record MySubmission(long roundId, String roundCode, String participantCode, String roundState,
                               OffsetDateTime resultDeadline, String deadlineTimeZone, String latePolicy,
                               Revision current, List<RevisionSummary> revisions) {
    }

    /** The coordinator's line per enrolled laboratory. */
    public record Participation(long laboratoryId, String participantCode, int currentRevision,
                                OffsetDateTime lastSubmittedAt, boolean late, String channel) {
    }

    /**
     * The coordinator's line per enrolled laboratory on the submissions page.
     *
     * @param currentRevision 0 when the laboratory has sent nothing
     * @param submittedAt     when the current revision came, or null
     */
    public record StatusRow(long laboratoryId, String laboratoryName, String organisation, String participantCode,
                            int currentRevision, OffsetDateTime submittedAt, String channel, SubmissionStatus status,
                            int revisions) {
    }

    /** One page of {@link StatusRow}s, the number of rows the filter finds, and the round's count per status. */
    public record StatusPage(List<StatusRow> rows, long total, long submitted, long late, long missing) {
        public long enrolled() {
            return submitted + late + missing;
        }
    }

    public record Flag(String kind, long laboratoryId, String participantCode, long otherLaboratoryId,
                       String otherParticipantCode, String detail, OffsetDateTime raisedAt) {
    }

    public record Message(long id, long laboratoryId, boolean fromCoordinator, String author, String body,
                          OffsetDateTime postedAt) {
    }

    /** The newest {@code items} of a list that grows with the laboratories of a round, and how many there are in all. */
    public record Latest<T>(List<T> items, long total) {

        /** Whether there are more than are shown. */
        public boolean more() {
            return total > items.size();
        }
    }
}
