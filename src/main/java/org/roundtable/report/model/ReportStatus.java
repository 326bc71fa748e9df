package org.roundtable.report.model;

/** Status of an issued report. */
public enum ReportStatus {
    /** Issued before the comment window closes; figures may still change. */
    PRELIMINARY("preliminary"),
    /** The final report of the round. */
    FINAL("final"),
    /** Replaces an earlier report, which is named in {@link ReportIdentity#replacesReportId()}. */
    AMENDED("amended");

    private final String word;

    ReportStatus(String word) {
        this.word = word;
    }

    /** Lower-case word printed in the report. */
    public String word() {
        return word;
    }
}
