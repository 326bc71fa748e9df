package org.roundtable.report;

/** What an issued document is. Stored by name in {@code issued_document.kind}. */
public enum DocumentKind {
    /** The round report, with every participant under its code. */
    ROUND,
    /**
     * One laboratory's report: its own results and scores, the round's key figures and the charts with its own
     * bar or point highlighted; everyone's results are in the round report.
     */
    LABORATORY,
    /** A laboratory's export of its history across rounds. */
    HISTORY_EXPORT
}
