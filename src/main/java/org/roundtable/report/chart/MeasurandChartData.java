package org.roundtable.report.chart;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.jfree.data.Range;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.statistics.density.KernelDensity;

/**
 * What the charts of one measurand need that is the same in every report of the round: the scored
 * results in score order, the kernel density curve, the results in value order and the axis ranges.
 *
 * <p>Issuing a round renders the round report and one laboratory report per participant; each of
 * them draws the same three charts per measurand with a different bar highlighted. Computing this
 * once per measurand ({@link ChartDataCache}) instead of once per report saves sorting and
 * evaluating the density {@value #DENSITY_POINTS} × n times per laboratory report.
 *
 * <p>Immutable and thread-safe once built.
 */
public final class MeasurandChartData {

    /** Points at which the density curve is evaluated. */
    static final int DENSITY_POINTS = 241;

    final MeasurandSection measurand;
    /** Results with a finite primary score, lowest score first (ties by code). */
    final List<ParticipantResult> scored;
    final double[] scores;
    final double maxAbsScore;
    /** Results used for the density (not excluded, censored or late). */
    final List<ParticipantResult> densityResults;
    /** Density curve, or {@code null} when there is none (fewer than two distinct values). */
    final double[] curveX;
    final double[] curveY;
    final double densityLow;
    final double densityHigh;
    final double densityTop;
    /** Uncensored results with a finite value, lowest value first (ties by code). */
    final List<ParticipantResult> shown;
    final long shownWithU;
    final Range uncertaintyRange;

    private MeasurandChartData(MeasurandSection m) {
        this.measurand = m;
        List<ParticipantResult> s = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            Double score = ReportCharts.primaryScore(m, r);
            if (score != null && Double.isFinite(score)) {
                s.add(r);
            }
        }
        s.sort(Comparator.<ParticipantResult>comparingDouble(r -> ReportCharts.primaryScore(m, r))
                .thenComparing(ParticipantResult::participantCode));
        this.scored = List.copyOf(s);
        this.scores = new double[scored.size()];
        double maxAbs = 0;
        for (int i = 0; i < scores.length; i++) {
            scores[i] = ReportCharts.primaryScore(m, scored.get(i));
            maxAbs = Math.max(maxAbs, Math.abs(scores[i]));
        }
        this.maxAbsScore = maxAbs;

        List<ParticipantResult> used = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            if (!r.excluded() && !r.lessThan() && !r.late() && Double.isFinite(r.value())) {
                used.add(r);
            }
        }
        this.densityResults = List.copyOf(used);
        double[] values = used.stream().mapToDouble(ParticipantResult::value).toArray();
        if (values.length < 2 || allEqual(values)) {
            curveX = null;
            curveY = null;
            densityLow = Double.NaN;
            densityHigh = Double.NaN;
            densityTop = Double.NaN;
        } else {
            KernelDensity kde = KernelDensity.of(values);
            double h = kde.bandwidth();
            double lo = Math.min(min(values), m.assignedValue() - 3 * m.sigmaPt()) - 3 * h;
            double hi = Math.max(max(values), m.assignedValue() + 3 * m.sigmaPt()) + 3 * h;
            Range window = ReportCharts.valueWindow(m);
            lo = Math.max(lo, window.getLowerBound());
            hi = Math.min(hi, window.getUpperBound());
            curveX = new double[DENSITY_POINTS];
            curveY = new double[DENSITY_POINTS];
            double top = 0;
            for (int i = 0; i < DENSITY_POINTS; i++) {
                double t = lo + (hi - lo) * i / (DENSITY_POINTS - 1);
                curveX[i] = t;
                curveY[i] = kde.density(t);
                top = Math.max(top, curveY[i]);
            }
            densityLow = lo;
            densityHigh = hi;
            densityTop = top;
        }

        List<ParticipantResult> ordered = new ArrayList<>();
        for (ParticipantResult r : m.results()) {
            if (!r.lessThan() && Double.isFinite(r.value())) {
                ordered.add(r);
            }
        }
        ordered.sort(Comparator.comparingDouble(ParticipantResult::value).thenComparing(ParticipantResult::participantCode));
        this.shown = List.copyOf(ordered);
        this.shownWithU = shown.stream().filter(r -> r.expandedUncertainty() != null).count();
        this.uncertaintyRange = ReportCharts.valueRange(m, shown.stream()
                .flatMap(r -> r.expandedUncertainty() == null
                        ? java.util.stream.Stream.of(r.value())
                        : java.util.stream.Stream.of(r.value() - r.expandedUncertainty(), r.value() + r.expandedUncertainty()))
                .mapToDouble(Double::doubleValue).toArray());
    }

    /** Computes the chart data of a measurand. */
    public static MeasurandChartData of(MeasurandSection m) {
        return new MeasurandChartData(m);
    }

    /** The measurand the data was computed from. */
    public MeasurandSection measurand() {
        return measurand;
    }

    boolean hasDensity() {
        return curveX != null;
    }

    /** Index of the participant in {@code list}, or −1. */
    static int indexOf(List<ParticipantResult> list, String code) {
        if (code == null) {
            return -1;
        }
        for (int i = 0; i < list.size(); i++) {
            if (list.get(i).participantCode().equals(code)) {
                return i;
            }
        }
        return -1;
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
}
