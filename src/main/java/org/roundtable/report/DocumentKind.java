package org.roundtable.report;

/** What an issued document is. Stored by name in {@code issued_document.kind}. */
public enum DocumentKind {
    /** The round report, with every participant under its code. */
    ROUND,
    /** One laboratory's report: the round report with that laboratory's own code marked. */
    LABORATORY,
    /** A laboratory's export of its history across rounds. */
    HISTORY_EXPORT
}
