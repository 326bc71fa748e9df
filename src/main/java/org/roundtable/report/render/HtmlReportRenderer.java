package org.roundtable.report.render;

import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.RoundReport;

/**
 * Renders a report as a self-contained HTML page: one XHTML document (well-formed XML, served as
 * HTML5) with its style sheet inline and every chart as inline SVG. It needs no assets, so the
 * bytes can be stored, hashed and served as they are.
 *
 * <p>Thread-safe and stateless; the same model always gives the same text.
 */
public final class HtmlReportRenderer {

    /** Renders the round report. */
    public String render(RoundReport report) {
        return ReportDocument.build(report, null, ChartEmbedding.INLINE_SVG).xhtml();
    }

    /** Renders a participant's report: its own results, scores and highlighted charts; others by code only. */
    public String render(LaboratoryReport report) {
        return ReportDocument.build(report.round(), report.ownParticipantCode(), ChartEmbedding.INLINE_SVG).xhtml();
    }
}
