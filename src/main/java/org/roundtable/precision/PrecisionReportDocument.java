package org.roundtable.precision;

import java.awt.BasicStroke;
import java.awt.Color;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.jfree.chart.ChartFactory;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.roundtable.platform.NumberFormats;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.chart.SvgCharts;
import org.roundtable.report.render.PdfReportRenderer;

/**
 * The report of a precision experiment as XHTML: the design, the data by participant code, Mandel's h and k charts
 * by laboratory with their indicator lines, the outlier tests and the coordinator's decisions, the precision table
 * per level, the fitted precision–level relationship with a plot, and the statement of the precision values.
 * The same text serves the HTML view (charts as inline SVG) and the PDF (charts drawn as vector graphics).
 */
final class PrecisionReportDocument {

    /** What the report shows besides the run. */
    record Content(String reportId, String status, String issueDate, String providerName, String roundCode,
                   String schemeName, List<Level> levels, int planVersion, String planSha256, int runNumber,
                   List<PrecisionExperimentService.DataRow> data, List<PrecisionExperimentService.Exclusion> exclusions,
                   Map<String, Integer> reportingDigits, PrecisionCalculation.Study study,
                   List<PrecisionMaterials.Row> materials) {
    }

    /** A level and its material. */
    record Level(String label, String material) {
    }

    /** The built document. */
    record Built(String xhtml, Map<String, ReportChart> charts) {
    }

    private final Content c;
    private final boolean pdf;
    private final StringBuilder out = new StringBuilder(64 * 1024);
    private final Map<String, ReportChart> charts = new LinkedHashMap<>();

    private PrecisionReportDocument(Content content, boolean pdf) {
        this.c = content;
        this.pdf = pdf;
    }

    static Built build(Content content, boolean pdf) {
        PrecisionReportDocument d = new PrecisionReportDocument(content, pdf);
        d.write();
        return new Built(d.out.toString(), d.charts);
    }

    private void write() {
        out.append("<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\"><head><meta charset=\"UTF-8\"/>")
                .append("<title>").append(esc("Precision experiment " + c.roundCode())).append("</title><style>")
                .append("body{font-family:'DejaVu Sans',sans-serif;font-size:9.5pt;color:#1d2430;}")
                .append("h1{font-size:16pt;}h2{font-size:12.5pt;margin-top:18pt;border-bottom:1px solid #8a96a8;}")
                .append("h3{font-size:10.5pt;}table{border-collapse:collapse;margin:6pt 0;}")
                .append("th,td{border:1px solid #b8c1ce;padding:2pt 5pt;text-align:left;}td.n{text-align:right;}")
                .append(".flag{font-weight:bold;}.excluded{text-decoration:line-through;}.caption{font-size:8.5pt;}")
                .append("@page{size:A4;margin:18mm 15mm;@bottom-right{content:\"").append(esc(c.reportId()))
                .append(" page \" counter(page) \" of \" counter(pages);font-size:8pt;}}")
                .append("</style></head><body>\n");
        out.append("<h1>Precision experiment ").append(esc(c.roundCode())).append("</h1>\n");
        out.append("<table><tbody>");
        row("Report", esc(c.reportId()));
        row("Status", esc(c.status()));
        row("Date of issue", esc(c.issueDate()));
        row("Provider", esc(c.providerName()));
        row("Scheme", esc(c.schemeName()));
        row("Plan", "version " + c.planVersion() + ", SHA-256 " + esc(c.planSha256()));
        row("Evaluation run", String.valueOf(c.runNumber()));
        out.append("</tbody></table>\n");
        if ("Draft for comment".equals(c.status())) {
            out.append("<p><strong>Draft for comment.</strong> Participants may comment on this draft during the comment"
                    + " period; the final report follows after it.</p>\n");
        }
        design();
        materials();
        statement();
        for (PrecisionCalculation.MeasurandResult m : c.study().measurands()) {
            measurand(m);
        }
        decisions();
        data();
        out.append("<h2>Method</h2>\n<p>Evaluation after ISO 5725-2:1994 (basic method): cell means and standard"
                + " deviations; Mandel's h and k (7.3.1) with indicator lines at the straggler and outlier levels;"
                + " Cochran's C for the largest cell variance (7.3.3); Grubbs' single and double tests on the cell means"
                + " (7.3.4; double-test critical values from a seeded simulation, stated precision ±0.0011 at 1 %);"
                + " s_r, s_L, s_R with s_L² set to 0 when negative (7.4); r = 2.8·s_r, R = 2.8·s_R (ISO 5725-6);"
                + " relationships s = b·m, s = c + d·m and lg s = c + d·lg m (7.5). Clause numbers from memory."
                + " Statistical stragglers and outliers are flagged, never excluded automatically: a cell is left out"
                + " only by the coordinator's recorded decision with its reason.</p>\n");
        out.append("</body></html>\n");
    }

    private void design() {
        PrecisionCalculation.Study s = c.study();
        out.append("<h2>Design</h2>\n<table><thead><tr><th>Level</th><th>Material</th></tr></thead><tbody>");
        for (Level l : c.levels()) {
            out.append("<tr><td>").append(esc(l.label())).append("</td><td>").append(esc(l.material())).append("</td></tr>");
        }
        out.append("</tbody></table>\n<p>").append(s.replicates()).append(" replicates per laboratory, level and measurand;"
                + " straggler level ").append(percent(s.stragglerLevel())).append(", outlier level ")
                .append(percent(s.outlierLevel())).append("; precision–level relationship ")
                .append(s.fitRelationship() ? "fitted" : "not fitted").append(".</p>\n");
    }

    private void materials() {
        out.append("<h2>Homogeneity of the materials</h2>\n");
        if (c.materials().isEmpty()) {
            out.append("<p>No homogeneity data were recorded for the materials.</p>\n");
            return;
        }
        out.append("<table><thead><tr><th>Level</th><th>Measurand</th><th>Design</th><th>Mean</th><th>s_w</th><th>s_s</th>")
                .append("<th>Target SD</th><th>0.3 × target</th><th>√c</th><th>Verdict</th><th>0.3 × s_R found</th></tr></thead><tbody>");
        for (PrecisionMaterials.Row r : c.materials()) {
            out.append("<tr><td>").append(esc(r.level())).append("</td><td>").append(esc(r.measurand())).append(" (")
                    .append(esc(r.unit())).append(")</td><td>").append(esc(r.design())).append("</td><td class=\"n\">")
                    .append(esc(r.mean())).append("</td><td class=\"n\">").append(esc(r.withinSd())).append("</td><td class=\"n\">")
                    .append(esc(r.betweenSd())).append("</td><td class=\"n\">").append(esc(r.target())).append("</td><td class=\"n\">")
                    .append(esc(r.limit())).append("</td><td class=\"n\">").append(esc(r.allowance())).append("</td><td")
                    .append(r.homogeneous() ? ">" : " class=\"flag\">").append(esc(r.verdict())).append("</td><td>")
                    .append(r.observedLimit() == null ? "–" : esc(r.observedLimit() + (Boolean.TRUE.equals(r.meetsObserved())
                            ? " (met)" : " (not met)"))).append("</td></tr>");
        }
        out.append("</tbody></table>\n<p class=\"caption\">Each level's material checked as a proficiency-test sample"
                + " (ISO 13528 Annex B): s_s ≤ 0.3 × the target SD the coordinator gave (the expected s_R), and"
                + " s_s² ≤ F1·(0.3 × target)² + F2·s_w² (Fearn and Thompson 2001); the last column compares s_s with"
                + " 0.3 × the s_R of this evaluation. The expected s_R in place of σpt is common practice, no source.</p>\n");
    }

    private void statement() {
        out.append("<h2>Statement of precision</h2>\n");
        for (PrecisionCalculation.MeasurandResult m : c.study().measurands()) {
            int d = digits(m.measurand());
            out.append("<h3>").append(esc(m.measurand())).append(" (").append(esc(m.unit())).append(")</h3>\n");
            out.append("<table><thead><tr><th>Level</th><th>p</th><th>m</th><th>s_r</th><th>r</th><th>s_R</th><th>R</th>")
                    .append("</tr></thead><tbody>");
            for (PrecisionCalculation.LevelResult l : m.levels()) {
                out.append("<tr><td>").append(esc(l.level())).append("</td><td class=\"n\">").append(l.retainedLaboratories())
                        .append("</td>").append(num(l.generalMean(), d + 1)).append(num(l.repeatabilitySd(), d + 1))
                        .append(num(l.repeatabilityLimit(), d + 1)).append(num(l.reproducibilitySd(), d + 1))
                        .append(num(l.reproducibilityLimit(), d + 1)).append("</tr>");
            }
            out.append("</tbody></table>\n");
            PrecisionCalculation.FitResult r = best(m.repeatabilityFits());
            PrecisionCalculation.FitResult bigR = best(m.reproducibilityFits());
            if (r != null && bigR != null) {
                out.append("<p>Within the levels studied, the repeatability and reproducibility standard deviations follow ")
                        .append(esc(fitText("s_r", r))).append(" and ").append(esc(fitText("s_R", bigR)))
                        .append(" (the fit with the smallest relative residuals of those tried).</p>\n");
            }
        }
    }

    private void measurand(PrecisionCalculation.MeasurandResult m) {
        int d = digits(m.measurand());
        out.append("<h2>").append(esc(m.measurand())).append(" (").append(esc(m.unit())).append(")</h2>\n");
        for (String w : m.warnings()) {
            out.append("<p>").append(esc(w)).append("</p>\n");
        }
        for (PrecisionCalculation.LevelResult l : m.levels()) {
            out.append("<h3>Level ").append(esc(l.level())).append(l.material().isEmpty() ? "" : ": " + esc(l.material()))
                    .append("</h3>\n");
            out.append("<table><thead><tr><th>Participant</th><th>Results</th><th>Cell mean</th><th>Cell SD</th><th>h</th>")
                    .append("<th>k</th><th>Indication</th><th>Decision</th></tr></thead><tbody>");
            for (PrecisionCalculation.CellResult cell : l.cells()) {
                StringBuilder values = new StringBuilder();
                for (Double v : cell.values()) {
                    values.append(values.length() == 0 ? "" : "; ").append(NumberFormats.result(v, d));
                }
                out.append("<tr").append(cell.excluded() ? " class=\"excluded\"" : "").append("><td>").append(esc(cell.laboratory()))
                        .append("</td><td>").append(values).append("</td>").append(num(cell.mean(), d + 1))
                        .append(num(cell.sd(), d + 1)).append(num(cell.h(), 2)).append(num(cell.k(), 2)).append("<td")
                        .append(cell.flags().isEmpty() ? ">" : " class=\"flag\">")
                        .append(cell.flags().isEmpty() ? "–" : esc(String.join("; ", cell.flags()))).append("</td><td>")
                        .append(cell.excluded() ? "excluded: " + esc(cell.exclusionReason()) : "retained").append("</td></tr>");
            }
            out.append("</tbody></table>\n");
            out.append("<p class=\"caption\">Indicator lines: h ±").append(NumberFormats.decimal(l.hStragglerLine(), 2))
                    .append(" (straggler), ±").append(NumberFormats.decimal(l.hOutlierLine(), 2)).append(" (outlier); k ")
                    .append(NumberFormats.decimal(l.kStragglerLine(), 2)).append(" (straggler), ")
                    .append(NumberFormats.decimal(l.kOutlierLine(), 2)).append(" (outlier).</p>\n");
            figure(hkChart(m.measurand(), l, true));
            figure(hkChart(m.measurand(), l, false));
            out.append("<table><thead><tr><th>Test</th><th>Participants</th><th>Statistic</th><th>Straggler value</th>")
                    .append("<th>Outlier value</th><th>Outcome</th></tr></thead><tbody>");
            for (PrecisionCalculation.TestResult t : l.tests()) {
                out.append("<tr><td>").append(esc(t.test())).append("</td><td>").append(esc(String.join(", ", t.laboratories())))
                        .append("</td>").append(num(t.statistic(), 4)).append(num(t.stragglerCritical(), 4))
                        .append(num(t.outlierCritical(), 4)).append("<td>").append(esc(t.verdict())).append("</td></tr>");
            }
            out.append("</tbody></table>\n<p>Tests on the ").append(l.retainedLaboratories()).append(" retained of ")
                    .append(l.laboratories()).append(" laboratories. m = ").append(NumberFormats.statistic(l.generalMean(), d))
                    .append(", s_r = ").append(NumberFormats.statistic(l.repeatabilitySd(), d)).append(", s_L = ")
                    .append(NumberFormats.statistic(l.betweenLaboratorySd(), d)).append(", s_R = ")
                    .append(NumberFormats.statistic(l.reproducibilitySd(), d)).append(", r = ")
                    .append(NumberFormats.statistic(l.repeatabilityLimit(), d)).append(", R = ")
                    .append(NumberFormats.statistic(l.reproducibilityLimit(), d)).append(".</p>\n");
            for (String w : l.warnings()) {
                out.append("<p class=\"caption\">").append(esc(w)).append("</p>\n");
            }
        }
        relationship(m, d);
    }

    private void relationship(PrecisionCalculation.MeasurandResult m, int d) {
        if (m.repeatabilityFits().isEmpty()) {
            return;
        }
        out.append("<h3>Precision and level</h3>\n<table><thead><tr><th>Quantity</th><th>Relationship</th><th>Fit</th>")
                .append("<th>Residuals (s − ŝ) by level</th><th>Relative residuals (RMS)</th></tr></thead><tbody>");
        for (List<PrecisionCalculation.FitResult> fits : List.of(m.repeatabilityFits(), m.reproducibilityFits())) {
            String q = fits == m.repeatabilityFits() ? "s_r" : "s_R";
            for (PrecisionCalculation.FitResult f : fits) {
                StringBuilder res = new StringBuilder();
                for (Double r : f.residuals()) {
                    res.append(res.length() == 0 ? "" : "; ").append(NumberFormats.decimal(r, d + 2));
                }
                out.append("<tr><td>").append(q).append("</td><td>").append(esc(f.formula())).append("</td><td>")
                        .append(esc(fitText(q, f))).append("</td><td>").append(res).append("</td>")
                        .append(num(f.relativeResidualRms(), 3)).append("</tr>");
            }
        }
        out.append("</tbody></table>\n");
        figure(relationshipChart(m));
    }

    private void decisions() {
        out.append("<h2>Decisions on stragglers and outliers</h2>\n");
        if (c.exclusions().isEmpty()) {
            out.append("<p>No cell was excluded.</p>\n");
            return;
        }
        out.append("<table><thead><tr><th>Participant</th><th>Measurand</th><th>Level</th><th>Decision and reason</th>")
                .append("</tr></thead><tbody>");
        for (PrecisionExperimentService.Exclusion e : c.exclusions()) {
            out.append("<tr><td>").append(esc(e.participantCode())).append("</td><td>").append(esc(e.measurand()))
                    .append("</td><td>").append(esc(e.level())).append("</td><td>")
                    .append(e.current() ? "excluded: " + esc(e.reason())
                            : "exclusion withdrawn (" + esc(e.withdrawalReason()) + "); was: " + esc(e.reason()))
                    .append("</td></tr>");
        }
        out.append("</tbody></table>\n");
    }

    private void data() {
        out.append("<h2>Data by participant code</h2>\n<table><thead><tr><th>Participant</th><th>Measurand</th>")
                .append("<th>Level</th><th>Replicate</th><th>Reported</th></tr></thead><tbody>");
        for (PrecisionExperimentService.DataRow r : c.data()) {
            out.append("<tr><td>").append(esc(r.participantCode())).append("</td><td>").append(esc(r.measurand()))
                    .append("</td><td>").append(esc(r.level())).append("</td><td class=\"n\">").append(r.replicate())
                    .append("</td><td class=\"n\">").append(esc(r.valueAsReported())).append(' ').append(esc(r.unit()))
                    .append("</td></tr>");
        }
        out.append("</tbody></table>\n");
    }

    private ReportChart hkChart(String measurand, PrecisionCalculation.LevelResult l, boolean h) {
        String name = h ? "h" : "k";
        String key = "chart-" + name + "-" + safe(measurand) + "-" + safe(l.level());
        String caption = "Mandel's " + name + " by laboratory, " + measurand + " level " + l.level()
                + " (lines: straggler and outlier indicators)";
        return new ReportChart(key, caption, 640, 240, l.cells().size(), () -> {
            DefaultCategoryDataset data = new DefaultCategoryDataset();
            for (PrecisionCalculation.CellResult cell : l.cells()) {
                Double v = h ? cell.h() : cell.k();
                data.addValue(v == null ? 0 : v, name, cell.laboratory());
            }
            JFreeChart chart = ChartFactory.createBarChart(null, "Participant", name, data, PlotOrientation.VERTICAL,
                    false, false, false);
            CategoryPlot plot = chart.getCategoryPlot();
            plot.setBackgroundPaint(Color.WHITE);
            plot.getRenderer().setSeriesPaint(0, new Color(0x3d, 0x6e, 0x9e));
            // participant codes are 6 characters: turned labels keep them whole for up to 40 laboratories
            plot.getDomainAxis().setCategoryLabelPositions(org.jfree.chart.axis.CategoryLabelPositions.UP_45);
            double s = h ? l.hStragglerLine() == null ? 0 : l.hStragglerLine() : l.kStragglerLine();
            double o = h ? l.hOutlierLine() == null ? 0 : l.hOutlierLine() : l.kOutlierLine();
            for (double line : h ? new double[] {s, -s, o, -o} : new double[] {s, o}) {
                ValueMarker marker = new ValueMarker(line, Math.abs(line) == o ? new Color(0xb0, 0x30, 0x30)
                        : new Color(0xc0, 0x80, 0x20), new BasicStroke(1.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER,
                        10f, Math.abs(line) == o ? null : new float[] {4f, 3f}, 0f));
                plot.addRangeMarker(marker);
            }
            double top = Math.max(o * 1.15, 0.5);
            if (h) {
                plot.getRangeAxis().setRange(-Math.max(top, maxAbs(l, true) * 1.1), Math.max(top, maxAbs(l, true) * 1.1));
            } else {
                plot.getRangeAxis().setRange(0, Math.max(top, maxAbs(l, false) * 1.1));
            }
            return chart;
        });
    }

    private static double maxAbs(PrecisionCalculation.LevelResult l, boolean h) {
        double max = 0;
        for (PrecisionCalculation.CellResult cell : l.cells()) {
            Double v = h ? cell.h() : cell.k();
            max = Math.max(max, v == null ? 0 : Math.abs(v));
        }
        return max;
    }

    private ReportChart relationshipChart(PrecisionCalculation.MeasurandResult m) {
        String key = "chart-fit-" + safe(m.measurand());
        PrecisionCalculation.FitResult r = best(m.repeatabilityFits());
        PrecisionCalculation.FitResult bigR = best(m.reproducibilityFits());
        return new ReportChart(key, "s_r and s_R against the level m, " + m.measurand() + " (points: observed;"
                + " lines: the relationships stated above)", 640, 300, m.levels().size() * 2, () -> {
                    XYSeriesCollection data = new XYSeriesCollection();
                    XYSeries sr = new XYSeries("s_r observed");
                    XYSeries sR = new XYSeries("s_R observed");
                    for (PrecisionCalculation.LevelResult l : m.levels()) {
                        sr.add(l.generalMean(), l.repeatabilitySd());
                        sR.add(l.generalMean(), l.reproducibilitySd());
                    }
                    data.addSeries(sr);
                    data.addSeries(sR);
                    double lo = sr.getMinX();
                    double hi = sr.getMaxX();
                    for (PrecisionCalculation.FitResult f : new PrecisionCalculation.FitResult[] {r, bigR}) {
                        XYSeries line = new XYSeries((f == r ? "s_r " : "s_R ") + f.formula());
                        for (int i = 0; i <= 40; i++) {
                            double x = lo + (hi - lo) * i / 40.0;
                            line.add(x, predict(f, x));
                        }
                        data.addSeries(line);
                    }
                    JFreeChart chart = ChartFactory.createXYLineChart(null, "level m (" + m.unit() + ")",
                            "standard deviation (" + m.unit() + ")", data, PlotOrientation.VERTICAL, true, false, false);
                    XYPlot plot = chart.getXYPlot();
                    plot.setBackgroundPaint(Color.WHITE);
                    XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer();
                    renderer.setSeriesLinesVisible(0, false);
                    renderer.setSeriesLinesVisible(1, false);
                    renderer.setSeriesShapesVisible(2, false);
                    renderer.setSeriesShapesVisible(3, false);
                    renderer.setSeriesPaint(0, new Color(0x3d, 0x6e, 0x9e));
                    renderer.setSeriesPaint(2, new Color(0x3d, 0x6e, 0x9e));
                    renderer.setSeriesPaint(1, new Color(0xb0, 0x30, 0x30));
                    renderer.setSeriesPaint(3, new Color(0xb0, 0x30, 0x30));
                    plot.setRenderer(renderer);
                    return chart;
                });
    }

    static double predict(PrecisionCalculation.FitResult f, double m) {
        return switch (f.model()) {
            case "PROPORTIONAL" -> f.slope() * m;
            case "LINEAR" -> f.intercept() + f.slope() * m;
            default -> Math.pow(10, f.intercept()) * Math.pow(m, f.slope());
        };
    }

    /** The fit with the smallest relative residuals (null when none). */
    static PrecisionCalculation.FitResult best(List<PrecisionCalculation.FitResult> fits) {
        PrecisionCalculation.FitResult best = null;
        for (PrecisionCalculation.FitResult f : fits) {
            if (f.warnings().isEmpty() && (best == null || f.relativeResidualRms() < best.relativeResidualRms())) {
                best = f;
            }
        }
        return best;
    }

    private static String fitText(String q, PrecisionCalculation.FitResult f) {
        return switch (f.model()) {
            case "PROPORTIONAL" -> q + " = " + sig(f.slope()) + "·m";
            case "LINEAR" -> q + " = " + sig(f.intercept()) + " + " + sig(f.slope()) + "·m";
            default -> "lg " + q + " = " + sig(f.intercept()) + " + " + sig(f.slope()) + "·lg m";
        };
    }

    /** Four significant digits, no exponent. */
    private static String sig(double v) {
        if (v == 0 || !Double.isFinite(v)) {
            return NumberFormats.decimal(v, 0);
        }
        int decimals = Math.max(0, 3 - (int) Math.floor(Math.log10(Math.abs(v))));
        return NumberFormats.decimal(v, decimals);
    }

    private void figure(ReportChart chart) {
        charts.put(chart.key(), chart);
        out.append("<div class=\"figure\">");
        out.append(pdf ? PdfReportRenderer.chartPlaceholder(chart) : presentationAttributes(SvgCharts.toSvgElement(chart)));
        out.append("<p class=\"caption\">").append(esc(chart.caption())).append("</p></div>\n");
    }

    private static final java.util.regex.Pattern STYLE = java.util.regex.Pattern.compile("style='([^']*)'");

    /**
     * The pages' Content-Security-Policy ({@code style-src 'self'}) drops inline {@code style} attributes, which would
     * paint every SVG shape black: the chart's styles become SVG presentation attributes instead.
     */
    static String presentationAttributes(String svg) {
        java.util.regex.Matcher m = STYLE.matcher(svg);
        StringBuilder out = new StringBuilder(svg.length());
        while (m.find()) {
            StringBuilder attributes = new StringBuilder();
            for (String declaration : m.group(1).split(";")) {
                int colon = declaration.indexOf(':');
                if (colon > 0) {
                    attributes.append(attributes.length() == 0 ? "" : " ").append(declaration.substring(0, colon).trim())
                            .append("=\"").append(declaration.substring(colon + 1).trim().replace("\"", "&quot;")).append('"');
                }
            }
            m.appendReplacement(out, java.util.regex.Matcher.quoteReplacement(attributes.toString()));
        }
        m.appendTail(out);
        return out.toString();
    }

    private void row(String label, String html) {
        out.append("<tr><th scope=\"row\">").append(label).append("</th><td>").append(html).append("</td></tr>");
    }

    private int digits(String measurand) {
        return c.reportingDigits().getOrDefault(measurand, 4);
    }

    private static String num(Double v, int decimals) {
        return "<td class=\"n\">" + NumberFormats.decimal(v, decimals) + "</td>";
    }

    private static String percent(double alpha) {
        return NumberFormats.decimal(alpha * 100, alpha * 100 == Math.rint(alpha * 100) ? 0 : 1) + " %";
    }

    private static String safe(String s) {
        return s.replaceAll("[^A-Za-z0-9]", "-");
    }

    static String esc(String text) {
        if (text == null) {
            return "";
        }
        StringBuilder b = new StringBuilder(text.length());
        for (char ch : text.toCharArray()) {
            switch (ch) {
                case '<' -> b.append("&lt;");
                case '>' -> b.append("&gt;");
                case '&' -> b.append("&amp;");
                case '"' -> b.append("&quot;");
                default -> b.append(ch < 0x20 ? ' ' : ch);
            }
        }
        return b.toString();
    }
}
