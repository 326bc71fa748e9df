package org.roundtable.report.chart;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Paint;
import java.awt.Shape;
import java.awt.Stroke;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.CategoryTextAnnotation;
import org.jfree.chart.annotations.XYLineAnnotation;
import org.jfree.chart.annotations.XYShapeAnnotation;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.CategoryAxis;
import org.jfree.chart.axis.CategoryLabelPositions;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.CategoryMarker;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.Marker;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.category.BarRenderer;
import org.jfree.chart.renderer.category.StandardBarPainter;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.Range;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.RoundReport;
import org.roundtable.statistics.density.KernelDensity;
import org.roundtable.statistics.score.ScoreKind;
import org.roundtable.report.style.ReportColours;
import org.roundtable.report.style.ReportFonts;
import org.roundtable.report.style.ReportFormat;

/**
 * The charts of a report, in Roundtable's own style (slate, copper and the classification
 * colours on white, DejaVu Sans text, no chart titles: captions are printed by the document).
 *
 * <p>Per measurand: ordered score bars with the ±2 and ±3 lines ({@link #scoreBars}); the kernel
 * density of the results with x_pt and x_pt ± 2σ_pt ({@link #density}); the results with their
 * expanded-uncertainty bars against x_pt and the band x_pt ± 2σ_pt ({@link #uncertaintyBars}).
 * Per pair of items: a Youden plot ({@link #youden}). A non-null {@code ownCode} highlights that
 * participant (copper outline and label, the others paler); charts otherwise name participants
 * only by code, and only when there are at most {@value #MAX_LABELLED} of them.
 *
 * <p>Charts are stateless descriptions; each call of {@link ReportChart#build()} builds a new
 * JFreeChart, so a description may be drawn from several threads.
 */
public final class ReportCharts {

    /** Width of a full-width chart in CSS pixels (≈ 170 mm). */
    public static final int WIDTH = 640;
    /** Height of a full-width chart in CSS pixels. */
    public static final int HEIGHT = 220;
    /** Width and height of a Youden plot. */
    public static final int YOUDEN_SIZE = 420;
    /** Participant codes are printed on the axis up to this many participants. */
    public static final int MAX_LABELLED = 40;
    /** A rug of the individual results is drawn under the density up to this many results. */
    public static final int MAX_RUG = 200;
    /**
     * Above this many bars or points, a chart draws all marks of one kind as one path (the same marks,
     * far fewer drawing operations in the PDF).
     */
    public static final int MAX_SINGLE_MARKS = 200;
    /** Score axis limit: bars beyond ± this are cut at the edge of the plot. */
    public static final double SCORE_AXIS_LIMIT = 8;
    /** Value axes show at most x_pt ± this many σ_pt. */
    public static final double VALUE_AXIS_SIGMAS = 6;

    private static final Font TICK_FONT = ReportFonts.regular(10f);
    private static final Font LABEL_FONT = ReportFonts.regular(11f);
    private static final Font MARKER_FONT = ReportFonts.regular(10f);
    private static final Font HIGHLIGHT_FONT = ReportFonts.bold(11f);
    private static final Stroke REFERENCE_STROKE = new BasicStroke(1.4f);
    private static final Stroke DASHED_STROKE = new BasicStroke(1.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER,
            10f, new float[] {5f, 3f}, 0f);

    /** x with the subscript "pt" in Unicode subscript letters, for chart text. */
    private static final String X_PT = "x\u209a\u209c";
    /** σ with the subscript "pt". */
    private static final String SIGMA_PT = "\u03c3\u209a\u209c";

    private ReportCharts() {
    }

    /** Symbol of a score kind as printed: z, z′, ζ, En. */
    public static String scoreSymbol(ScoreKind kind) {
        return switch (kind) {
            case Z -> "z";
            case Z_PRIME -> "z\u2032";
            case ZETA -> "\u03b6";
            case EN -> "En";
        };
    }

    /** The score of the kind the measurand uses, or {@code null}. */
    public static Double primaryScore(MeasurandSection m, ParticipantResult r) {
        return switch (m.scoreKind()) {
            case Z -> r.z();
            case Z_PRIME -> r.zPrime();
            case ZETA -> r.zeta();
            case EN -> r.en();
        };
    }

    // ---------------------------------------------------------------- ordered score bars

    /**
     * Participants' scores as bars ordered from lowest to highest, coloured by classification, with
     * lines at ±2 (warn colour) and ±3 (bad colour) — at ±1 for En. Unscored results are left out.
     */
    public static ReportChart scoreBars(MeasurandSection m, String ownCode) {
        return scoreBars(MeasurandChartData.of(m), ownCode);
    }

    /**
     * Ordered score bars from precomputed chart data. Above {@value #MAX_SINGLE_MARKS} bars, the bars
     * of one colour are drawn edge to edge as one filled path (every bar is still drawn, only as
     * one shape per colour instead of one per bar).
     */
    public static ReportChart scoreBars(MeasurandChartData data, String ownCode) {
        MeasurandSection m = data.measurand;
        List<ParticipantResult> scored = data.scored;
        String symbol = scoreSymbol(m.scoreKind());
        String caption = symbol + " scores for " + m.title() + ", lowest to highest, " + scored.size()
                + " participants." + (m.scoreKind() == ScoreKind.EN
                        ? " Lines at En = \u00b11."
                        : " Lines at \u00b12 (questionable beyond) and \u00b13 (unsatisfactory from).")
                + (ownCode != null ? " Your bar stands on a copper band and is labelled." : "");
        return new ReportChart("zbars-" + safe(m.id()), caption, WIDTH, HEIGHT, scored.size(),
                () -> scored.size() > MAX_SINGLE_MARKS ? buildScoreBarPaths(data, ownCode, symbol)
                        : buildScoreBars(data, ownCode, symbol));
    }

    private static JFreeChart buildScoreBars(MeasurandChartData d, String ownCode, String symbol) {
        MeasurandSection m = d.measurand;
        List<ParticipantResult> scored = d.scored;
        DefaultCategoryDataset data = new DefaultCategoryDataset();
        List<Paint> paints = new ArrayList<>(scored.size());
        int ownColumn = -1;
        for (int i = 0; i < scored.size(); i++) {
            ParticipantResult r = scored.get(i);
            data.addValue(d.scores[i], "score", r.participantCode());
            Color colour = ReportColours.of(r.classification());
            boolean own = r.participantCode().equals(ownCode);
            if (own) {
                ownColumn = paints.size();
            }
            paints.add(ownCode == null || own ? colour : ReportColours.pale(colour));
        }
        BarRenderer renderer = new BarRenderer() {
            @Override
            public Paint getItemPaint(int row, int column) {
                return paints.get(column);
            }
        };
        renderer.setBarPainter(new StandardBarPainter());
        renderer.setShadowVisible(false);
        renderer.setDrawBarOutline(false);
        renderer.setItemMargin(0);
        renderer.setMinimumBarLength(0.8);
        renderer.setMaximumBarWidth(0.06);
        renderer.setDefaultToolTipGenerator(null);

        CategoryAxis codes = new CategoryAxis(scored.size() <= MAX_LABELLED ? "participant code" : "participants (ordered)");
        styleAxisFonts(codes);
        codes.setCategoryMargin(scored.size() > MAX_LABELLED ? 0.0 : 0.25);
        codes.setLowerMargin(0.01);
        codes.setUpperMargin(0.01);
        codes.setTickLabelsVisible(scored.size() <= MAX_LABELLED);
        codes.setTickMarksVisible(false);
        codes.setCategoryLabelPositions(CategoryLabelPositions.UP_90);

        NumberAxis scores = scoreAxis(m, d.maxAbsScore, symbol);
        CategoryPlot plot = new CategoryPlot(data, codes, scores, renderer);
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeZeroBaselineVisible(true);
        plot.setRangeZeroBaselinePaint(ReportColours.MUTED);
        for (ValueMarker line : scoreLines(m)) {
            plot.addRangeMarker(line, Layer.FOREGROUND);
        }
        if (ownColumn >= 0) {
            // a copper band behind the own bar, and a label just across the zero line leaning into the chart
            ParticipantResult own = scored.get(ownColumn);
            CategoryMarker band = new CategoryMarker(own.participantCode(),
                    ReportColours.mix(ReportColours.COPPER, Color.WHITE, 0.6), new BasicStroke(scored.size() > MAX_LABELLED ? 3f : 14f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER));
            band.setDrawAsLine(true);
            plot.addDomainMarker(band, Layer.BACKGROUND);
            double s = d.scores[ownColumn];
            CategoryTextAnnotation label = new CategoryTextAnnotation(
                    own.participantCode() + " " + ReportFormat.signedScore(s, m.scoreDecimals()), own.participantCode(), s >= 0 ? -0.25 : 0.25);
            label.setFont(HIGHLIGHT_FONT);
            label.setPaint(ReportColours.COPPER);
            label.setTextAnchor(ownLabelAnchor(s, ownColumn < scored.size() / 2));
            plot.addAnnotation(label);
        }
        return chart(plot);
    }

    /**
     * The ordered score bars of a large round: an XY plot whose x is the rank; each run of
     * neighbouring bars of one colour is one filled outline (along the bar tops [i − ½, i + ½] at the
     * score, back along zero), all runs of a colour one path; the own bar on its band on top.
     */
    private static JFreeChart buildScoreBarPaths(MeasurandChartData d, String ownCode, String symbol) {
        MeasurandSection m = d.measurand;
        List<ParticipantResult> scored = d.scored;
        int n = scored.size();
        int ownIndex = MeasurandChartData.indexOf(scored, ownCode);
        Map<Color, Path2D.Double> paths = new LinkedHashMap<>();
        Path2D.Double run = null;
        Color runPaint = null;
        for (int i = 0; i <= n; i++) {
            Color paint = null;
            if (i < n && i != ownIndex) {
                Color colour = ReportColours.of(scored.get(i).classification());
                paint = ownCode == null ? colour : ReportColours.pale(colour);
            }
            if (run != null && !java.util.Objects.equals(paint, runPaint)) {
                // close the run: down to zero after its last bar, back along zero to its start
                run.lineTo(i - 0.5, 0);
                run.closePath();
                run = null;
            }
            if (paint == null) {
                continue;
            }
            if (run == null) {
                run = paths.computeIfAbsent(paint, c -> new Path2D.Double(Path2D.WIND_NON_ZERO, n * 2));
                runPaint = paint;
                run.moveTo(i - 0.5, 0);
            }
            run.lineTo(i - 0.5, d.scores[i]);
            run.lineTo(i + 0.5, d.scores[i]);
        }
        NumberAxis ranks = new NumberAxis("participants (ordered)");
        styleAxisFonts(ranks);
        ranks.setTickLabelsVisible(false);
        ranks.setTickMarksVisible(false);
        double margin = 0.01 * n;
        ranks.setRange(-0.5 - margin, n - 0.5 + margin);
        NumberAxis scores = scoreAxis(m, d.maxAbsScore, symbol);
        XYPlot plot = new XYPlot(new XYSeriesCollection(), ranks, scores, new XYLineAndShapeRenderer(false, false));
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeZeroBaselineVisible(true);
        plot.setRangeZeroBaselinePaint(ReportColours.MUTED);
        for (ValueMarker line : scoreLines(m)) {
            plot.addRangeMarker(line, Layer.FOREGROUND);
        }
        for (Map.Entry<Color, Path2D.Double> e : paths.entrySet()) {
            plot.addAnnotation(new XYShapeAnnotation(e.getValue(), null, null, e.getKey()), false);
        }
        if (ownIndex >= 0) {
            double s = d.scores[ownIndex];
            ValueMarker band = new ValueMarker(ownIndex, ReportColours.mix(ReportColours.COPPER, Color.WHITE, 0.6),
                    new BasicStroke(3f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER));
            plot.addDomainMarker(band, Layer.BACKGROUND);
            plot.addAnnotation(new XYShapeAnnotation(new Rectangle2D.Double(ownIndex - 0.5, Math.min(0, s), 1,
                    Math.max(Math.abs(s), 0.02)), null, null, ReportColours.of(scored.get(ownIndex).classification())), false);
            XYTextAnnotation label = new XYTextAnnotation(
                    scored.get(ownIndex).participantCode() + " " + ReportFormat.signedScore(s, m.scoreDecimals()), ownIndex,
                    s >= 0 ? -0.25 : 0.25);
            label.setFont(HIGHLIGHT_FONT);
            label.setPaint(ReportColours.COPPER);
            label.setTextAnchor(ownLabelAnchor(s, ownIndex < n / 2));
            plot.addAnnotation(label, false);
        }
        return chart(plot);
    }

    private static TextAnchor ownLabelAnchor(double score, boolean leftHalf) {
        return score >= 0
                ? (leftHalf ? TextAnchor.TOP_LEFT : TextAnchor.TOP_RIGHT)
                : (leftHalf ? TextAnchor.BOTTOM_LEFT : TextAnchor.BOTTOM_RIGHT);
    }

    private static NumberAxis scoreAxis(MeasurandSection m, double maxAbs, String symbol) {
        NumberAxis scores = new NumberAxis(symbol);
        styleAxisFonts(scores);
        double limit = m.scoreKind() == ScoreKind.EN ? 2 : 3.5;
        limit = Math.min(SCORE_AXIS_LIMIT, Math.max(limit, Math.ceil(maxAbs + 0.5)));
        scores.setRange(-limit, limit);
        scores.setNumberFormatOverride(numberFormat(limit > 4 ? 0 : 1));
        return scores;
    }

    private static List<ValueMarker> scoreLines(MeasurandSection m) {
        if (m.scoreKind() == ScoreKind.EN) {
            return List.of(scoreLine(1, ReportColours.BAD, REFERENCE_STROKE, "+1"),
                    scoreLine(-1, ReportColours.BAD, REFERENCE_STROKE, ReportFormat.MINUS + "1"));
        }
        return List.of(scoreLine(2, ReportColours.WARN, DASHED_STROKE, "+2"),
                scoreLine(-2, ReportColours.WARN, DASHED_STROKE, ReportFormat.MINUS + "2"),
                scoreLine(3, ReportColours.BAD, REFERENCE_STROKE, "+3"),
                scoreLine(-3, ReportColours.BAD, REFERENCE_STROKE, ReportFormat.MINUS + "3"));
    }

    /**
     * A score limit line whose label sits on the side facing zero, so that "+3" near the top of the axis is
     * never cut off by the plot's edge (it was, above its line, when the axis ends at 3.5).
     */
    private static ValueMarker scoreLine(double value, Color colour, Stroke stroke, String label) {
        ValueMarker line = marker(value, colour, stroke, label);
        if (value > 0) {
            line.setLabelAnchor(RectangleAnchor.BOTTOM_RIGHT);
            line.setLabelTextAnchor(TextAnchor.TOP_RIGHT);
        }
        return line;
    }

    // ---------------------------------------------------------------- kernel density

    /**
     * Kernel density of the results used in the statistics (Gaussian kernel, Silverman bandwidth,
     * from {@link KernelDensity}), with x_pt (solid) and x_pt ± 2σ_pt (dashed) and a rug of the
     * results. Returns {@code null} when there is no density (fewer than two distinct values).
     */
    public static ReportChart density(MeasurandSection m, String ownCode) {
        return density(MeasurandChartData.of(m), ownCode);
    }

    /** The density chart from precomputed chart data; {@code null} when there is no density. */
    public static ReportChart density(MeasurandChartData data, String ownCode) {
        if (!data.hasDensity()) {
            return null;
        }
        MeasurandSection m = data.measurand;
        int count = data.densityResults.size();
        String caption = "Kernel density of the " + count + " results for " + m.title()
                + " (Gaussian kernel, Silverman bandwidth), with x_pt and x_pt \u00b1 2\u03c3_pt"
                + (count <= MAX_RUG ? "; ticks mark the results." : ".")
                + (ownCode != null ? " Your result is marked in copper." : "");
        return new ReportChart("density-" + safe(m.id()), caption, WIDTH, HEIGHT, count,
                () -> buildDensity(data, ownCode));
    }

    private static JFreeChart buildDensity(MeasurandChartData d, String ownCode) {
        MeasurandSection m = d.measurand;
        List<ParticipantResult> used = d.densityResults;
        XYSeries curve = new XYSeries("density", false, true);
        for (int i = 0; i < d.curveX.length; i++) {
            curve.add(d.curveX[i], d.curveY[i], false);
        }
        XYSeries rug = new XYSeries("results", false, true);
        XYSeries ownRug = new XYSeries("own", false, true);
        for (ParticipantResult r : used) {
            if (r.participantCode().equals(ownCode)) {
                ownRug.add(r.value(), 0.0, false);
            } else if (used.size() <= MAX_RUG) {
                rug.add(r.value(), 0.0, false);
            }
        }
        XYSeriesCollection curveData = new XYSeriesCollection(curve);
        XYSeriesCollection rugData = new XYSeriesCollection();
        rugData.addSeries(rug);
        rugData.addSeries(ownRug);

        NumberAxis x = new NumberAxis(m.name() + ", " + m.unit());
        styleAxisFonts(x);
        x.setRange(d.densityLow, d.densityHigh);
        x.setNumberFormatOverride(numberFormat(m.reportingDigits()));
        NumberAxis y = new NumberAxis("density");
        styleAxisFonts(y);
        y.setTickLabelsVisible(false);
        y.setTickMarksVisible(false);
        y.setRange(-d.densityTop * 0.06, d.densityTop * 1.12);

        XYLineAndShapeRenderer line = new XYLineAndShapeRenderer(true, false);
        line.setSeriesPaint(0, ReportColours.SLATE);
        line.setSeriesStroke(0, new BasicStroke(2f));
        // the curve as one path rather than 240 separate segments
        line.setDrawSeriesLineAsPath(true);
        XYPlot plot = new XYPlot(curveData, x, y, line);
        XYLineAndShapeRenderer ticks = new XYLineAndShapeRenderer(false, true);
        ticks.setSeriesShape(0, new Line2D.Double(0, -6, 0, 0));
        ticks.setSeriesShapesFilled(0, false);
        ticks.setSeriesPaint(0, ReportColours.MUTED);
        ticks.setSeriesShape(1, new Rectangle2D.Double(-2, -12, 4, 12));
        ticks.setSeriesPaint(1, ReportColours.COPPER);
        ticks.setUseOutlinePaint(false);
        ticks.setDrawOutlines(true);
        plot.setDataset(1, rugData);
        plot.setRenderer(1, ticks);
        stylePlot(plot);
        plot.setRangeGridlinesVisible(false);
        addAssignedValueMarkers(plot, m, true);
        return chart(plot);
    }

    // ---------------------------------------------------------------- results with uncertainty

    /**
     * The results ordered by value, each with its expanded uncertainty U as an error bar, against a
     * line at x_pt and a shaded band x_pt ± 2σ_pt. Censored results are left out. The value axis
     * is limited to x_pt ± {@value #VALUE_AXIS_SIGMAS}σ_pt; results beyond lie off the chart.
     */
    public static ReportChart uncertaintyBars(MeasurandSection m, String ownCode) {
        return uncertaintyBars(MeasurandChartData.of(m), ownCode);
    }

    /**
     * The results-with-U chart from precomputed chart data. Above {@value #MAX_SINGLE_MARKS} results,
     * all U bars are drawn as one stroked path and all points as one filled path (every result is
     * still drawn); the own result is drawn on top in copper.
     */
    public static ReportChart uncertaintyBars(MeasurandChartData data, String ownCode) {
        MeasurandSection m = data.measurand;
        List<ParticipantResult> shown = data.shown;
        String caption = "Results for " + m.title() + " in increasing order with their expanded uncertainties U ("
                + data.shownWithU + " of " + shown.size() + " reported U), against x_pt (line) and x_pt \u00b1 2\u03c3_pt (band)."
                + (ownCode != null ? " Your result is in copper." : "");
        return new ReportChart("ubars-" + safe(m.id()), caption, WIDTH, HEIGHT, shown.size(),
                () -> shown.size() > MAX_SINGLE_MARKS ? buildUncertaintyPaths(data, ownCode)
                        : buildUncertaintyBars(data, ownCode));
    }

    private static JFreeChart buildUncertaintyBars(MeasurandChartData d, String ownCode) {
        MeasurandSection m = d.measurand;
        List<ParticipantResult> shown = d.shown;
        YIntervalSeries others = new YIntervalSeries("results", false, true);
        YIntervalSeries own = new YIntervalSeries("own", false, true);
        String[] codes = new String[shown.size()];
        for (int i = 0; i < shown.size(); i++) {
            ParticipantResult r = shown.get(i);
            codes[i] = r.participantCode();
            double u = r.expandedUncertainty() == null ? 0 : r.expandedUncertainty();
            (r.participantCode().equals(ownCode) ? own : others).add(i, r.value(), r.value() - u, r.value() + u);
        }
        YIntervalSeriesCollection data = new YIntervalSeriesCollection();
        data.addSeries(others);
        data.addSeries(own);

        ValueAxis x;
        if (shown.size() <= MAX_LABELLED) {
            SymbolAxis symbols = new SymbolAxis("participant code", codes);
            symbols.setGridBandsVisible(false);
            symbols.setVerticalTickLabels(true);
            x = symbols;
        } else {
            NumberAxis rank = new NumberAxis("participants in order of result");
            rank.setTickLabelsVisible(false);
            rank.setTickMarksVisible(false);
            x = rank;
        }
        styleAxisFonts(x);
        x.setRange(-0.8, shown.size() - 0.2);
        NumberAxis y = valueAxis(m, d.uncertaintyRange);

        XYErrorRenderer renderer = new XYErrorRenderer();
        renderer.setDrawXError(false);
        renderer.setDefaultLinesVisible(false);
        renderer.setCapLength(shown.size() > MAX_LABELLED ? 0 : 5);
        double dot = shown.size() > 200 ? 2.5 : 6;
        renderer.setSeriesShape(0, new Ellipse2D.Double(-dot / 2, -dot / 2, dot, dot));
        renderer.setSeriesShape(1, new Ellipse2D.Double(-4.5, -4.5, 9, 9));
        renderer.setSeriesPaint(0, ReportColours.SLATE);
        renderer.setSeriesPaint(1, ReportColours.COPPER);
        renderer.setErrorStroke(new BasicStroke(shown.size() > 200 ? 0.5f : 1f));
        renderer.setDefaultShapesFilled(true);
        XYPlot plot = new XYPlot(data, x, y, renderer);
        styleUncertaintyPlot(plot, m);
        return chart(plot);
    }

    /** The results-with-U chart of a large round: one path for the U bars, one for the points, the own result on top. */
    private static JFreeChart buildUncertaintyPaths(MeasurandChartData d, String ownCode) {
        MeasurandSection m = d.measurand;
        List<ParticipantResult> shown = d.shown;
        int n = shown.size();
        int ownIndex = MeasurandChartData.indexOf(shown, ownCode);
        Path2D.Double bars = new Path2D.Double(Path2D.WIND_NON_ZERO, 2 * n);
        double[] xs = new double[n];
        double[] ys = new double[n];
        int points = 0;
        for (int i = 0; i < n; i++) {
            if (i == ownIndex) {
                continue;
            }
            ParticipantResult r = shown.get(i);
            if (r.expandedUncertainty() != null && r.expandedUncertainty() > 0) {
                bars.moveTo(i, r.value() - r.expandedUncertainty());
                bars.lineTo(i, r.value() + r.expandedUncertainty());
            }
            xs[points] = i;
            ys[points] = r.value();
            points++;
        }
        NumberAxis rank = new NumberAxis("participants in order of result");
        styleAxisFonts(rank);
        rank.setTickLabelsVisible(false);
        rank.setTickMarksVisible(false);
        rank.setRange(-0.8, n - 0.2);
        NumberAxis y = valueAxis(m, d.uncertaintyRange);
        XYPlot plot = new XYPlot(new XYSeriesCollection(), rank, y, new XYLineAndShapeRenderer(false, false));
        styleUncertaintyPlot(plot, m);
        plot.addAnnotation(new XYShapeAnnotation(bars, new BasicStroke(0.5f), ReportColours.SLATE, null), false);
        plot.addAnnotation(new PointsAnnotation(java.util.Arrays.copyOf(xs, points), java.util.Arrays.copyOf(ys, points),
                2.2, ReportColours.SLATE), false);
        if (ownIndex >= 0) {
            ParticipantResult r = shown.get(ownIndex);
            if (r.expandedUncertainty() != null && r.expandedUncertainty() > 0) {
                plot.addAnnotation(new XYLineAnnotation(ownIndex, r.value() - r.expandedUncertainty(), ownIndex,
                        r.value() + r.expandedUncertainty(), new BasicStroke(1.5f), ReportColours.COPPER), false);
            }
            plot.addAnnotation(new PointsAnnotation(new double[] {ownIndex}, new double[] {r.value()}, 9,
                    ReportColours.COPPER), false);
        }
        return chart(plot);
    }

    private static NumberAxis valueAxis(MeasurandSection m, Range range) {
        NumberAxis y = new NumberAxis(m.name() + ", " + m.unit());
        styleAxisFonts(y);
        y.setNumberFormatOverride(numberFormat(m.reportingDigits()));
        y.setRange(range);
        return y;
    }

    private static void styleUncertaintyPlot(XYPlot plot, MeasurandSection m) {
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        IntervalMarker band = new IntervalMarker(m.assignedValue() - 2 * m.sigmaPt(),
                m.assignedValue() + 2 * m.sigmaPt(), ReportColours.mix(ReportColours.WARN, Color.WHITE, 0.82));
        band.setOutlinePaint(null);
        plot.addRangeMarker(band, Layer.BACKGROUND);
        ValueMarker assigned = marker(m.assignedValue(), ReportColours.SLATE, REFERENCE_STROKE, X_PT);
        plot.addRangeMarker(assigned, Layer.FOREGROUND);
    }

    // ---------------------------------------------------------------- Youden plot

    /**
     * Youden plot of a pair of items: each participant's result on the first item against its result
     * on the second, with lines at the two assigned values, the 45° line through them (points along
     * it share a systematic error), and the square x_pt ± 2σ_pt of both items. Returns {@code null}
     * when fewer than two participants have numeric results on both items.
     */
    public static ReportChart youden(RoundReport report, String firstId, String secondId, String ownCode) {
        MeasurandSection a = report.measurand(firstId).orElseThrow();
        MeasurandSection b = report.measurand(secondId).orElseThrow();
        Map<String, Double> second = new HashMap<>();
        for (ParticipantResult r : b.results()) {
            if (!r.lessThan() && !r.excluded() && Double.isFinite(r.value())) {
                second.put(r.participantCode(), r.value());
            }
        }
        List<String> codes = new ArrayList<>();
        List<double[]> points = new ArrayList<>();
        for (ParticipantResult r : a.results()) {
            Double y = second.get(r.participantCode());
            if (y != null && !r.lessThan() && !r.excluded() && Double.isFinite(r.value())) {
                codes.add(r.participantCode());
                points.add(new double[] {r.value(), y});
            }
        }
        if (points.size() < 2) {
            return null;
        }
        String caption = "Youden plot of " + a.title() + " against " + b.title() + ", " + points.size()
                + " participants. Lines at the assigned values; the diagonal marks equal deviation on both items;"
                + " the square is x_pt \u00b1 2\u03c3_pt." + (ownCode != null ? " Your point is in copper." : "");
        return new ReportChart("youden-" + safe(a.id()) + "-" + safe(b.id()), caption, YOUDEN_SIZE, YOUDEN_SIZE,
                points.size(), () -> buildYouden(a, b, codes, points, ownCode));
    }

    private static JFreeChart buildYouden(MeasurandSection a, MeasurandSection b, List<String> codes,
            List<double[]> points, String ownCode) {
        XYSeries others = new XYSeries("participants", false, true);
        XYSeries own = new XYSeries("own", false, true);
        for (int i = 0; i < points.size(); i++) {
            (codes.get(i).equals(ownCode) ? own : others).add(points.get(i)[0], points.get(i)[1]);
        }
        XYSeriesCollection data = new XYSeriesCollection();
        data.addSeries(others);
        data.addSeries(own);
        NumberAxis x = new NumberAxis(a.name() + " item " + a.itemLabel() + ", " + a.unit());
        NumberAxis y = new NumberAxis(b.name() + " item " + b.itemLabel() + ", " + b.unit());
        styleAxisFonts(x);
        styleAxisFonts(y);
        x.setNumberFormatOverride(numberFormat(a.reportingDigits()));
        y.setNumberFormatOverride(numberFormat(b.reportingDigits()));
        Range xr = valueRange(a, points.stream().mapToDouble(p -> p[0]).toArray());
        Range yr = valueRange(b, points.stream().mapToDouble(p -> p[1]).toArray());
        x.setRange(xr);
        y.setRange(yr);
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(false, true);
        double dot = points.size() > 200 ? 3 : 6;
        renderer.setSeriesShape(0, new Ellipse2D.Double(-dot / 2, -dot / 2, dot, dot));
        renderer.setSeriesShape(1, new Ellipse2D.Double(-5, -5, 10, 10));
        renderer.setSeriesPaint(0, ReportColours.SLATE);
        renderer.setSeriesPaint(1, ReportColours.COPPER);
        XYPlot plot = new XYPlot(data, x, y, renderer);
        stylePlot(plot);
        ValueMarker assignedA = marker(a.assignedValue(), ReportColours.SLATE, REFERENCE_STROKE, X_PT + " A");
        assignedA.setLabelTextAnchor(TextAnchor.TOP_LEFT);
        plot.addDomainMarker(assignedA, Layer.BACKGROUND);
        plot.addRangeMarker(marker(b.assignedValue(), ReportColours.SLATE, REFERENCE_STROKE, X_PT + " B"), Layer.BACKGROUND);
        double ax = a.assignedValue();
        double by = b.assignedValue();
        double span = Math.max(xr.getLength(), yr.getLength()) * 2;
        plot.addAnnotation(new XYLineAnnotation(ax - span, by - span, ax + span, by + span, DASHED_STROKE,
                ReportColours.MUTED), false);
        Shape square = new Rectangle2D.Double(ax - 2 * a.sigmaPt(), by - 2 * b.sigmaPt(), 4 * a.sigmaPt(),
                4 * b.sigmaPt());
        plot.addAnnotation(new XYShapeAnnotation(square, DASHED_STROKE, ReportColours.WARN), false);
        return chart(plot);
    }

    // ---------------------------------------------------------------- shared styling

    private static void addAssignedValueMarkers(XYPlot plot, MeasurandSection m, boolean domain) {
        ValueMarker assigned = marker(m.assignedValue(), ReportColours.SLATE, REFERENCE_STROKE, X_PT);
        ValueMarker low = marker(m.assignedValue() - 2 * m.sigmaPt(), ReportColours.WARN, DASHED_STROKE,
                ReportFormat.MINUS + "2" + SIGMA_PT);
        ValueMarker high = marker(m.assignedValue() + 2 * m.sigmaPt(), ReportColours.WARN, DASHED_STROKE,
                "+2" + SIGMA_PT);
        for (ValueMarker v : List.of(assigned, low, high)) {
            v.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
            v.setLabelTextAnchor(TextAnchor.TOP_LEFT);
            if (domain) {
                plot.addDomainMarker(v, Layer.FOREGROUND);
            } else {
                plot.addRangeMarker(v, Layer.FOREGROUND);
            }
        }
    }

    private static ValueMarker marker(double value, Color colour, Stroke stroke, String label) {
        ValueMarker marker = new ValueMarker(value, colour, stroke);
        marker.setLabel(label);
        marker.setLabelFont(MARKER_FONT);
        marker.setLabelPaint(colour);
        marker.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
        marker.setLabelTextAnchor(TextAnchor.BOTTOM_RIGHT);
        marker.setLabelOffset(new RectangleInsets(2, 2, 2, 4));
        marker.setLabelBackgroundColor(new Color(255, 255, 255, 0));
        return marker;
    }

    private static void stylePlot(org.jfree.chart.plot.Plot plot) {
        plot.setBackgroundPaint(Color.WHITE);
        plot.setOutlinePaint(ReportColours.LINE);
        plot.setInsets(new RectangleInsets(6, 4, 4, 10));
        if (plot instanceof XYPlot xy) {
            xy.setDomainGridlinePaint(ReportColours.LINE);
            xy.setRangeGridlinePaint(ReportColours.LINE);
            xy.setDomainGridlineStroke(new BasicStroke(0.5f));
            xy.setRangeGridlineStroke(new BasicStroke(0.5f));
        } else if (plot instanceof CategoryPlot cat) {
            cat.setRangeGridlinePaint(ReportColours.LINE);
            cat.setRangeGridlineStroke(new BasicStroke(0.5f));
        }
    }

    private static void styleAxisFonts(org.jfree.chart.axis.Axis axis) {
        axis.setLabelFont(LABEL_FONT);
        axis.setLabelPaint(ReportColours.INK);
        axis.setTickLabelFont(TICK_FONT);
        axis.setTickLabelPaint(ReportColours.MUTED);
        axis.setAxisLinePaint(ReportColours.MUTED);
        axis.setTickMarkPaint(ReportColours.MUTED);
    }

    private static JFreeChart chart(org.jfree.chart.plot.Plot plot) {
        JFreeChart chart = new JFreeChart(null, LABEL_FONT, plot, false);
        chart.setBackgroundPaint(Color.WHITE);
        chart.setBorderVisible(false);
        chart.setPadding(new RectangleInsets(4, 4, 4, 4));
        chart.setAntiAlias(true);
        chart.setTextAntiAlias(true);
        return chart;
    }

    /** Axis tick format with {@code digits} decimals and the U+2212 minus sign. */
    static DecimalFormat numberFormat(int digits) {
        DecimalFormatSymbols symbols = DecimalFormatSymbols.getInstance(Locale.ROOT);
        symbols.setMinusSign('\u2212');
        DecimalFormat format = new DecimalFormat(digits == 0 ? "0" : "0." + "0".repeat(digits), symbols);
        return format;
    }

    /** The window of values a value axis may show: x_pt ± {@value #VALUE_AXIS_SIGMAS}σ_pt. */
    static Range valueWindow(MeasurandSection m) {
        double half = VALUE_AXIS_SIGMAS * m.sigmaPt();
        return new Range(m.assignedValue() - half, m.assignedValue() + half);
    }

    /** The data range, at least x_pt ± 3σ_pt, at most the value window, with a small margin. */
    static Range valueRange(MeasurandSection m, double[] values) {
        double lo = m.assignedValue() - 3 * m.sigmaPt();
        double hi = m.assignedValue() + 3 * m.sigmaPt();
        for (double v : values) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        Range window = valueWindow(m);
        lo = Math.max(lo, window.getLowerBound());
        hi = Math.min(hi, window.getUpperBound());
        double margin = (hi - lo) * 0.04;
        return new Range(lo - margin, hi + margin);
    }

    private static String safe(String id) {
        return id.replaceAll("[^A-Za-z0-9]", "-");
    }

}
