package org.roundtable.report;

import org.roundtable.report.model.ReportStatus;

import java.time.Instant;

/**
 * What is known about one issued document, without its bytes.
 *
 * @param id the row id (internal; never shown to an anonymous caller)
 * @param reportId the report number printed on the document
 * @param kind round, laboratory or history export
 * @param status preliminary, final or amended
 * @param roundId the round, if any (internal)
 * @param laboratoryId the laboratory, for laboratory reports and history exports (internal, confidential)
 * @param replacesReportId the report number this one replaces, for an amendment
 * @param amendmentReason why the replaced report was amended
 * @param sha256 lower-case hex SHA-256 of the exact bytes issued
 * @param issuedAt when it was issued
 * @param supersededBy the report number of the newer version that replaces this one, read from that version (for a
 *                     preliminary report: the final report of the same kind and laboratory, once issued)
 */
public record IssuedDocument(long id, String reportId, DocumentKind kind, ReportStatus status, Long roundId,
                             Long laboratoryId, String replacesReportId, String amendmentReason, String sha256,
                             Instant issuedAt, String supersededBy) {
}
