package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.evaluation.EvaluationExports;
import org.roundtable.platform.DomainException;
import org.roundtable.report.chart.ChartDataCache;
import org.roundtable.report.chart.MeasurandChartData;
import org.roundtable.report.chart.ReportChart;
import org.roundtable.report.chart.ReportCharts;
import org.roundtable.report.chart.SvgCharts;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.Signatory;
import org.roundtable.report.model.Signatures;
import org.roundtable.statistics.score.Classification;

import java.math.BigDecimal;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * A laboratory's own scores on the web, once a report is issued to laboratories: per measurand what it reported
 * (value, U and k), x_pt, σpt and the score the plan uses with its verdict, the three charts of its laboratory report
 * with its own mark, and links to the issued reports. Which run that is comes from {@link ReportVisibility} (through
 * {@link EvaluationExports#ownScores}); a round the laboratory is not in, or one with nothing issued yet, is "not
 * found" exactly like a missing round.
 *
 * <p>The report sections (and the charts' data) of a published run are assembled once and kept: an evaluation run
 * never changes, so neither do they.
 */
@ApplicationScoped
public class LaboratoryScores {

    /** The charts of a measurand as the laboratory report carries them, by the last step of their address. */
    static final List<String> CHARTS = List.of("scores", "density", "uncertainty");

    /** A chart of the page: its address and the caption read as its text alternative. */
    public record ChartLink(String href, String caption) {
    }

    /**
     * One measurand (and item) as the laboratory reported it and was scored; {@code score} null when the result was
     * not scored ({@code excludedReason} says why), {@code verdict} null for a score given for information only.
     */
    public record Row(String sectionId, String title, String unit, int digits, String reported, Double value,
                      Double expandedUncertainty, String coverageFactor, double assignedValue,
                      double assignedValueUncertainty, double sigmaPt, String scoreSymbol, Double score,
                      Classification verdict, boolean informationOnly, String excludedReason, int scoreDecimals,
                      List<ChartLink> charts) {

        /** Whether the reported value is a plain number (not "less than"). */
        public boolean numeric() {
            return value != null && !value.isNaN() && (reported == null || !reported.strip().startsWith("<"));
        }
    }

    /** The scores page of one round. */
    public record Page(long roundId, String roundCode, String participantCode, String reportId, ReportStatus reportStatus,
                       int evaluationVersion, boolean commentPeriodOpen, ReportLifecycle.DocumentView roundReport,
                       ReportLifecycle.DocumentView laboratoryReport, List<Row> rows) {
    }

    private static final int CACHED_RUNS = 16;

    private final EvaluationExports exports;
    private final ReportLifecycle lifecycle;
    private final ReportAssembler assembler;
    private final ChartDataCache chartData = new ChartDataCache();
    private final Map<String, RoundReport> reports = new LinkedHashMap<>(16, 0.75f, true) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<String, RoundReport> eldest) {
            return size() > CACHED_RUNS;
        }
    };

    public LaboratoryScores(EvaluationExports exports, ReportLifecycle lifecycle, ReportAssembler assembler) {
        this.exports = exports;
        this.lifecycle = lifecycle;
        this.assembler = assembler;
    }

    /** The calling laboratory's scores page; 404 as for a missing round when it may not see one. */
    @Transactional
    public Page page(long roundId) {
        EvaluationExports.OwnScores own = exports.ownScores(roundId);
        ReportLifecycle.LaboratoryView view = lifecycle.forLaboratory(roundId);
        RoundReport report = report(roundId, own.evaluationVersion());
        Map<String, EvaluationExports.OwnScore> ownByKey = new LinkedHashMap<>();
        for (EvaluationExports.OwnScore s : own.scores()) {
            ownByKey.put(s.element() + "\u0000" + s.itemLabel(), s);
        }
        List<Row> rows = new ArrayList<>();
        for (MeasurandSection m : report.measurands()) {
            Optional<ParticipantResult> mine = m.results().stream()
                    .filter(r -> r.participantCode().equals(own.participantCode())).findFirst();
            if (mine.isEmpty()) {
                continue;
            }
            ParticipantResult r = mine.get();
            EvaluationExports.OwnScore score = ownByKey.get(m.name() + "\u0000" + r.itemLabel());
            boolean informationOnly = score != null && score.informationOnly();
            Double primary = ReportCharts.primaryScore(m, r);
            List<ChartLink> charts = new ArrayList<>();
            MeasurandChartData data = chartData.get(m);
            for (String kind : CHARTS) {
                ReportChart chart = chart(data, kind, own.participantCode());
                if (chart != null) {
                    charts.add(new ChartLink("/my-rounds/" + roundId + "/scores/" + m.id() + "/" + kind + ".svg",
                            chart.caption()));
                }
            }
            rows.add(new Row(m.id(), m.title(), m.unit(), m.reportingDigits(), r.reportedValue(),
                    Double.isNaN(r.value()) ? null : r.value(), r.expandedUncertainty(), plain(r.coverageFactor()),
                    m.assignedValue(), m.assignedValueUncertainty(), m.sigmaPt(), ReportCharts.scoreSymbol(m.scoreKind()),
                    r.excluded() ? null : primary, informationOnly ? null : r.classification(), informationOnly,
                    r.excluded() ? r.exclusionReason() : null, m.scoreDecimals(), charts));
        }
        ReportLifecycle.DocumentView roundReport = view.documents().stream()
                .filter(d -> d.reportId().equals(own.reportId())).findFirst().orElse(null);
        ReportLifecycle.DocumentView laboratoryReport = view.documents().stream()
                .filter(d -> DocumentKind.LABORATORY.name().equals(d.kind()) && d.status().equals(own.reportStatus())
                        && d.supersededBy() == null)
                .reduce((a, b) -> b).orElse(null);
        return new Page(roundId, own.roundCode(), own.participantCode(), own.reportId(),
                ReportStatus.valueOf(own.reportStatus()), own.evaluationVersion(), view.commentPeriodOpen(), roundReport,
                laboratoryReport, rows);
    }

    /** One chart of a measurand as an SVG document, with the calling laboratory's own mark; else "not found". */
    @Transactional
    public String chartSvg(long roundId, String sectionId, String kindPath) {
        EvaluationExports.OwnScores own = exports.ownScores(roundId);
        if (!CHARTS.contains(kindPath)) {
            throw new DomainException.NotFound("The chart");
        }
        MeasurandSection m = report(roundId, own.evaluationVersion()).measurand(sectionId)
                .orElseThrow(() -> new DomainException.NotFound("The chart"));
        if (m.results().stream().noneMatch(r -> r.participantCode().equals(own.participantCode()))) {
            throw new DomainException.NotFound("The chart");
        }
        ReportChart chart = chart(chartData.get(m), kindPath, own.participantCode());
        if (chart == null) {
            throw new DomainException.NotFound("The chart");
        }
        String svg = SvgCharts.toSvgElement(chart);
        if (!svg.contains("xmlns=")) {
            svg = svg.replaceFirst("<svg", "<svg xmlns=\"http://www.w3.org/2000/svg\"");
        }
        return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + svg;
    }

    private static ReportChart chart(MeasurandChartData data, String kind, String ownCode) {
        return switch (kind) {
            case "scores" -> ReportCharts.scoreBars(data, ownCode);
            case "density" -> ReportCharts.density(data, ownCode);
            default -> ReportCharts.uncertaintyBars(data, ownCode);
        };
    }

    /** The report sections of a published run (assembled once per run; a run never changes). */
    private RoundReport report(long roundId, int version) {
        String key = roundId + "/" + version;
        synchronized (reports) {
            RoundReport cached = reports.get(key);
            if (cached != null) {
                return cached;
            }
        }
        // only the sections are read: the identity and signatures of an assembled copy are placeholders
        LocalDate day = LocalDate.of(2000, 1, 1);
        RoundReport report = assembler.assemble(roundId, version,
                new ReportIdentity("scores", ReportStatus.PRELIMINARY, null, null, day, assembler.providerName()),
                new Signatures(new Signatory("-", "-", day), null), "").report();
        synchronized (reports) {
            reports.putIfAbsent(key, report);
            return reports.get(key);
        }
    }

    private static String plain(Double number) {
        return number == null ? null : BigDecimal.valueOf(number).stripTrailingZeros().toPlainString();
    }
}
