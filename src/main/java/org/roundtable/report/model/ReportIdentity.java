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
 * @param providerName the proficiency testing provider's organisation (not the software)
 * @param providerAddress the provider's postal address, or {@code null}
 * @param providerAccreditation the provider's accreditation identifier (ISO/IEC 17043), or {@code null}
 */
public record ReportIdentity(String reportId, ReportStatus status, String replacesReportId,
        String amendmentReason, LocalDate issueDate, String providerName, String providerAddress,
        String providerAccreditation) {

    /** An identity naming the provider by name only. */
    public ReportIdentity(String reportId, ReportStatus status, String replacesReportId, String amendmentReason,
                          LocalDate issueDate, String providerName) {
        this(reportId, status, replacesReportId, amendmentReason, issueDate, providerName, null, null);
    }

    /** The same identity with another report number, status and replaced report (a laboratory report of the issue). */
    public ReportIdentity withReport(String otherReportId, String otherReplacesReportId) {
        return new ReportIdentity(otherReportId, status, otherReplacesReportId, amendmentReason, issueDate, providerName,
                providerAddress, providerAccreditation);
    }

    /** The same identity naming another provider. */
    public ReportIdentity withProvider(String name, String address, String accreditation) {
        return new ReportIdentity(reportId, status, replacesReportId, amendmentReason, issueDate, name, address,
                accreditation);
    }

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
