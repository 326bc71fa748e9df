package org.roundtable.history;

import com.openhtmltopdf.pdfboxout.PdfRendererBuilder;
import java.util.LinkedHashMap;
import java.util.Map;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.render.PdfReportRenderer;
import com.openhtmltopdf.outputdevice.helper.BaseRendererBuilder;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.CurrentUser;
import org.roundtable.platform.CsvText;
import org.roundtable.platform.NumberFormats;
import org.roundtable.platform.Secrets;
import org.roundtable.platform.Timestamps;
import org.roundtable.report.DocumentKind;
import org.roundtable.report.IssuedDocument;
import org.roundtable.report.IssuedDocuments;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.Clock;
import java.time.LocalDate;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

/**
 * The assessor's export of a laboratory's history for a period: one PDF (per measurand the scores over rounds,
 * combined scores, early warnings, corrective actions, each round report by its number and SHA-256) and one CSV
 * (every result), both issued as {@code HISTORY_EXPORT} documents of the laboratory and so verifiable through the
 * public verification like every issued document.
 */
@ApplicationScoped
public class HistoryExports {

    /** Columns of the export's CSV: one row per published result of the laboratory in the period. */
    public static final List<String> COLUMNS = List.of("laboratory", "scheme", "round", "reported_on", "report_id",
            "report_status", "report_sha256", "element", "item", "unit", "reported", "method_group", "value",
            "assigned_value", "sigma_pt", "score_used", "z", "z_prime", "zeta", "en", "verdict", "note");

    private static final String FONT = "report/fonts/DejaVuSans.ttf";
    private static final String PROVIDER = "Roundtable";

    /** The two issued documents of one export. */
    public record Issued(String pdfReportId, String pdfSha256, long pdfDocumentId, String csvReportId,
                         String csvSha256, long csvDocumentId) {
    }

    private final HistoryService history;
    private final CorrectiveActions actions;
    private final IssuedDocuments documents;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final Clock clock;

    public HistoryExports(HistoryService history, CorrectiveActions actions, IssuedDocuments documents,
                          CurrentUser currentUser, EntityManager entityManager, Clock clock) {
        this.history = history;
        this.actions = actions;
        this.documents = documents;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    /** Issues the calling laboratory's export for the period (either end may be open). */
    @Transactional
    public Issued issueOwn(LocalDate from, LocalDate until) {
        long lab = currentUser.requireLaboratoryId();
        HistoryService.History h = history.history(lab, new HistoryService.Filter(null, null, null, from, until, null, null));
        List<CorrectiveActions.Entry> entries = actions.own().stream()
                .filter(a -> h.entries().stream().anyMatch(e -> e.roundId() == a.roundId())).toList();
        LocalDate today = Timestamps.now(clock).toLocalDate();
        String stem = "HX-" + lab + "-" + DateTimeFormatter.BASIC_ISO_DATE.format(today) + "-"
                + Secrets.randomToken(16).substring(0, 6).replaceAll("[^A-Za-z0-9]", "x").toUpperCase(Locale.ROOT);
        byte[] csv = csv(h).getBytes(StandardCharsets.UTF_8);
        String csvId = stem + "-CSV";
        String pdfId = stem + "-PDF";
        byte[] pdf = pdf(h, entries, from, until, pdfId, csvId, Secrets.sha256Hex(csv), today);
        IssuedDocument p = documents.issue(new IssuedDocuments.Issue(identity(pdfId, today), DocumentKind.HISTORY_EXPORT,
                null, lab, "application/pdf", pdf), currentUser.actor());
        IssuedDocument c = documents.issue(new IssuedDocuments.Issue(identity(csvId, today), DocumentKind.HISTORY_EXPORT,
                null, lab, "text/csv", csv), currentUser.actor());
        return new Issued(p.reportId(), p.sha256(), p.id(), c.reportId(), c.sha256(), c.id());
    }

    /** The calling laboratory's history exports, newest first. */
    @Transactional
    public List<IssuedDocument> own() {
        long lab = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Number> ids = entityManager.createNativeQuery("""
                SELECT id FROM issued_document WHERE kind = 'HISTORY_EXPORT' AND laboratory_id = :lab
                 ORDER BY issued_at DESC, id DESC
                """).setParameter("lab", lab).getResultList();
        return ids.stream().map(id -> documents.byId(id.longValue()).orElseThrow()).toList();
    }

    /** One of the calling laboratory's exports: its content type and bytes; 404 for anything else. */
    @Transactional
    public Optional<Object[]> ownContent(long documentId) {
        long lab = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT content_type, report_id FROM issued_document
                 WHERE id = :id AND kind = 'HISTORY_EXPORT' AND laboratory_id = :lab
                """).setParameter("id", documentId).setParameter("lab", lab).getResultList();
        return rows.stream().findFirst().map(r -> new Object[]{r[0], r[1], documents.content(documentId).orElseThrow()});
    }

    private static ReportIdentity identity(String reportId, LocalDate today) {
        return new ReportIdentity(reportId, ReportStatus.FINAL, null, null, today, PROVIDER);
    }

    static String csv(HistoryService.History h) {
        StringBuilder out = new StringBuilder(String.join(",", COLUMNS)).append('\n');
        for (HistoryService.Entry e : h.entries()) {
            out.append(String.join(",", CsvText.cell(h.laboratoryName()), CsvText.cell(e.schemeName()),
                    CsvText.cell(e.roundCode()), e.reportedOn().toString(), CsvText.cell(e.reportId()),
                    e.reportStatus(), e.reportSha256(), e.element(), CsvText.cell(e.itemLabel()), CsvText.cell(e.unit()),
                    CsvText.cell(e.reported()), CsvText.cell(e.methodGroup()), CsvText.number(e.value()),
                    CsvText.number(e.assignedValue()), CsvText.number(e.sigmaPt()),
                    e.zLikeKind() == null ? "" : e.zLikeKind().jsonName(), CsvText.number(e.z()),
                    CsvText.number(e.zPrime()), CsvText.number(e.zeta()), CsvText.number(e.en()),
                    e.verdict() == null ? "" : e.verdict().word(),
                    CsvText.cell(e.excludedReason() != null ? e.excludedReason()
                            : e.informationOnly() ? "for information only" : ""))).append('\n');
        }
        return out.toString();
    }

    private byte[] pdf(HistoryService.History h, List<CorrectiveActions.Entry> entries, LocalDate from,
                       LocalDate until, String pdfId, String csvId, String csvSha, LocalDate today) {
        StringBuilder x = new StringBuilder(16_384);
        x.append("<?xml version=\"1.0\" encoding=\"UTF-8\"?><html xmlns=\"http://www.w3.org/1999/xhtml\"><head><style>")
                .append("@page { size: A4; margin: 18mm 15mm; @bottom-center { content: 'Page ' counter(page) ' of ' counter(pages) ' · ")
                .append(pdfId).append("'; font-size: 8pt; } }")
                .append("body { font-family: 'DejaVu Sans'; font-size: 9pt; } table { border-collapse: collapse; width: 100%; margin-bottom: 8pt; }")
                .append("th, td { border: 0.5pt solid #999; padding: 2pt 3pt; text-align: left; } .hash { font-size: 6.5pt; }")
                .append("h2 { font-size: 12pt; margin-top: 12pt; } h3 { font-size: 10pt; }</style></head><body>");
        x.append("<h1>Record over rounds: ").append(e(h.laboratoryName())).append("</h1>");
        x.append("<p>").append(e(h.organisation())).append(". Export ").append(e(pdfId)).append(", issued ")
                .append(today).append(" (UTC). Period: rounds whose report was issued from ")
                .append(from == null ? "the start" : from.toString()).append(" to ")
                .append(until == null ? "the day of issue" : until.toString())
                .append(". The results are in the CSV file ").append(e(csvId)).append(" (SHA-256 <span class=\"hash\">")
                .append(csvSha).append("</span>). Both files can be checked at the provider's public verification page.</p>");
        x.append("<h2>Early warnings</h2>");
        if (h.warnings().isEmpty()) {
            x.append("<p>None.</p>");
        } else {
            x.append("<ul>");
            for (EarlyWarnings.Warning w : h.warnings()) {
                x.append("<li>").append(e(w.kind().label())).append(": ").append(e(w.message())).append("</li>");
            }
            x.append("</ul><p>").append(e(EarlyWarnings.BASIS)).append("</p>");
        }
        Map<String, ReportChart> charts = new LinkedHashMap<>();
        for (HistoryService.Series s : h.series()) {
            x.append("<h2>").append(e(s.element())).append(" — ").append(e(s.schemeName())).append("</h2>");
            ReportChart chart = scoreChart(s, charts.size());
            if (chart != null) {
                charts.put(chart.key(), chart);
                x.append("<div>").append(PdfReportRenderer.chartPlaceholder(chart)).append("</div><p>")
                        .append(e(chart.caption())).append("</p>");
            }
            x.append("<table><tr><th>Round</th><th>Reported on</th><th>Item</th><th>Result</th><th>x_pt</th><th>σpt</th>")
                    .append("<th>Score used</th><th>Score</th><th>ζ</th><th>En</th><th>Verdict</th></tr>");
            for (HistoryService.Entry en : s.entries()) {
                x.append("<tr><td>").append(e(en.roundCode())).append("</td><td>").append(en.reportedOn())
                        .append("</td><td>").append(e(en.itemLabel())).append("</td><td>").append(e(en.reported()))
                        .append(' ').append(e(en.unit())).append("</td><td>")
                        .append(NumberFormats.plain(en.assignedValue(), 4)).append("</td><td>")
                        .append(NumberFormats.plain(en.sigmaPt(), 4)).append("</td><td>")
                        .append(en.zLikeKind() == null ? "" : en.zLikeKind() == org.roundtable.statistics.score.ScoreKind.Z ? "z" : "z′")
                        .append("</td><td>").append(score(en.zLike())).append("</td><td>").append(score(en.zeta()))
                        .append("</td><td>").append(score(en.en())).append("</td><td>")
                        .append(en.verdict() == null ? "not scored" : en.verdict().word()).append("</td></tr>");
            }
            x.append("</table>");
            HistoryService.Combined c = s.combined();
            if (c != null) {
                x.append("<p>Combined scores over ").append(c.count()).append(" score(s) (").append(e(c.kind()))
                        .append("), rounds ").append(e(c.firstRound())).append(" to ").append(e(c.lastRound()))
                        .append(": RSZ ").append(NumberFormats.signedScore(c.rescaledSum(), 2)).append(" (")
                        .append(c.rescaledSumVerdict().word()).append("), SSZ ")
                        .append(NumberFormats.score(c.sumOfSquares(), 2)).append(" against χ² limits ")
                        .append(NumberFormats.score(c.chiSquared95(), 2)).append(" / ")
                        .append(NumberFormats.score(c.chiSquared99(), 2)).append(" (")
                        .append(c.sumOfSquaresVerdict().word()).append("). ").append(e(c.caveat())).append("</p>");
            }
        }
        x.append("<h2>Corrective actions</h2>");
        if (entries.isEmpty()) {
            x.append("<p>None recorded for the rounds of this period.</p>");
        } else {
            x.append("<table><tr><th>No.</th><th>Round</th><th>Measurand</th><th>Verdict</th><th>Cause found</th>")
                    .append("<th>Action taken</th><th>Evidence</th><th>Effectiveness</th><th>Closed</th></tr>");
            for (CorrectiveActions.Entry a : entries) {
                x.append("<tr><td>").append(a.id()).append(a.correctsId() == null ? "" : " (corrects " + a.correctsId() + ")")
                        .append("</td><td>").append(e(a.roundCode())).append("</td><td>").append(e(a.element()))
                        .append("</td><td>").append(e(a.verdictWord())).append("</td><td>").append(e(a.cause()))
                        .append("</td><td>").append(e(a.actionTaken())).append("</td><td>").append(e(a.evidence()))
                        .append(a.attachments().isEmpty() ? "" : " (" + a.attachments().size() + " attachment(s))")
                        .append("</td><td>").append(a.effectivenessRoundCode() == null ? "" : "Round " + e(a.effectivenessRoundCode()) + ". ")
                        .append(e(a.effectivenessNote())).append("</td><td>")
                        .append(a.closed() ? a.closedAt().toLocalDate() + " by " + e(a.closedBy()) : "open")
                        .append("</td></tr>");
            }
            x.append("</table>");
        }
        x.append("<h2>Reports referred to</h2><table><tr><th>Round</th><th>Report</th><th>Status</th><th>SHA-256</th></tr>");
        java.util.Set<String> seen = new java.util.LinkedHashSet<>();
        for (HistoryService.Entry en : h.entries()) {
            if (seen.add(en.reportId())) {
                x.append("<tr><td>").append(e(en.roundCode())).append("</td><td>").append(e(en.reportId()))
                        .append("</td><td>").append(en.reportStatus().toLowerCase(Locale.ROOT))
                        .append("</td><td class=\"hash\">").append(en.reportSha256()).append("</td></tr>");
            }
        }
        x.append("</table><p>End of export ").append(e(pdfId)).append(".</p></body></html>");
        return charts.isEmpty() ? render(x.toString()) : new PdfReportRenderer().renderDocument(x.toString(), charts);
    }

    /**
     * The series' score used (z or z′) over rounds, with the ±2 and ±3 lines, as the history page draws it; null
     * when no result of the series was scored.
     */
    static ReportChart scoreChart(HistoryService.Series s, int index) {
        List<HistoryService.Entry> scored = s.entries().stream()
                .filter(en -> en.zLike() != null && Double.isFinite(en.zLike())).toList();
        if (scored.isEmpty()) {
            return null;
        }
        String caption = s.element() + " (" + s.schemeName() + "): score used (z or z′) over rounds; lines at ±2"
                + " (questionable) and ±3 (unsatisfactory)";
        return new ReportChart("history-chart-" + index, caption, 640, 200, scored.size(), () -> {
            org.jfree.data.category.DefaultCategoryDataset data = new org.jfree.data.category.DefaultCategoryDataset();
            double top = 4;
            for (HistoryService.Entry en : scored) {
                data.addValue(en.zLike(), "score", en.roundCode() + ("A".equals(en.itemLabel()) ? "" : " " + en.itemLabel()));
                top = Math.max(top, Math.ceil(Math.abs(en.zLike())) + 0.5);
            }
            org.jfree.chart.JFreeChart chart = org.jfree.chart.ChartFactory.createLineChart(null, "Round", "Score",
                    data, org.jfree.chart.plot.PlotOrientation.VERTICAL, false, false, false);
            org.jfree.chart.plot.CategoryPlot plot = chart.getCategoryPlot();
            plot.setBackgroundPaint(java.awt.Color.WHITE);
            org.jfree.chart.renderer.category.LineAndShapeRenderer renderer =
                    (org.jfree.chart.renderer.category.LineAndShapeRenderer) plot.getRenderer();
            renderer.setDefaultShapesVisible(true);
            renderer.setSeriesPaint(0, new java.awt.Color(0x3d, 0x6e, 0x9e));
            for (double line : new double[] {2, -2, 3, -3}) {
                boolean action = Math.abs(line) == 3;
                plot.addRangeMarker(new org.jfree.chart.plot.ValueMarker(line, action ? new java.awt.Color(0xb0, 0x30, 0x30)
                        : new java.awt.Color(0xc0, 0x80, 0x20), new java.awt.BasicStroke(1.2f,
                        java.awt.BasicStroke.CAP_BUTT, java.awt.BasicStroke.JOIN_MITER, 10f,
                        action ? null : new float[] {4f, 3f}, 0f)));
            }
            plot.addRangeMarker(new org.jfree.chart.plot.ValueMarker(0, java.awt.Color.GRAY, new java.awt.BasicStroke(0.6f)));
            plot.getRangeAxis().setRange(-top, top);
            return chart;
        });
    }

    private static String score(Double v) {
        return v == null ? NumberFormats.NONE : NumberFormats.signedScore(v, 2);
    }

    private static byte[] render(String xhtml) {
        byte[] font = font();
        ByteArrayOutputStream out = new ByteArrayOutputStream(64 * 1024);
        try {
            new PdfRendererBuilder().useFastMode().withHtmlContent(xhtml, null)
                    .useFont(() -> new java.io.ByteArrayInputStream(font), "DejaVu Sans", 400,
                            BaseRendererBuilder.FontStyle.NORMAL, true)
                    .withProducer("Roundtable history export").toStream(out).run();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
        return out.toByteArray();
    }

    private static byte[] font() {
        try (InputStream in = HistoryExports.class.getClassLoader().getResourceAsStream(FONT)) {
            if (in == null) {
                throw new IllegalStateException("font " + FONT + " missing");
            }
            return in.readAllBytes();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
    }

    private static String e(String s) {
        return s == null ? "" : HistoryCharts.esc(s);
    }
}
