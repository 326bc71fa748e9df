package org.roundtable.report.model;

import java.time.LocalDate;
import java.util.Objects;

/**
 * Identification of one issued report.
 *
 * @param reportId unique report number, printed on every page
 * @param status preliminary, final or amended
 * @param replacesReportId the report this one replaces; required for {@link ReportStatus#AMENDED}, else {@code null}
 * @param amendmentReason why the earlier report was replaced; required for {@link ReportStatus#AMENDED}, else {@code null}
 * @param issueDate date of issue; also used as the PDF creation date so that output is reproducible
 * @param providerName the proficiency testing provider
 */
public record ReportIdentity(String reportId, ReportStatus status, String replacesReportId,
        String amendmentReason, LocalDate issueDate, String providerName) {

    public ReportIdentity {
        Objects.requireNonNull(reportId, "reportId");
        Objects.requireNonNull(status, "status");
        Objects.requireNonNull(issueDate, "issueDate");
        Objects.requireNonNull(providerName, "providerName");
        if (status == ReportStatus.AMENDED && (isBlank(replacesReportId) || isBlank(amendmentReason))) {
            throw new IllegalArgumentException("an amended report names the report it replaces and the reason");
        }
    }

    private static boolean isBlank(String s) {
        return s == null || s.isBlank();
    }
}
