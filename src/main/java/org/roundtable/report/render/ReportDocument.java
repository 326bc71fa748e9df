package org.roundtable.report.render;

import static org.roundtable.report.render.Xhtml.esc;
import static org.roundtable.report.render.Xhtml.sym;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.roundtable.report.chart.ChartDataCache;
import org.roundtable.report.chart.MeasurandChartData;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.chart.ReportCharts;
import org.roundtable.report.chart.SvgCharts;
import org.roundtable.report.model.Exclusion;
import org.roundtable.report.model.ItemCheck;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.MethodGroupStatistics;
import org.roundtable.report.model.PairedItems;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.Signatory;
import org.roundtable.report.style.ReportFormat;
import org.roundtable.statistics.score.Classification;

/**
 * Writes a report as one well-formed XHTML document, shared by the HTML page and the PDF.
 *
 * <p>Plain string building with escaping keeps the renderer free of any framework; every text from
 * the model passes {@link Xhtml#esc}. Section titles and the fixed texts (classification rules,
 * the caution that scores support and do not replace judgement) are Roundtable's own.
 */
final class ReportDocument {

    /** MIME type of the chart placeholders the PDF renderer draws. */
    static final String CHART_OBJECT_TYPE = "application/x-roundtable-chart";

    /** Fixed caution printed in every report. */
    static final String CAUTION = "Scores support, and do not replace, the judgement of the laboratory and of its "
            + "accreditation body. A score describes one result on one item in one round; decide on actions "
            + "with everything else you know about the method, the instrument and the sample.";

    static final String END_OF_REPORT = "End of report";

    /** Height of the measurand charts in a laboratory report, in CSS pixels. */
    static final int LABORATORY_CHART_HEIGHT = 190;

    private static final DateTimeFormatter DATE = DateTimeFormatter.ISO_LOCAL_DATE;
    private static final String CSS = loadCss();

    private final RoundReport report;
    private final String ownCode;
    private final String roundReportId;
    private final ChartEmbedding embedding;
    private final ChartDataCache chartData;
    private final StringBuilder out;
    private final Map<String, ReportChart> charts = new LinkedHashMap<>();
    private int section;

    private ReportDocument(RoundReport report, String ownCode, String roundReportId, ChartEmbedding embedding,
            ChartDataCache chartData) {
        this.report = report;
        this.ownCode = ownCode;
        this.roundReportId = roundReportId;
        this.embedding = embedding;
        this.chartData = chartData;
        this.out = new StringBuilder(ownCode == null ? 64 * 1024 + report.resultCount() * 700
                : 64 * 1024 + report.measurands().size() * 4 * 1024);
    }

    /** The XHTML and the charts it refers to (by key), in document order. */
    record Built(String xhtml, Map<String, ReportChart> charts) {
    }

    /**
     * Builds the round report's document.
     *
     * @param report the round report
     * @param embedding how charts are embedded
     * @param chartData chart data of the measurands, shared with other reports of the same round
     */
    static Built build(RoundReport report, ChartEmbedding embedding, ChartDataCache chartData) {
        ReportDocument doc = new ReportDocument(report, null, null, embedding, chartData);
        doc.write();
        return new Built(doc.out.toString(), Map.copyOf(doc.charts));
    }

    /**
     * Builds a laboratory report's document: its own results and scores, the round's key figures and
     * the charts per measurand, no table of the other participants' results (those are in the round
     * report, named by its report id).
     *
     * @param report the laboratory report
     * @param embedding how charts are embedded
     * @param chartData chart data of the measurands, shared with other reports of the same round
     */
    static Built build(LaboratoryReport report, ChartEmbedding embedding, ChartDataCache chartData) {
        ReportDocument doc = new ReportDocument(report.round(), report.ownParticipantCode(), report.roundReportId(),
                embedding, chartData);
        doc.write();
        return new Built(doc.out.toString(), Map.copyOf(doc.charts));
    }

    private boolean forLaboratory() {
        return ownCode != null;
    }

    private void write() {
        out.append("<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n")
                .append("<meta charset=\"UTF-8\"/>\n<title>").append(esc(title())).append("</title>\n")
                .append("<meta name=\"subject\" content=\"").append(esc(report.scheme().schemeCode() + " "
                        + report.round().roundId())).append("\"/>\n")
                .append("<style>\n").append(CSS).append(pageCss()).append("</style>\n</head>\n<body>\n");
        writeTitleBlock();
        writeStatusAndConfidentiality();
        writeSchemeAndRound();
        if (forLaboratory()) {
            writeOwnSummary();
            writeItem();
            writeEvaluation();
            writeOwnMeasurands();
        } else {
            writeItem();
            writeEvaluation();
            writeOverview();
            writeMeasurands();
        }
        writePairs();
        writeInterpretation();
        writeComments();
        writeSignOff();
        out.append("<p class=\"end\" id=\"end-of-report\">").append(END_OF_REPORT).append(" ")
                .append(esc(report.identity().reportId())).append("</p>\n");
        out.append("</body>\n</html>\n");
    }

    private String title() {
        return forLaboratory()
                ? "Participant report " + ownCode + ", round " + report.round().roundId()
                : "Round report, round " + report.round().roundId();
    }

    /** Paged-media rules: margins, running header with the report's identity, "page x of y" footer. */
    private String pageCss() {
        var id = report.identity();
        String header = report.scheme().schemeCode() + " \u00b7 round " + report.round().roundId()
                + " \u00b7 report " + id.reportId() + " \u00b7 " + id.status().word()
                + (forLaboratory() ? " \u00b7 participant " + ownCode : "");
        return "@page { size: A4; margin: 20mm 16mm 18mm 16mm;\n"
                + "  @top-left { content: \"" + cssString(header) + "\"; font-family: \"DejaVu Sans\"; "
                + "font-size: 7.5pt; color: #5b6770; vertical-align: bottom; padding-bottom: 3mm; }\n"
                + "  @bottom-left { content: \"" + cssString(report.identity().providerName()) + "\"; "
                + "font-family: \"DejaVu Sans\"; font-size: 7.5pt; color: #5b6770; vertical-align: top; padding-top: 3mm; }\n"
                + "  @bottom-right { content: \"page \" counter(page) \" of \" counter(pages); "
                + "font-family: \"DejaVu Sans\"; font-size: 7.5pt; color: #2d4a57; vertical-align: top; padding-top: 3mm; }\n"
                + "}\n";
    }

    private static String cssString(String s) {
        return s.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", " ").replace("<", "\\3c ");
    }

    // ---------------------------------------------------------------- front matter

    private void writeTitleBlock() {
        var id = report.identity();
        out.append("<h1>").append(forLaboratory() ? "Participant report" : "Proficiency test round report")
                .append("</h1>\n<p class=\"subtitle\">").append(esc(report.scheme().schemeName()))
                .append(" \u2014 ").append(esc(report.round().title())).append("</p>\n");
        out.append("<table class=\"ident\">\n");
        identRow("Report", esc(id.reportId()));
        identRow("Status", "<span class=\"status status-" + id.status().name().toLowerCase() + "\">"
                + id.status().word() + "</span>"
                + (id.status() == ReportStatus.AMENDED ? " replaces report " + esc(id.replacesReportId()) : ""));
        identRow("Issue date", id.issueDate().format(DATE));
        identRow("Scheme", esc(report.scheme().schemeCode() + " \u2014 " + report.scheme().schemeName()));
        identRow("Round", esc(report.round().roundId()));
        if (forLaboratory()) {
            identRow("Participant code", "<span class=\"you\">" + esc(ownCode) + "</span>");
            identRow("Round report", esc(roundReportId) + " (every participant's results, by code)");
        }
        identRow("Provider", esc(id.providerName())
                + (id.providerAddress() == null ? "" : "<br/>" + esc(id.providerAddress()))
                + (id.providerAccreditation() == null ? "" : "<br/>Accreditation " + esc(id.providerAccreditation())));
        Signatory coordinator = report.signatures().coordinator();
        identRow("Coordinator", esc(coordinator.name() + ", " + coordinator.function()));
        out.append("</table>\n");
    }

    private void identRow(String label, String html) {
        out.append("<tr><th>").append(label).append("</th><td>").append(html).append("</td></tr>\n");
    }

    private void heading(String title, String anchor) {
        section++;
        out.append("<h2 id=\"").append(anchor).append("\">").append(section).append(" ").append(esc(title))
                .append("</h2>\n");
    }

    private void writeStatusAndConfidentiality() {
        var id = report.identity();
        heading("Status and confidentiality", "status");
        out.append("<div class=\"notice\"><p>");
        switch (id.status()) {
            case PRELIMINARY -> out.append("This is a <b>preliminary</b> report. Figures may change before the "
                    + "final report; do not use it for corrective actions without checking the final report.");
            case FINAL -> out.append("This is the <b>final</b> report of the round.");
            case AMENDED -> out.append("This <b>amended</b> report replaces report <b>")
                    .append(esc(id.replacesReportId())).append("</b>, which is withdrawn. Reason: ")
                    .append(esc(id.amendmentReason()));
        }
        out.append("</p></div>\n<p>").append(esc(report.confidentialityStatement())).append("</p>\n");
        // the confidentiality statement says already that participants appear by code only; say it once
        if (!report.confidentialityStatement().contains("participant code")) {
            out.append("<p>Participants are identified only by their participant codes.</p>\n");
        }
        if (forLaboratory()) {
            out.append("<p>Your code in this round is <span class=\"you\">").append(esc(ownCode)).append("</span>.</p>\n");
        }
        if (forLaboratory()) {
            out.append("<p>This report shows your own results and scores, the round's key figures and the charts, "
                    + "in which other participants appear only as unlabelled bars and points (or by code in small "
                    + "rounds). The results and scores of every participant, by code, are in the round report <b>")
                    .append(esc(roundReportId)).append("</b>, which every participant receives.</p>\n");
        }
    }

    private void writeSchemeAndRound() {
        var round = report.round();
        heading("Scheme and round", "scheme");
        out.append("<table class=\"ident\">\n");
        identRow("Scheme", esc(report.scheme().schemeName()));
        identRow("Round", esc(round.roundId() + " \u2014 " + round.title()));
        if (round.dispatchDate() != null) {
            identRow("Items sent", round.dispatchDate().format(DATE));
        }
        if (round.closingDate() != null) {
            identRow("Closing date for results", round.closingDate().format(DATE));
        }
        identRow("Participants", round.participantsReporting() + " reported of " + round.participantsEnrolled()
                + " enrolled");
        identRow("Measurands", String.valueOf(report.measurands().size()));
        out.append("</table>\n");
        if (!report.scheme().design().isEmpty()) {
            out.append("<p>").append(sym(report.scheme().design())).append("</p>\n");
        }
    }

    /** The participant's own result for a measurand, or {@code null} when it reported none. */
    private ParticipantResult ownResult(MeasurandSection m) {
        for (ParticipantResult r : m.results()) {
            if (r.participantCode().equals(ownCode)) {
                return r;
            }
        }
        return null;
    }

    private void writeOwnSummary() {
        heading("Your results at a glance", "own-summary");
        out.append("<p>Every measurand of the round, with your result as reported. Scores are computed from the "
                + "unrounded values, printed to the plan's score decimals (stated in \u201cHow the results were "
                + "evaluated\u201d) and classified <b>as printed</b>, so a printed score and its verdict always agree; "
                + "the assessment uses the score named in \u201cscore used\u201d. Scores for information only carry "
                + "no verdict.</p>\n");
        out.append("<h4>Your results</h4>\n<table class=\"results\">\n<thead><tr><th style=\"width: 22%\">Measurand</th>"
                + "<th class=\"num\" style=\"width: 13%\">Your result</th><th class=\"num\" style=\"width: 9%\">U</th>"
                + "<th class=\"num\" style=\"width: 10%\">x<sub>pt</sub></th>"
                + "<th class=\"num\" style=\"width: 9%\">u(x<sub>pt</sub>)</th>"
                + "<th class=\"num\" style=\"width: 9%\">\u03c3<sub>pt</sub></th><th>Notes</th></tr></thead>\n<tbody>\n");
        for (MeasurandSection m : report.measurands()) {
            ParticipantResult r = ownResult(m);
            int dd = dispersionDigits(m);
            out.append("<tr><td>").append(esc(m.title())).append("</td><td class=\"num\">");
            if (r == null) {
                out.append("no result");
            } else {
                out.append(esc(ReportFormat.minusSigns(r.reportedValue()))).append(" ").append(esc(m.unit()));
            }
            out.append("</td><td class=\"num\">").append(r == null ? "" : ReportFormat.decimal(r.expandedUncertainty(), dd))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.assignedValue(), m.reportingDigits()))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.assignedValueUncertainty(), dd))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.sigmaPt(), dd))
                    .append("</td><td>").append(r == null ? "" : notes(r)).append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
        out.append("<h4>Your scores</h4>\n<table class=\"results\">\n<thead><tr><th style=\"width: 22%\">Measurand</th>"
                + "<th style=\"width: 10%\">Score used</th><th class=\"num\" style=\"width: 10%\">z</th>"
                + "<th class=\"num\" style=\"width: 10%\">z\u2032</th><th class=\"num\" style=\"width: 10%\">\u03b6</th>"
                + "<th class=\"num\" style=\"width: 10%\">En</th><th>Assessment</th></tr></thead>\n<tbody>\n");
        for (MeasurandSection m : report.measurands()) {
            ParticipantResult r = ownResult(m);
            out.append("<tr><td>").append(esc(m.title())).append("</td><td>")
                    .append(ReportCharts.scoreSymbol(m.scoreKind()));
            if (r == null) {
                out.append("</td><td class=\"num\"></td><td class=\"num\"></td><td class=\"num\"></td>"
                        + "<td class=\"num\"></td><td class=\"unscored\">no result</td></tr>\n");
                continue;
            }
            out.append("</td><td class=\"num\">").append(ReportFormat.score(r.z(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.zPrime(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.zeta(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.en(), m.scoreDecimals()))
                    .append("</td>").append(assessmentCell(r)).append("</tr>\n");
        }
        out.append("</tbody></table>\n");
    }

    /** The laboratory's own results left out of the statistics (the round report lists everyone's). */
    private void writeOwnExclusions() {
        out.append("<h4>Your results left out of the statistics</h4>\n");
        List<Exclusion> own = report.evaluation().exclusions().stream()
                .filter(e -> e.participantCode().equals(ownCode)).toList();
        if (own.isEmpty()) {
            out.append("<p>None.</p>\n");
            return;
        }
        out.append("<table>\n<thead><tr><th>Measurand</th><th>Reason</th></tr></thead>\n<tbody>\n");
        for (Exclusion e : own) {
            out.append("<tr><td>").append(esc(e.measurandId().isEmpty() ? "all"
                            : report.measurand(e.measurandId()).map(MeasurandSection::title).orElse(e.measurandId())))
                    .append("</td><td>").append(sym(e.reason())).append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
    }

    private void writeOwnMeasurands() {
        heading("Your results by measurand", "measurands");
        out.append("<p>Each measurand starts on a new page: the round's key figures, your result and score, and "
                + "the charts with your bar or point in copper. Statistics by method group and the results of every "
                + "participant are in the round report ").append(esc(roundReportId)).append(".</p>\n");
        int sub = 0;
        for (MeasurandSection m : report.measurands()) {
            sub++;
            writeOwnMeasurand(m, section + "." + sub);
        }
    }

    private void writeOwnMeasurand(MeasurandSection m, String number) {
        int d = m.reportingDigits();
        int dd = dispersionDigits(m);
        String unit = " " + esc(m.unit());
        out.append("<div class=\"measurand\">\n<h3 id=\"m-").append(esc(m.id())).append("\">").append(number).append(" ")
                .append(esc(m.title())).append(", ").append(esc(m.unit())).append("</h3>\n");
        // compact key figures, so that the figures and the three charts of a measurand fit on one page
        out.append("<table class=\"keep\">\n<colgroup><col style=\"width: 27%\"/><col style=\"width: 30%\"/><col/>"
                + "</colgroup>\n<tbody>\n");
        keyRow("Results used (n)", String.valueOf(m.n()), "");
        keyRow("x<sub>pt</sub> / u(x<sub>pt</sub>)", ReportFormat.decimal(m.assignedValue(), d) + " / "
                + ReportFormat.decimal(m.assignedValueUncertainty(), dd) + unit, sym(m.assignedValueMethod()));
        keyRow("\u03c3<sub>pt</sub>", ReportFormat.decimal(m.sigmaPt(), dd) + unit, sym(m.sigmaPtMethod()));
        var robust = m.robust();
        keyRow("Robust mean x* / SD s*", ReportFormat.decimal(robust.robustMean(), d) + " / "
                + ReportFormat.decimal(robust.robustSd(), dd) + unit, esc(robust.method()) + ", " + robust.iterations()
                + " iterations, " + (robust.converged() ? "converged" : "<b>not converged</b>"));
        keyRow("Median / MADe / nIQR", ReportFormat.decimal(robust.median(), d) + " / "
                + ReportFormat.decimal(robust.scaledMad(), dd) + " / " + ReportFormat.decimal(robust.normalizedIqr(), dd)
                + unit, "");
        keyRow("Score used", ReportCharts.scoreSymbol(m.scoreKind()), sym(m.scoreChoiceReason()));
        ParticipantResult r = ownResult(m);
        if (r == null) {
            out.append("<tr class=\"own\"><th>Your result</th><td class=\"num\">no result</td><td></td></tr>\n");
        } else {
            Double score = ReportCharts.primaryScore(m, r);
            String u = r.expandedUncertainty() == null ? ""
                    : " \u00b1 " + ReportFormat.decimal(r.expandedUncertainty(), dd) + " (U, k = "
                    + ReportFormat.decimal(r.coverageFactor() == null ? 2.0 : r.coverageFactor(), 1) + ")";
            out.append("<tr class=\"own\"><th>Your result</th><td class=\"num\">")
                    .append(esc(ReportFormat.minusSigns(r.reportedValue()))).append(unit).append(u)
                    .append("</td><td>").append(ReportCharts.scoreSymbol(m.scoreKind())).append(" = ")
                    .append(ReportFormat.score(score, m.scoreDecimals())).append(", ").append(assessment(r));
            String notes = notes(r);
            if (!notes.isEmpty()) {
                out.append("; ").append(notes);
            }
            out.append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
        if (!m.warnings().isEmpty()) {
            out.append("<div class=\"warnings\"><b>Warnings</b><ul>\n");
            for (String w : m.warnings()) {
                out.append("<li>").append(sym(w)).append("</li>\n");
            }
            out.append("</ul></div>\n");
        }
        writeCharts(m);
        out.append("</div>\n");
    }

    // ---------------------------------------------------------------- item and evaluation

    private void writeItem() {
        var item = report.item();
        heading("The test item", "item");
        out.append("<p>").append(sym(item.description())).append("</p>\n");
        if (!item.preparation().isEmpty()) {
            out.append("<p>").append(sym(item.preparation())).append("</p>\n");
        }
        if (item.checks().isEmpty()) {
            return;
        }
        boolean oneNote = item.checks().stream().map(ItemCheck::note).distinct().count() == 1;
        out.append("<h4>Homogeneity and stability</h4>\n<table>\n<thead><tr><th>Measurand</th>"
                + "<th class=\"num\">s<sub>s</sub></th><th class=\"num\">limit</th><th>Homogeneity</th>"
                + "<th class=\"num\">stability difference</th><th class=\"num\">limit</th><th>Stability</th>")
                .append(oneNote ? "" : "<th>Notes</th>").append("</tr></thead>\n<tbody>\n");
        for (ItemCheck c : item.checks()) {
            Optional<MeasurandSection> m = report.measurand(c.measurandId());
            int digits = m.map(ReportDocument::dispersionDigits).orElse(4);
            String unit = m.map(MeasurandSection::unit).orElse("");
            out.append("<tr><td>").append(esc(m.map(MeasurandSection::title).orElse(c.measurandId())))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(c.betweenSampleSd(), digits))
                    .append(" ").append(esc(unit))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(c.homogeneityLimit(), digits))
                    .append("</td><td>").append(verdict(c.homogeneous(), "sufficiently homogeneous", "not homogeneous"))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(c.stabilityDifference(), digits))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(c.stabilityLimit(), digits))
                    .append("</td><td>").append(verdict(c.stable(), "stable", "not stable"))
                    .append(oneNote ? "" : "</td><td>" + sym(c.note())).append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
        if (oneNote && !item.checks().get(0).note().isEmpty()) {
            out.append("<p class=\"caption\">All checks: ").append(sym(item.checks().get(0).note())).append("</p>\n");
        }
    }

    private static String verdict(boolean passed, String yes, String no) {
        return passed ? "<span class=\"satisfactory\">" + yes + "</span>"
                : "<span class=\"unsatisfactory\">" + no + "</span>";
    }

    private void writeEvaluation() {
        var notes = report.evaluation();
        heading("How the results were evaluated", "evaluation");
        if (!notes.methods().isEmpty()) {
            out.append("<ul>\n");
            for (String method : notes.methods()) {
                out.append("<li>").append(sym(method)).append("</li>\n");
            }
            out.append("</ul>\n");
        }
        out.append("<table class=\"ident\">\n");
        identRow("Stopping rule", sym(notes.stoppingRule()));
        identRow("Scores on a boundary", sym(notes.boundaryRule()));
        identRow("Quartiles", sym(notes.quartileRule()));
        if (!notes.lateResultPolicy().isEmpty()) {
            identRow("Late results", sym(notes.lateResultPolicy()));
        }
        out.append("</table>\n<p>How the assigned value x<sub>pt</sub> and the standard deviation for proficiency "
                + "assessment \u03c3<sub>pt</sub> were set is stated for each measurand in section ")
                .append(section + (forLaboratory() ? 1 : 2)).append(".</p>\n");
        if (forLaboratory()) {
            writeOwnExclusions();
            return;
        }
        out.append("<h4>Results left out of the statistics</h4>\n");
        if (notes.exclusions().isEmpty()) {
            out.append("<p>None.</p>\n");
        } else {
            out.append("<table>\n<thead><tr><th>Participant</th><th>Measurand</th><th>Reason</th></tr></thead>\n<tbody>\n");
            for (Exclusion e : notes.exclusions()) {
                out.append(e.participantCode().equals(ownCode) ? "<tr class=\"own\">" : "<tr>")
                        .append("<td>").append(esc(e.participantCode())).append("</td><td>")
                        .append(esc(e.measurandId().isEmpty() ? "all"
                                : report.measurand(e.measurandId()).map(MeasurandSection::title).orElse(e.measurandId())))
                        .append("</td><td>").append(sym(e.reason())).append("</td></tr>\n");
            }
            out.append("</tbody></table>\n");
        }
    }

    private void writeOverview() {
        heading("Measurands at a glance", "overview");
        out.append("<table>\n<thead><tr><th style=\"width: 22%\">Measurand</th><th>Unit</th><th class=\"num\">n</th>"
                + "<th class=\"num\">x<sub>pt</sub></th><th class=\"num\">u(x<sub>pt</sub>)</th>"
                + "<th class=\"num\">\u03c3<sub>pt</sub></th><th>Score</th><th class=\"num\">satisfactory</th>"
                + "<th class=\"num\">questionable</th><th class=\"num\">unsatisfactory</th></tr></thead>\n<tbody>\n");
        for (MeasurandSection m : report.measurands()) {
            int[] counts = new int[3];
            for (ParticipantResult r : m.results()) {
                if (r.classification() != null) {
                    counts[r.classification().ordinal()]++;
                }
            }
            out.append("<tr><td>").append(esc(m.title())).append("</td><td>").append(esc(m.unit()))
                    .append("</td><td class=\"num\">").append(m.n())
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.assignedValue(), m.reportingDigits()))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.assignedValueUncertainty(),
                            dispersionDigits(m)))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(m.sigmaPt(), dispersionDigits(m)))
                    .append("</td><td>").append(ReportCharts.scoreSymbol(m.scoreKind()))
                    .append("</td><td class=\"num\">").append(counts[0])
                    .append("</td><td class=\"num\">").append(counts[1])
                    .append("</td><td class=\"num\">").append(counts[2]).append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
    }

    // ---------------------------------------------------------------- per measurand

    private void writeMeasurands() {
        heading("Results by measurand", "measurands");
        out.append("<p>Each measurand starts on a new page: key figures, method groups, warnings, charts and the "
                + "results with their scores. Values are printed to the measurand's reporting digits, spreads and "
                + "uncertainties to one digit more; scores to two decimals.</p>\n");
        int sub = 0;
        for (MeasurandSection m : report.measurands()) {
            sub++;
            writeMeasurand(m, section + "." + sub);
        }
    }

    private void writeMeasurand(MeasurandSection m, String number) {
        int d = m.reportingDigits();
        int dd = dispersionDigits(m);
        String unit = " " + esc(m.unit());
        out.append("<div class=\"measurand\">\n<h3 id=\"m-").append(esc(m.id())).append("\">").append(number).append(" ")
                .append(esc(m.title())).append(", ").append(esc(m.unit())).append("</h3>\n");
        out.append("<table class=\"keep\">\n<tbody>\n");
        keyRow("Results used (n)", String.valueOf(m.n()), "");
        keyRow("Assigned value x<sub>pt</sub>", ReportFormat.decimal(m.assignedValue(), d) + unit,
                sym(m.assignedValueMethod()));
        keyRow("Standard uncertainty u(x<sub>pt</sub>)", ReportFormat.decimal(m.assignedValueUncertainty(), dd) + unit, "");
        keyRow("\u03c3<sub>pt</sub>", ReportFormat.decimal(m.sigmaPt(), dd) + unit, sym(m.sigmaPtMethod()));
        var robust = m.robust();
        keyRow("Robust mean x*", ReportFormat.decimal(robust.robustMean(), d) + unit, esc(robust.method())
                + ", " + robust.iterations() + " iterations, " + (robust.converged() ? "converged" : "<b>not converged</b>"));
        keyRow("Robust standard deviation s*", ReportFormat.decimal(robust.robustSd(), dd) + unit, "");
        keyRow("Median", ReportFormat.decimal(robust.median(), d) + unit, "");
        keyRow("MADe", ReportFormat.decimal(robust.scaledMad(), dd) + unit, "1.483 \u00b7 median absolute deviation");
        keyRow("nIQR", ReportFormat.decimal(robust.normalizedIqr(), dd) + unit, "0.7413 \u00b7 interquartile range");
        keyRow("Score used", ReportCharts.scoreSymbol(m.scoreKind()), sym(m.scoreChoiceReason()));
        out.append("</tbody></table>\n");

        if (!m.methodGroups().isEmpty()) {
            out.append("<h4>Method groups</h4>\n<table class=\"keep\">\n<thead><tr><th>Method group</th><th class=\"num\">n</th>"
                    + "<th class=\"num\">median</th><th class=\"num\">robust mean</th><th class=\"num\">robust SD</th>"
                    + "<th class=\"num\">median \u2212 x<sub>pt</sub></th></tr></thead>\n<tbody>\n");
            for (MethodGroupStatistics g : m.methodGroups()) {
                out.append("<tr><td>").append(esc(g.methodGroup())).append("</td><td class=\"num\">").append(g.n())
                        .append("</td><td class=\"num\">").append(ReportFormat.decimal(g.median(), d))
                        .append("</td><td class=\"num\">").append(ReportFormat.decimal(g.robustMean(), d))
                        .append("</td><td class=\"num\">").append(ReportFormat.decimal(g.robustSd(), dd))
                        .append("</td><td class=\"num\">").append(ReportFormat.decimal(g.median() - m.assignedValue(), dd))
                        .append("</td></tr>\n");
            }
            out.append("</tbody></table>\n");
        }
        if (!m.warnings().isEmpty()) {
            out.append("<div class=\"warnings\"><b>Warnings</b><ul>\n");
            for (String w : m.warnings()) {
                out.append("<li>").append(sym(w)).append("</li>\n");
            }
            out.append("</ul></div>\n");
        }

        writeCharts(m);

        writeResultsTable(m);
        out.append("</div>\n");
    }

    private void writeCharts(MeasurandSection m) {
        MeasurandChartData data = chartData.get(m);
        figure(compact(ReportCharts.scoreBars(data, ownCode)));
        figure(compact(ReportCharts.density(data, ownCode)));
        figure(compact(ReportCharts.uncertaintyBars(data, ownCode)));
    }

    /** In a laboratory report the measurand charts are a little lower, so figures and charts fit on one page. */
    private ReportChart compact(ReportChart chart) {
        if (chart == null || !forLaboratory()) {
            return chart;
        }
        return new ReportChart(chart.key(), chart.caption(), chart.width(), LABORATORY_CHART_HEIGHT, chart.markCount(),
                chart.factory());
    }

    private void keyRow(String label, String value, String how) {
        out.append("<tr><th>").append(label).append("</th><td class=\"num\">").append(value).append("</td><td>")
                .append(how).append("</td></tr>\n");
    }

    private void writeResultsTable(MeasurandSection m) {
        int dd = dispersionDigits(m);
        // fixed table layout with the widths of the header cells: large rounds lay out much faster
        out.append("<h4>Results and scores</h4>\n<table class=\"results\">\n<thead><tr>"
                + "<th style=\"width: 11%\">Participant</th><th class=\"num\" style=\"width: 9%\">Result</th>"
                + "<th class=\"num\" style=\"width: 8%\">U</th><th class=\"num\" style=\"width: 4%\">k</th>"
                + "<th style=\"width: 13%\">Method group</th><th class=\"num\" style=\"width: 6.5%\">z</th>"
                + "<th class=\"num\" style=\"width: 6.5%\">z\u2032</th><th class=\"num\" style=\"width: 6.5%\">\u03b6</th>"
                + "<th class=\"num\" style=\"width: 6.5%\">En</th><th style=\"width: 13%\">Assessment (")
                .append(ReportCharts.scoreSymbol(m.scoreKind())).append(")</th><th>Notes</th></tr></thead>\n<tbody>\n");
        List<ParticipantResult> rows = new ArrayList<>(m.results());
        rows.sort(Comparator.comparing(ParticipantResult::participantCode));
        int row = 0;
        for (ParticipantResult r : rows) {
            boolean own = r.participantCode().equals(ownCode);
            row++;
            out.append(own ? "<tr class=\"own\">" : row % 5 == 0 ? "<tr class=\"rule\">" : "<tr>").append("<td>").append(esc(r.participantCode()))
                    .append(own ? " (you)" : "").append("</td><td class=\"num\">")
                    .append(esc(ReportFormat.minusSigns(r.reportedValue())))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(r.expandedUncertainty(), dd))
                    .append("</td><td class=\"num\">").append(ReportFormat.decimal(r.coverageFactor(), 1))
                    .append("</td><td>").append(esc(r.methodGroup()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.z(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.zPrime(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.zeta(), m.scoreDecimals()))
                    .append("</td><td class=\"num\">").append(ReportFormat.score(r.en(), m.scoreDecimals()))
                    .append("</td>").append(assessmentCell(r)).append("<td>").append(notes(r)).append("</td></tr>\n");
        }
        out.append("</tbody></table>\n");
    }

    /** The assessment as a table cell whose class carries the colour (one element less per row than a span). */
    private static String assessmentCell(ParticipantResult r) {
        Classification c = r.classification();
        return c == null ? "<td class=\"unscored\">" + unscoredWords(r) + "</td>"
                : "<td class=\"" + c.word() + "\">" + c.word() + "</td>";
    }

    /**
     * A result without a verdict: a z or z′ without a classification is a score for information only (a consensus
     * or data-derived σpt below the plan's minimum); otherwise it was not scored.
     */
    private static String unscoredWords(ParticipantResult r) {
        return !r.lessThan() && (r.z() != null || r.zPrime() != null) ? "for information only" : "not scored";
    }

    private static String assessment(ParticipantResult r) {
        Classification c = r.classification();
        if (c == null) {
            return "<span class=\"unscored\">" + unscoredWords(r) + "</span>";
        }
        return "<span class=\"" + c.word() + "\">" + c.word() + "</span>";
    }

    private static String notes(ParticipantResult r) {
        List<String> notes = new ArrayList<>();
        if (r.lessThan()) {
            notes.add("censored" + (r.lessThanCheck().isEmpty() ? "" : ": " + sym(r.lessThanCheck())));
        }
        if (r.late()) {
            notes.add("late");
        }
        if (r.excluded()) {
            notes.add("excluded" + (r.exclusionReason().isEmpty() ? "" : ": " + sym(r.exclusionReason())));
        }
        return String.join("; ", notes);
    }

    /** Digits for spreads and uncertainties: one more than the reporting digits. */
    static int dispersionDigits(MeasurandSection m) {
        return Math.min(8, m.reportingDigits() + 1);
    }

    private void figure(ReportChart chart) {
        if (chart == null) {
            return;
        }
        charts.put(chart.key(), chart);
        out.append("<div class=\"figure\">\n");
        if (embedding == ChartEmbedding.INLINE_SVG) {
            out.append(SvgCharts.toSvgElement(chart)).append('\n');
        } else {
            out.append("<object type=\"").append(CHART_OBJECT_TYPE).append("\" data-chart=\"").append(chart.key())
                    .append("\" style=\"width: ").append(chart.width()).append("px; height: ").append(chart.height())
                    .append("px;\"></object>\n");
        }
        out.append("<p class=\"caption\">").append(sym(chart.caption())).append("</p>\n</div>\n");
    }

    // ---------------------------------------------------------------- closing sections

    private void writePairs() {
        if (report.pairs().isEmpty()) {
            return;
        }
        heading("Paired items", "pairs");
        out.append("<p>Each point is one participant's pair of results. Points spread along the diagonal show "
                + "a systematic error common to both items (calibration, method); points spread across it show "
                + "random error or a problem with one item.</p>\n");
        for (PairedItems pair : report.pairs()) {
            figure(ReportCharts.youden(report, pair.firstMeasurandId(), pair.secondMeasurandId(), ownCode));
        }
    }

    private void writeInterpretation() {
        heading("Reading the scores", "interpretation");
        out.append("<table class=\"keep\">\n<thead><tr><th>Score</th><th>satisfactory</th><th>questionable</th>"
                + "<th>unsatisfactory</th></tr></thead>\n<tbody>\n"
                + "<tr><td>z, z\u2032, \u03b6</td><td>|score| \u2264 2</td><td>2 &lt; |score| &lt; 3</td>"
                + "<td>|score| \u2265 3</td></tr>\n"
                + "<tr><td>En</td><td>|En| \u2264 1</td><td>\u2013</td><td>|En| &gt; 1</td></tr>\n"
                + "</tbody></table>\n");
        out.append("<p>z = (x \u2212 x<sub>pt</sub>)/\u03c3<sub>pt</sub>; z\u2032 = (x \u2212 x<sub>pt</sub>)/"
                + "\u221a(\u03c3<sub>pt</sub>\u00b2 + u\u00b2(x<sub>pt</sub>)); \u03b6 = (x \u2212 x<sub>pt</sub>)/"
                + "\u221a(u\u00b2(x) + u\u00b2(x<sub>pt</sub>)); En = (x \u2212 x<sub>pt</sub>)/"
                + "\u221a(U\u00b2(x) + U\u00b2(x<sub>pt</sub>)). Classification is made on the unrounded score; "
                + "the tables show scores rounded to two decimals, so a printed 2.00 may be questionable.</p>\n");
        for (String p : report.advice().paragraphs()) {
            out.append("<p>").append(sym(p)).append("</p>\n");
        }
        out.append("<div class=\"caution\"><p><b>Caution.</b> ").append(CAUTION).append("</p></div>\n");
    }

    private void writeComments() {
        heading("Coordinator\u2019s comments", "comments");
        if (report.coordinatorComments().isBlank()) {
            out.append("<p class=\"muted\">No comments.</p>\n");
            return;
        }
        for (String paragraph : report.coordinatorComments().split("\\n\\s*\\n")) {
            out.append("<p>").append(sym(paragraph.trim())).append("</p>\n");
        }
    }

    private void writeSignOff() {
        heading("Sign-off", "sign-off");
        out.append("<p>This report was checked and authorised for issue by:</p>\n<table class=\"signature\">\n");
        signatoryRow(report.signatures().coordinator());
        report.signatures().optionalSecondReviewer().ifPresent(this::signatoryRow);
        out.append("</table>\n");
    }

    private void signatoryRow(Signatory s) {
        out.append("<tr><td><b>").append(esc(s.name())).append("</b></td><td>").append(esc(s.function()))
                .append("</td><td>signed ").append(s.signedOn().format(DATE)).append("</td></tr>\n");
    }

    private static String loadCss() {
        try (InputStream in = ReportDocument.class.getResourceAsStream("/report/report.css")) {
            if (in == null) {
                throw new IllegalStateException("report/report.css missing");
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

}
