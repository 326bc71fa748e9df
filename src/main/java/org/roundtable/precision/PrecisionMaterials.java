package org.roundtable.precision;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.inject.Named;
import jakarta.transaction.Transactional;
import java.util.ArrayList;
import java.util.List;
import org.roundtable.platform.NumberFormats;
import org.roundtable.scheme.qualification.QualificationService;
import org.roundtable.statistics.homogeneity.HomogeneityCheck;

/**
 * The homogeneity of a precision experiment's materials ready to print, for the study page, the homogeneity page and
 * the report: the latest check of each level and measurand ({@link QualificationService#levelHomogeneity}) against
 * the target the coordinator gave (the expected s_R), and, once the study is evaluated, s_s against 0.3·s_R as the
 * latest evaluation run found it. Numbers at the measurand's reporting digits + 1 (statistics).
 */
@ApplicationScoped
@Named("precisionMaterials")
public class PrecisionMaterials {

    /** One level and measurand, ready to print. */
    public record Row(String level, String material, String measurand, String unit, String design, String mean,
                      String withinSd, String betweenSd, String target, String limit, String allowance,
                      boolean homogeneous, String verdict, String observedReproducibility, String observedLimit,
                      Boolean meetsObserved, List<String> warnings, String uploadedBy, String uploadedAt) {
    }

    private final QualificationService qualification;
    private final PrecisionExperimentService studies;

    public PrecisionMaterials(QualificationService qualification, PrecisionExperimentService studies) {
        this.qualification = qualification;
        this.studies = studies;
    }

    /** The rows of a study whose plan is frozen; empty before. */
    @Transactional
    public List<Row> of(long roundId) {
        if (studies.view(roundId).planVersion() == null) {
            return List.of();
        }
        return of(roundId, studies.latestRun(roundId).map(PrecisionExperimentService.Run::study).orElse(null));
    }

    /** The rows with s_R as {@code study} (a run's result; null for none) found it, for a report of that run. */
    @Transactional
    public List<Row> of(long roundId, PrecisionCalculation.Study study) {
        List<Row> rows = new ArrayList<>();
        for (QualificationService.LevelHomogeneity h : qualification.levelHomogeneity(roundId)) {
            rows.add(row(h, study == null ? null : observedReproducibility(study, h.element(), h.level())));
        }
        return rows;
    }

    static Row row(QualificationService.LevelHomogeneity h, Double observedSr) {
        QualificationService.HomogeneityFigures f = h.figures();
        int d = h.reportingDigits();
        String observed = observedSr == null ? null : NumberFormats.statistic(observedSr, d);
        String observedLimit = observedSr == null ? null
                : NumberFormats.statistic(HomogeneityCheck.ALLOWANCE_FACTOR * observedSr, d);
        Boolean meets = observedSr == null ? null : f.betweenItemSd() <= HomogeneityCheck.ALLOWANCE_FACTOR * observedSr;
        return new Row(h.level(), h.material(), h.element(), h.unit(), f.items() + " items × " + f.replicates() + " replicates",
                NumberFormats.statistic(f.grandMean(), d), NumberFormats.statistic(f.withinItemSd(), d),
                NumberFormats.statistic(f.betweenItemSd(), d), NumberFormats.statistic(f.sigmaPt(), d),
                NumberFormats.statistic(f.simpleLimit(), d), NumberFormats.statistic(f.allowanceSd(), d),
                f.sufficientlyHomogeneous(), f.sufficientlyHomogeneous() ? "sufficiently homogeneous"
                        : "not shown to be sufficiently homogeneous",
                observed, observedLimit, meets, f.warnings(), h.uploadedBy(),
                h.uploadedAt().format(java.time.format.DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm")) + " UTC");
    }

    private static Double observedReproducibility(PrecisionCalculation.Study study, String measurand, String level) {
        return study.measurands().stream().filter(m -> m.measurand().equals(measurand))
                .flatMap(m -> m.levels().stream()).filter(l -> l.level().equals(level))
                .map(PrecisionCalculation.LevelResult::reproducibilitySd).findFirst().orElse(null);
    }
}
