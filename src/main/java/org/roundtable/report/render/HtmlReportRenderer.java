package org.roundtable.report.render;

import org.roundtable.report.chart.ChartDataCache;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.RoundReport;

/**
 * Renders a report as a self-contained HTML page: one XHTML document (well-formed XML, served as
 * HTML5) with its style sheet inline and every chart as inline SVG. It needs no assets, so the
 * bytes can be stored, hashed and served as they are.
 *
 * <p>Thread-safe; the same model always gives the same text. Chart data shared by the reports of a
 * round is computed once per measurand section and kept by this renderer ({@link ChartDataCache}).
 */
public final class HtmlReportRenderer {

    private final ChartDataCache chartData = new ChartDataCache();

    /** Renders the round report. */
    public String render(RoundReport report) {
        return ReportDocument.build(report, ChartEmbedding.INLINE_SVG, chartData).xhtml();
    }

    /** Renders a participant's report: its own results, scores and highlighted charts; others by code only. */
    public String render(LaboratoryReport report) {
        return ReportDocument.build(report, ChartEmbedding.INLINE_SVG, chartData).xhtml();
    }
}
