package org.roundtable.report;

import java.time.Instant;

/**
 * Fired (synchronously, inside the issuing transaction) when a round report that names an evaluation run has been
 * issued: the moment that run's scores become readable by the round's laboratories (preliminary on) or auditors
 * (final and amended). Features that keep their own summaries of published scores (the history) observe it; the
 * report feature does not know them.
 *
 * @param documentId         the issued document's row id
 * @param reportId           its report number
 * @param status             {@code PRELIMINARY}, {@code FINAL} or {@code AMENDED}
 * @param roundId            the round
 * @param evaluationRunId    the evaluation run's row id
 * @param evaluationVersion  the run's version within the round
 * @param sha256             SHA-256 of the exact bytes issued
 * @param issuedAt           when it was issued
 * @param replacesDocumentId the document an amendment replaces, else null
 */
public record RoundReportIssued(long documentId, String reportId, String status, long roundId, long evaluationRunId,
                                int evaluationVersion, String sha256, Instant issuedAt, Long replacesDocumentId) {
}
