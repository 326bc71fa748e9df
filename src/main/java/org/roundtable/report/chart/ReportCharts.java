package org.roundtable.report.chart;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Paint;
import java.awt.Shape;
import java.awt.Stroke;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Rectangle2D;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.CategoryTextAnnotation;
import org.jfree.chart.annotations.XYLineAnnotation;
import org.jfree.chart.annotations.XYShapeAnnotation;
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
        List<ParticipantResult> scored = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            Double s = primaryScore(m, r);
            if (s != null && Double.isFinite(s)) {
                scored.add(r);
            }
        }
        scored.sort(Comparator.<ParticipantResult>comparingDouble(r -> primaryScore(m, r))
                .thenComparing(ParticipantResult::participantCode));
        String symbol = scoreSymbol(m.scoreKind());
        String caption = symbol + " scores for " + m.title() + ", lowest to highest, " + scored.size()
                + " participants." + (m.scoreKind() == ScoreKind.EN
                        ? " Lines at En = \u00b11."
                        : " Lines at \u00b12 (questionable beyond) and \u00b13 (unsatisfactory from).")
                + (ownCode != null ? " Your bar stands on a copper band and is labelled." : "");
        return new ReportChart("zbars-" + safe(m.id()), caption, WIDTH, HEIGHT, scored.size(),
                () -> buildScoreBars(m, scored, ownCode, symbol));
    }

    private static JFreeChart buildScoreBars(MeasurandSection m, List<ParticipantResult> scored, String ownCode,
            String symbol) {
        DefaultCategoryDataset data = new DefaultCategoryDataset();
        List<Paint> paints = new ArrayList<>(scored.size());
        int ownColumn = -1;
        double maxAbs = 0;
        for (ParticipantResult r : scored) {
            double s = primaryScore(m, r);
            maxAbs = Math.max(maxAbs, Math.abs(s));
            data.addValue(s, "score", r.participantCode());
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

        NumberAxis scores = new NumberAxis(symbol);
        styleAxisFonts(scores);
        double limit = m.scoreKind() == ScoreKind.EN ? 2 : 3.5;
        limit = Math.min(SCORE_AXIS_LIMIT, Math.max(limit, Math.ceil(maxAbs + 0.5)));
        scores.setRange(-limit, limit);
        scores.setNumberFormatOverride(numberFormat(limit > 4 ? 0 : 1));

        CategoryPlot plot = new CategoryPlot(data, codes, scores, renderer);
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeZeroBaselineVisible(true);
        plot.setRangeZeroBaselinePaint(ReportColours.MUTED);
        if (m.scoreKind() == ScoreKind.EN) {
            plot.addRangeMarker(marker(1, ReportColours.BAD, REFERENCE_STROKE, "+1"), Layer.FOREGROUND);
            plot.addRangeMarker(marker(-1, ReportColours.BAD, REFERENCE_STROKE, ReportFormat.MINUS + "1"),
                    Layer.FOREGROUND);
        } else {
            plot.addRangeMarker(marker(2, ReportColours.WARN, DASHED_STROKE, "+2"), Layer.FOREGROUND);
            plot.addRangeMarker(marker(-2, ReportColours.WARN, DASHED_STROKE, ReportFormat.MINUS + "2"),
                    Layer.FOREGROUND);
            plot.addRangeMarker(marker(3, ReportColours.BAD, REFERENCE_STROKE, "+3"), Layer.FOREGROUND);
            plot.addRangeMarker(marker(-3, ReportColours.BAD, REFERENCE_STROKE, ReportFormat.MINUS + "3"),
                    Layer.FOREGROUND);
        }
        if (ownColumn >= 0) {
            // a copper band behind the own bar, and a label just across the zero line leaning into the chart
            ParticipantResult own = scored.get(ownColumn);
            CategoryMarker band = new CategoryMarker(own.participantCode(),
                    ReportColours.mix(ReportColours.COPPER, Color.WHITE, 0.6), new BasicStroke(scored.size() > MAX_LABELLED ? 3f : 14f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER));
            band.setDrawAsLine(true);
            plot.addDomainMarker(band, Layer.BACKGROUND);
            double s = primaryScore(m, own);
            CategoryTextAnnotation label = new CategoryTextAnnotation(
                    own.participantCode() + " " + ReportFormat.signedScore(s), own.participantCode(), s >= 0 ? -0.25 : 0.25);
            label.setFont(HIGHLIGHT_FONT);
            label.setPaint(ReportColours.COPPER);
            boolean leftHalf = ownColumn < scored.size() / 2;
            label.setTextAnchor(s >= 0
                    ? (leftHalf ? TextAnchor.TOP_LEFT : TextAnchor.TOP_RIGHT)
                    : (leftHalf ? TextAnchor.BOTTOM_LEFT : TextAnchor.BOTTOM_RIGHT));
            plot.addAnnotation(label);
        }
        return chart(plot);
    }

    // ---------------------------------------------------------------- kernel density

    /**
     * Kernel density of the results used in the statistics (Gaussian kernel, Silverman bandwidth,
     * from {@link KernelDensity}), with x_pt (solid) and x_pt ± 2σ_pt (dashed) and a rug of the
     * results. Returns {@code null} when there is no density (fewer than two distinct values).
     */
    public static ReportChart density(MeasurandSection m, String ownCode) {
        List<ParticipantResult> used = densityResults(m);
        double[] values = used.stream().mapToDouble(ParticipantResult::value).toArray();
        if (values.length < 2 || allEqual(values)) {
            return null;
        }
        String caption = "Kernel density of the " + values.length + " results for " + m.title()
                + " (Gaussian kernel, Silverman bandwidth), with x_pt and x_pt \u00b1 2\u03c3_pt"
                + (values.length <= MAX_RUG ? "; ticks mark the results." : ".")
                + (ownCode != null ? " Your result is marked in copper." : "");
        return new ReportChart("density-" + safe(m.id()), caption, WIDTH, HEIGHT, values.length,
                () -> buildDensity(m, used, values, ownCode));
    }

    private static List<ParticipantResult> densityResults(MeasurandSection m) {
        List<ParticipantResult> used = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            if (!r.excluded() && !r.lessThan() && !r.late() && Double.isFinite(r.value())) {
                used.add(r);
            }
        }
        return used;
    }

    private static JFreeChart buildDensity(MeasurandSection m, List<ParticipantResult> used, double[] values,
            String ownCode) {
        KernelDensity kde = KernelDensity.of(values);
        double h = kde.bandwidth();
        double lo = Math.min(min(values), m.assignedValue() - 3 * m.sigmaPt()) - 3 * h;
        double hi = Math.max(max(values), m.assignedValue() + 3 * m.sigmaPt()) + 3 * h;
        Range window = valueWindow(m);
        lo = Math.max(lo, window.getLowerBound());
        hi = Math.min(hi, window.getUpperBound());
        XYSeries curve = new XYSeries("density", false, true);
        int points = 241;
        double top = 0;
        for (int i = 0; i < points; i++) {
            double t = lo + (hi - lo) * i / (points - 1);
            double f = kde.density(t);
            top = Math.max(top, f);
            curve.add(t, f);
        }
        XYSeries rug = new XYSeries("results", false, true);
        XYSeries ownRug = new XYSeries("own", false, true);
        for (ParticipantResult r : used) {
            if (r.participantCode().equals(ownCode)) {
                ownRug.add(r.value(), 0.0);
            } else if (used.size() <= MAX_RUG) {
                rug.add(r.value(), 0.0);
            }
        }
        XYSeriesCollection curveData = new XYSeriesCollection(curve);
        XYSeriesCollection rugData = new XYSeriesCollection();
        rugData.addSeries(rug);
        rugData.addSeries(ownRug);

        NumberAxis x = new NumberAxis(m.name() + ", " + m.unit());
        styleAxisFonts(x);
        x.setRange(lo, hi);
        x.setNumberFormatOverride(numberFormat(m.reportingDigits()));
        NumberAxis y = new NumberAxis("density");
        styleAxisFonts(y);
        y.setTickLabelsVisible(false);
        y.setTickMarksVisible(false);
        y.setRange(-top * 0.06, top * 1.12);

        XYLineAndShapeRenderer line = new XYLineAndShapeRenderer(true, false);
        line.setSeriesPaint(0, ReportColours.SLATE);
        line.setSeriesStroke(0, new BasicStroke(2f));
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
        List<ParticipantResult> shown = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            if (!r.lessThan() && Double.isFinite(r.value())) {
                shown.add(r);
            }
        }
        shown.sort(Comparator.comparingDouble(ParticipantResult::value)
                .thenComparing(ParticipantResult::participantCode));
        long withU = shown.stream().filter(r -> r.expandedUncertainty() != null).count();
        String caption = "Results for " + m.title() + " in increasing order with their expanded uncertainties U ("
                + withU + " of " + shown.size() + " reported U), against x_pt (line) and x_pt \u00b1 2\u03c3_pt (band)."
                + (ownCode != null ? " Your result is in copper." : "");
        return new ReportChart("ubars-" + safe(m.id()), caption, WIDTH, HEIGHT, shown.size(),
                () -> buildUncertaintyBars(m, shown, ownCode));
    }

    private static JFreeChart buildUncertaintyBars(MeasurandSection m, List<ParticipantResult> shown, String ownCode) {
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
        NumberAxis y = new NumberAxis(m.name() + ", " + m.unit());
        styleAxisFonts(y);
        y.setNumberFormatOverride(numberFormat(m.reportingDigits()));
        y.setRange(valueRange(m, shown.stream()
                .flatMap(r -> r.expandedUncertainty() == null
                        ? java.util.stream.Stream.of(r.value())
                        : java.util.stream.Stream.of(r.value() - r.expandedUncertainty(), r.value() + r.expandedUncertainty()))
                .mapToDouble(Double::doubleValue).toArray()));

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
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        IntervalMarker band = new IntervalMarker(m.assignedValue() - 2 * m.sigmaPt(),
                m.assignedValue() + 2 * m.sigmaPt(), ReportColours.mix(ReportColours.WARN, Color.WHITE, 0.82));
        band.setOutlinePaint(null);
        plot.addRangeMarker(band, Layer.BACKGROUND);
        ValueMarker assigned = marker(m.assignedValue(), ReportColours.SLATE, REFERENCE_STROKE, X_PT);
        plot.addRangeMarker(assigned, Layer.FOREGROUND);
        return chart(plot);
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
    private static Range valueWindow(MeasurandSection m) {
        double half = VALUE_AXIS_SIGMAS * m.sigmaPt();
        return new Range(m.assignedValue() - half, m.assignedValue() + half);
    }

    /** The data range, at least x_pt ± 3σ_pt, at most the value window, with a small margin. */
    private static Range valueRange(MeasurandSection m, double[] values) {
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

    private static boolean allEqual(double[] values) {
        for (double v : values) {
            if (v != values[0]) {
                return false;
            }
        }
        return true;
    }

    private static double min(double[] values) {
        double min = Double.POSITIVE_INFINITY;
        for (double v : values) {
            min = Math.min(min, v);
        }
        return min;
    }

    private static double max(double[] values) {
        double max = Double.NEGATIVE_INFINITY;
        for (double v : values) {
            max = Math.max(max, v);
        }
        return max;
    }

    private static String safe(String id) {
        return id.replaceAll("[^A-Za-z0-9]", "-");
    }

}
