package org.roundtable.scheme.qualification;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;
import org.roundtable.account.CurrentUser;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.PlanDocument;
import org.roundtable.scheme.PlanStore;
import org.roundtable.scheme.PrecisionPlan;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundGate;
import org.roundtable.statistics.StatisticsWarning;
import org.roundtable.statistics.homogeneity.HomogeneityCheck;
import org.roundtable.statistics.homogeneity.StabilityCheck;
import org.roundtable.submission.intake.UploadFormat;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;
import java.util.function.Supplier;

/**
 * Sample qualification of a round's items: homogeneity and stability uploads, the checks of the statistics
 * core run against the planned σpt (or the plan's provisional σpt when σpt depends on the round's data),
 * and the coordinator's decision per measurand.
 *
 * <p>Rules:
 * <ul>
 *   <li>homogeneity needs g ≥ 10 items, each with the same number (≥ 2) of replicates; the figures are those
 *       of {@link HomogeneityCheck} (s_x, s_w, s_s, criterion s_s ≤ 0.3σpt, the F1/F2 allowance, s_w/σpt,
 *       Cochran's screen of the duplicate differences). "Passed" means sufficiently homogeneous;</li>
 *   <li>stability compares the homogeneity data in force (start, u = s_x/√g) with the stability results
 *       (end, u = s/√n) through {@link StabilityCheck}; "passed" means the simple criterion |ȳ1 − ȳ2| ≤ 0.3σpt
 *       holds; the expanded criterion is shown to support a decision;</li>
 *   <li>a measurand is cleared when its latest homogeneity check passed and its latest stability check (if
 *       any) passed, or when a decision is recorded. A decision on a measurand that has not passed needs a
 *       reason. A measurand whose decision is WITHDRAW_MEASURAND is never scored
 *       ({@link #mayBeScored});</li>
 *   <li>an upload is all-or-nothing: one bad line, or one measurand without enough data, saves nothing.</li>
 * </ul>
 */
@ApplicationScoped
public class QualificationService {

    private final RoundGate gate;
    private final PlanStore plans;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final ObjectMapper mapper;
    private final Clock clock;
    private final RoundAccess rounds;

    public QualificationService(RoundGate gate, PlanStore plans, AuditTrail audit, CurrentUser currentUser,
                                EntityManager entityManager, ObjectMapper mapper, Clock clock, RoundAccess rounds) {
        this.rounds = rounds;
        this.gate = gate;
        this.plans = plans;
        this.audit = audit;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.mapper = mapper;
        this.clock = clock;
    }

    public enum Decision {
        /** Use the items as they are (with a reason when a check did not pass). */
        ACCEPT,
        /** Widen σpt by the between-item SD: σpt' = sqrt(σpt² + s_s²). */
        WIDEN_SIGMA_PT,
        /** Add u_hom = s_s to u(x_pt); only for an assigned value that is not a consensus of the round. */
        ADD_HOMOGENEITY_UNCERTAINTY,
        /**
         * Add u_hom = s_s and u_stab = |ȳ1 − ȳ2|/√3 to u(x_pt): u(x_pt) = sqrt(u_char² + u_hom² + u_stab²), the
         * difference of the latest stability check taken as the half-width of a rectangular distribution. Needs
         * stability data (which need homogeneity data); only for an assigned value that is not a consensus of the
         * round, like u_hom. One decision for both components because one decision is in force per measurand
         * and the stability check always comes with a homogeneity check (its start).
         */
        ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY,
        /** Do not score the measurand in this round. */
        WITHDRAW_MEASURAND
    }

    /** Data typed or pasted as CSV text (the JSON API's body and the page's text area). */
    public record Upload(String csv) {
    }

    /** Data sent as a file: its bytes and its format (CSV or XLSX), read with the intake's file rules. */
    public record DataFile(byte[] content, UploadFormat format) {
    }

    public record DecisionRequest(String element, String decision, String reason) {
    }

    /** Figures of one homogeneity check (symbols of ISO 13528 Annex B). */
    public record HomogeneityFigures(double sigmaPt, String sigmaPtSource, int items, int replicates, double grandMean,
                                     double itemMeansSd, double withinItemSd, double betweenItemSd,
                                     double betweenItemVariance, double simpleLimit, boolean passesSimpleCriterion,
                                     double f1, double f2, double allowance, double allowanceSd,
                                     boolean passesAllowanceCriterion, boolean sufficientlyHomogeneous,
                                     double withinToSigmaRatio, Double cochranStatistic, Double cochranCritical5,
                                     Double cochranCritical1, String cochranVerdict, List<String> warnings) {
    }

    public record StabilityFigures(double sigmaPt, String sigmaPtSource, double startMean, double startUncertainty,
                                   double endMean, double endUncertainty, int endResults, double difference,
                                   double simpleLimit, double expandedLimit, boolean stable, boolean stableExpanded) {
    }

    public record DecisionView(String decision, String reason, String decidedBy, OffsetDateTime decidedAt) {
    }

    /** The state of qualification of one planned measurand. */
    public record MeasurandQualification(String element, String unit, HomogeneityFigures homogeneity,
                                         StabilityFigures stability, DecisionView decision, boolean passed,
                                         boolean cleared, int reportingDigits) {
    }

    // ---- uploads -------------------------------------------------------------------------------------

    @Transactional
    public List<MeasurandQualification> uploadHomogeneity(long roundId, Upload upload) {
        return homogeneity(roundId, () -> QualificationCsv.homogeneity(upload == null ? null : upload.csv()));
    }

    /** Homogeneity data from a CSV or XLSX file; the same checks as {@link #uploadHomogeneity}. */
    @Transactional
    public List<MeasurandQualification> uploadHomogeneityFile(long roundId, DataFile file) {
        return homogeneity(roundId, () -> QualificationCsv.homogeneity(file.content(), file.format()));
    }

    @Transactional
    public List<MeasurandQualification> uploadStability(long roundId, Upload upload) {
        return stability(roundId, () -> QualificationCsv.stability(upload == null ? null : upload.csv()));
    }

    /** Stability data from a CSV or XLSX file; the same checks as {@link #uploadStability}. */
    @Transactional
    public List<MeasurandQualification> uploadStabilityFile(long roundId, DataFile file) {
        return stability(roundId, () -> QualificationCsv.stability(file.content(), file.format()));
    }

    private List<MeasurandQualification> homogeneity(long roundId,
                                                     Supplier<List<QualificationCsv.HomogeneityRow>> read) {
        gate.enter(roundId, RoundAction.UPLOAD_QUALIFICATION_DATA);
        Map<String, PlannedMeasurand> planned = planned(roundId);
        List<QualificationCsv.HomogeneityRow> rows = read.get();
        Map<String, List<QualificationCsv.HomogeneityRow>> byElement = new TreeMap<>();
        for (QualificationCsv.HomogeneityRow row : rows) {
            if (!planned.containsKey(row.element())) {
                throw QualificationCsv.error(row.line(), "measurand", row.element() + " is not in the round's evaluation plan");
            }
            byElement.computeIfAbsent(row.element(), e -> new ArrayList<>()).add(row);
        }
        List<Stored> toStore = new ArrayList<>();
        for (Map.Entry<String, List<QualificationCsv.HomogeneityRow>> e : byElement.entrySet()) {
            PlannedMeasurand m = planned.get(e.getKey());
            double[][] items = items(e.getKey(), e.getValue());
            HomogeneityCheck.Result r = HomogeneityCheck.evaluate(items, m.sigma().value());
            HomogeneityFigures figures = figures(r, m.sigma().value(), m.sigma().source());
            toStore.add(new Stored(e.getKey(), "HOMOGENEITY", m.sigma(), csvOf(e.getValue()), json(figures),
                    figures.sufficientlyHomogeneous()));
        }
        store(roundId, toStore);
        return status(roundId);
    }

    private List<MeasurandQualification> stability(long roundId, Supplier<List<QualificationCsv.StabilityRow>> read) {
        gate.enter(roundId, RoundAction.UPLOAD_QUALIFICATION_DATA);
        Map<String, PlannedMeasurand> planned = planned(roundId);
        List<QualificationCsv.StabilityRow> rows = read.get();
        Map<String, List<QualificationCsv.StabilityRow>> byElement = new TreeMap<>();
        for (QualificationCsv.StabilityRow row : rows) {
            if (!planned.containsKey(row.element())) {
                throw QualificationCsv.error(row.line(), "measurand", row.element() + " is not in the round's evaluation plan");
            }
            byElement.computeIfAbsent(row.element(), e -> new ArrayList<>()).add(row);
        }
        List<Stored> toStore = new ArrayList<>();
        for (Map.Entry<String, List<QualificationCsv.StabilityRow>> e : byElement.entrySet()) {
            PlannedMeasurand m = planned.get(e.getKey());
            List<QualificationCsv.StabilityRow> list = e.getValue();
            if (list.size() < 2) {
                throw QualificationCsv.error(list.get(0).line(), "measurand", e.getKey() + " has " + list.size()
                        + " stability result; at least 2 are needed");
            }
            String homogeneityCsv = latestData(roundId, e.getKey(), "HOMOGENEITY").orElseThrow(() ->
                    QualificationCsv.error(list.get(0).line(), "measurand", "upload homogeneity data for " + e.getKey()
                            + " first: it is the start of the stability comparison"));
            double[][] start = items(e.getKey(), QualificationCsv.homogeneity(homogeneityCsv));
            double[] end = list.stream().mapToDouble(QualificationCsv.StabilityRow::value).toArray();
            StabilityCheck.Result r = StabilityCheck.evaluate(start, end, m.sigma().value());
            StabilityFigures figures = new StabilityFigures(m.sigma().value(), m.sigma().source(), r.startMean(),
                    r.startUncertainty(), r.endMean(), r.endUncertainty(), end.length, r.difference(), r.simpleLimit(),
                    r.expandedLimit(), r.stable(), r.stableExpanded());
            StringBuilder data = new StringBuilder("item,measurand,value\n");
            list.forEach(row -> data.append(row.item()).append(',').append(row.element()).append(',')
                    .append(row.valueText()).append('\n'));
            toStore.add(new Stored(e.getKey(), "STABILITY", m.sigma(), data.toString(), json(figures), r.stable()));
        }
        store(roundId, toStore);
        return status(roundId);
    }

    // ---- decisions ------------------------------------------------------------------------------------

    @Transactional
    public List<MeasurandQualification> decide(long roundId, DecisionRequest request) {
        gate.enter(roundId, RoundAction.RECORD_QUALIFICATION_DECISION);
        Map<String, PlannedMeasurand> planned = planned(roundId);
        if (request == null || request.element() == null || !planned.containsKey(request.element().strip())) {
            throw new DomainException.BadRequest("Name a measurand of the round's plan: " + String.join(", ", planned.keySet()) + ".");
        }
        String element = request.element().strip();
        Decision decision;
        try {
            decision = Decision.valueOf(request.decision() == null ? "" : request.decision().strip().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new DomainException.BadRequest("The decision is one of " + List.of(Decision.values()) + ".");
        }
        String reason = request.reason() == null || request.reason().isBlank() ? null : request.reason().strip();
        if (reason != null && reason.length() > 2000) {
            throw new DomainException.BadRequest("The reason has at most 2000 characters.");
        }
        MeasurandQualification current = status(roundId).stream().filter(q -> q.element().equals(element)).findFirst().orElseThrow();
        if (reason == null && (decision != Decision.ACCEPT || !current.passed())) {
            throw new DomainException.BadRequest(current.passed() ? "This decision needs a reason."
                    : "The checks of " + element + " have not passed: a decision needs a reason.");
        }
        if ((decision == Decision.WIDEN_SIGMA_PT || decision == Decision.ADD_HOMOGENEITY_UNCERTAINTY)
                && current.homogeneity() == null) {
            throw new DomainException.Conflict("Upload homogeneity data first: this decision uses s_s.");
        }
        if (decision == Decision.ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY
                && (current.homogeneity() == null || current.stability() == null)) {
            throw new DomainException.Conflict("Upload homogeneity and stability data first: this decision uses s_s"
                    + " and the stability difference |ȳ1 − ȳ2|.");
        }
        if (decision == Decision.ADD_HOMOGENEITY_UNCERTAINTY && planned.get(element).consensus()) {
            throw new DomainException.Conflict("u_hom is added to u(x_pt) only for an assigned value that is not a"
                    + " consensus of the round's results; widen σpt instead.");
        }
        if (decision == Decision.ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY && planned.get(element).consensus()) {
            // a consensus is measured on the items as the participants received them, after transport and during the
            // round: its spread (and so u_char) already contains the items' inhomogeneity and their change
            throw new DomainException.Conflict("u_hom and u_stab are added to u(x_pt) only for an assigned value that"
                    + " is not a consensus of the round's results (the results were measured on the items as they were"
                    + " during the round); widen σpt instead.");
        }
        OffsetDateTime now = now();
        entityManager.createNativeQuery("""
                INSERT INTO qualification_decision (round_id, element, decision, reason, decided_by, decided_at)
                VALUES (:r, :e, :d, :reason, :by, :at)
                """).setParameter("r", roundId).setParameter("e", element).setParameter("d", decision.name())
                .setParameter("reason", reason).setParameter("by", currentUser.actor().name()).setParameter("at", now)
                .executeUpdate();
        audit.record(new AuditTrail.Event(currentUser.actor(), "qualification.decided", "round", Long.toString(roundId),
                null, null, "element=" + element + " decision=" + decision + (reason == null ? "" : " reason=" + reason)));
        return status(roundId);
    }

    // ---- reading -------------------------------------------------------------------------------------

    @Transactional
    public List<MeasurandQualification> status(long roundId) {
        gate.find(roundId);
        Map<String, PlannedMeasurand> planned = plannedOrEmpty(roundId);
        // the latest check of each kind and the latest decision of every measurand in two queries, not three a measurand
        @SuppressWarnings("unchecked")
        List<Object[]> checks = entityManager.createNativeQuery("""
                SELECT DISTINCT ON (element, kind) element, kind, figures_json FROM qualification_check
                 WHERE round_id = :r AND level_label IS NULL ORDER BY element, kind, id DESC
                """).setParameter("r", roundId).getResultList();
        Map<String, String> figures = new java.util.HashMap<>();
        checks.forEach(c -> figures.put(c[0] + "/" + c[1], (String) c[2]));
        @SuppressWarnings("unchecked")
        List<Object[]> decisions = entityManager.createNativeQuery("""
                SELECT DISTINCT ON (element) element, decision, reason, decided_by, decided_at FROM qualification_decision
                 WHERE round_id = :r ORDER BY element, id DESC
                """).setParameter("r", roundId).getResultList();
        Map<String, DecisionView> decided = new java.util.HashMap<>();
        decisions.forEach(r -> decided.put((String) r[0], new DecisionView((String) r[1], (String) r[2], (String) r[3],
                Timestamps.utc(r[4]))));
        List<MeasurandQualification> out = new ArrayList<>();
        for (PlannedMeasurand m : planned.values()) {
            HomogeneityFigures h = read(figures.get(m.element() + "/HOMOGENEITY"), HomogeneityFigures.class);
            StabilityFigures s = read(figures.get(m.element() + "/STABILITY"), StabilityFigures.class);
            DecisionView d = decided.get(m.element());
            boolean passed = h != null && h.sufficientlyHomogeneous() && (s == null || s.stable());
            out.add(new MeasurandQualification(m.element(), m.unit(), h, s, d, passed, passed || d != null, m.digits()));
        }
        return out;
    }

    /** Planned measurands whose qualification is not settled (neither passed nor decided). */
    @Transactional(Transactional.TxType.MANDATORY)
    public List<String> unclearedElements(long roundId) {
        return status(roundId).stream().filter(q -> !q.cleared()).map(MeasurandQualification::element).toList();
    }

    /**
     * Whether a measurand may be scored: its qualification is settled and it was not withdrawn. For the
     * evaluation feature.
     */
    @Transactional
    public boolean mayBeScored(long roundId, String element) {
        return status(roundId).stream().filter(q -> q.element().equals(element)).findFirst()
                .map(q -> q.cleared() && (q.decision() == null
                        || !Decision.WITHDRAW_MEASURAND.name().equals(q.decision().decision())))
                .orElse(false);
    }

    /** The measurands the coordinator's latest decision withdrew from the round (for submissions). */
    @Transactional
    public java.util.Set<String> withdrawnElements(long roundId) {
        @SuppressWarnings("unchecked")
        List<String> elements = entityManager.createNativeQuery("""
                SELECT d.element FROM qualification_decision d
                 WHERE d.round_id = :r AND d.decision = 'WITHDRAW_MEASURAND'
                   AND d.id = (SELECT max(id) FROM qualification_decision x WHERE x.round_id = d.round_id AND x.element = d.element)
                """).setParameter("r", roundId).getResultList();
        return java.util.Set.copyOf(elements);
    }

    // ---- materials of a precision experiment -----------------------------------------------------------

    /**
     * The latest homogeneity check of one level (material) and measurand of a precision experiment, against the
     * target SD the coordinator gave with the data (the expected s_R at that level): the figures of
     * {@link HomogeneityCheck} with σpt read as that target, so the criterion is s_s ≤ 0.3·target, with the F1/F2
     * allowance for the within-item SD.
     */
    public record LevelHomogeneity(String level, String material, String element, String unit, int reportingDigits,
                                   HomogeneityFigures figures, String uploadedBy, OffsetDateTime uploadedAt) {
    }

    /** Where {@link HomogeneityFigures#sigmaPtSource} names the target of a precision experiment's material. */
    public static final String EXPECTED_REPRODUCIBILITY = "expected s_R";

    /**
     * Homogeneity data of one level of a precision experiment (columns item, replicate, measurand, value; g ≥ 10
     * items, equal replicates ≥ 2) with the target SD per measurand ({@code targets}: element → decimal text in the
     * measurand's unit); only the measurands in the data need a target. All-or-nothing, like a round's upload.
     */
    @Transactional
    public List<LevelHomogeneity> uploadLevelHomogeneity(long roundId, String level, Map<String, String> targets,
                                                         Upload upload) {
        return levelHomogeneity(roundId, level, targets, () -> QualificationCsv.homogeneity(upload == null ? null : upload.csv()));
    }

    /** The same as {@link #uploadLevelHomogeneity} from a CSV or XLSX file. */
    @Transactional
    public List<LevelHomogeneity> uploadLevelHomogeneityFile(long roundId, String level, Map<String, String> targets,
                                                             DataFile file) {
        return levelHomogeneity(roundId, level, targets, () -> QualificationCsv.homogeneity(file.content(), file.format()));
    }

    private List<LevelHomogeneity> levelHomogeneity(long roundId, String levelText, Map<String, String> targets,
                                                    Supplier<List<QualificationCsv.HomogeneityRow>> read) {
        RoundAccess.PrecisionStudy study = precisionStudy(roundId);
        gate.enter(roundId, RoundAction.UPLOAD_QUALIFICATION_DATA);
        String level = levelText == null ? "" : levelText.strip();
        if (!study.plan().levelLabels().contains(level)) {
            throw new DomainException.BadRequest("Choose one of the study's levels: "
                    + String.join(", ", study.plan().levelLabels()) + ".");
        }
        List<QualificationCsv.HomogeneityRow> rows = read.get();
        Map<String, List<QualificationCsv.HomogeneityRow>> byElement = new TreeMap<>();
        for (QualificationCsv.HomogeneityRow row : rows) {
            if (!study.plan().measurands().contains(row.element())) {
                throw QualificationCsv.error(row.line(), "measurand", row.element() + " is not a measurand of the study");
            }
            byElement.computeIfAbsent(row.element(), e -> new ArrayList<>()).add(row);
        }
        List<Stored> toStore = new ArrayList<>();
        for (Map.Entry<String, List<QualificationCsv.HomogeneityRow>> e : byElement.entrySet()) {
            String unit = study.units().get(e.getKey());
            double target = target(targets == null ? null : targets.get(e.getKey()), e.getKey(), unit);
            double[][] items = items(e.getKey(), e.getValue());
            HomogeneityFigures figures = figures(HomogeneityCheck.evaluate(items, target), target, EXPECTED_REPRODUCIBILITY);
            toStore.add(new Stored(e.getKey(), "HOMOGENEITY", new PlanDocument.QualificationSigma(target, EXPECTED_REPRODUCIBILITY),
                    csvOf(e.getValue()), json(figures), figures.sufficientlyHomogeneous(), level));
        }
        store(roundId, toStore);
        return levelHomogeneity(roundId);
    }

    /** The latest check of every level and measurand of a precision experiment that has one, in plan order. */
    @Transactional
    public List<LevelHomogeneity> levelHomogeneity(long roundId) {
        RoundAccess.PrecisionStudy study = precisionStudy(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT DISTINCT ON (level_label, element) level_label, element, figures_json, uploaded_by, uploaded_at
                  FROM qualification_check WHERE round_id = :r AND kind = 'HOMOGENEITY' AND level_label IS NOT NULL
                 ORDER BY level_label, element, id DESC
                """).setParameter("r", roundId).getResultList();
        Map<String, Object[]> latest = new java.util.HashMap<>();
        rows.forEach(r -> latest.put(r[0] + "|" + r[1], r));
        List<LevelHomogeneity> out = new ArrayList<>();
        for (PrecisionPlan.Level l : study.plan().levels()) {
            for (String element : study.plan().measurands()) {
                Object[] r = latest.get(l.label() + "|" + element);
                if (r != null) {
                    out.add(new LevelHomogeneity(l.label(), l.material(), element, study.units().get(element),
                            study.reportingDigits().getOrDefault(element, 2), read((String) r[2], HomogeneityFigures.class),
                            (String) r[3], Timestamps.utc(r[4])));
                }
            }
        }
        return out;
    }

    private RoundAccess.PrecisionStudy precisionStudy(long roundId) {
        if (!rounds.isPrecisionExperiment(roundId)) {
            throw new DomainException.NotFound("The precision experiment");
        }
        return rounds.precisionStudy(roundId)
                .orElseThrow(() -> new DomainException.Conflict("Freeze the study's plan first: the materials are checked against its levels and measurands."));
    }

    private static double target(String text, String element, String unit) {
        String t = text == null ? "" : text.strip().replace(',', '.');
        try {
            double v = new java.math.BigDecimal(t).doubleValue();
            if (v > 0 && Double.isFinite(v)) {
                return v;
            }
        } catch (NumberFormatException e) {
            // the message below
        }
        throw new DomainException.BadRequest("Give the target SD of " + element + " (the expected s_R at this level, in "
                + unit + "), a number above 0.");
    }

    private static HomogeneityFigures figures(HomogeneityCheck.Result r, double sigma, String source) {
        return new HomogeneityFigures(sigma, source, r.itemCount(),
                r.replicates(), r.grandMean(), r.itemMeansSd(), r.withinItemSd(), r.betweenItemSd(),
                r.betweenItemVariance(), HomogeneityCheck.ALLOWANCE_FACTOR * sigma,
                r.passesSimpleCriterion(), r.f1(), r.f2(), r.allowance(), Math.sqrt(r.allowance()),
                r.passesAllowanceCriterion(), r.sufficientlyHomogeneous(), r.withinToSigmaRatio(),
                r.cochran() == null ? null : r.cochran().statistic(),
                r.cochran() == null ? null : r.cochran().critical5(),
                r.cochran() == null ? null : r.cochran().critical1(),
                r.cochran() == null ? null : r.cochran().verdict().name(),
                r.warnings().stream().map(StatisticsWarning::message).toList());
    }

    // ---- internals -------------------------------------------------------------------------------------

    private record PlannedMeasurand(String element, String unit, PlanDocument.QualificationSigma sigma, boolean consensus,
                                    int digits) {
    }

    private record Stored(String element, String kind, PlanDocument.QualificationSigma sigma, String csv, String figures,
                          boolean passed, String level) {
        Stored(String element, String kind, PlanDocument.QualificationSigma sigma, String csv, String figures,
               boolean passed) {
            this(element, kind, sigma, csv, figures, passed, null);
        }
    }

    private Map<String, PlannedMeasurand> planned(long roundId) {
        Map<String, PlannedMeasurand> planned = plannedOrEmpty(roundId);
        if (planned.isEmpty()) {
            throw new DomainException.Conflict("The round has no frozen evaluation plan.");
        }
        return planned;
    }

    private Map<String, PlannedMeasurand> plannedOrEmpty(long roundId) {
        Map<String, PlannedMeasurand> out = new LinkedHashMap<>();
        Optional<PlanStore.PlanVersion> version = plans.latest(roundId);
        if (version.isEmpty()) {
            return out;
        }
        EvaluationPlan plan = PlanDocument.read(version.get().canonicalJson(), mapper);
        Map<String, String> units = unitsOf(version.get().canonicalJson(), "unit");
        Map<String, String> digits = unitsOf(version.get().canonicalJson(), "reportingDigits");
        for (EvaluationPlan.MeasurandPlan p : plan.measurands()) {
            String unit = units.get(p.element());
            String digitText = digits.get(p.element());
            PlanDocument.QualificationSigma sigma = PlanDocument.qualificationSigma(p, unit)
                    .orElseThrow(() -> new IllegalStateException("frozen plan without qualification sigma"));
            EvaluationPlan.AssignedValueMethod av = EvaluationPlan.AssignedValueMethod.valueOf(p.assignedValueMethod());
            boolean consensus = av != EvaluationPlan.AssignedValueMethod.CERTIFIED_REFERENCE
                    && av != EvaluationPlan.AssignedValueMethod.REFERENCE_LABORATORY;
            out.put(p.element(), new PlannedMeasurand(p.element(), unit, sigma, consensus,
                    digitText == null || digitText.isBlank() ? 2 : Integer.parseInt(digitText)));
        }
        return out;
    }

    /** One field of each measurand of the frozen plan's canonical JSON, by element. */
    private Map<String, String> unitsOf(String canonicalJson, String field) {
        try {
            Map<String, String> units = new LinkedHashMap<>();
            mapper.readTree(canonicalJson).get("measurands")
                    .forEach(n -> units.put(n.get("element").asText(), n.path(field).asText()));
            return units;
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Items as rows of replicates, in item order; checks g ≥ 10 and equal replicate counts ≥ 2. */
    private static double[][] items(String element, List<QualificationCsv.HomogeneityRow> rows) {
        Map<String, TreeMap<Integer, Double>> byItem = new TreeMap<>();
        Map<String, Integer> firstLine = new LinkedHashMap<>();
        for (QualificationCsv.HomogeneityRow row : rows) {
            byItem.computeIfAbsent(row.item(), i -> new TreeMap<>()).put(row.replicate(), row.value());
            firstLine.putIfAbsent(row.item(), row.line());
        }
        if (byItem.size() < HomogeneityCheck.RECOMMENDED_ITEMS) {
            throw QualificationCsv.error(rows.get(0).line(), "item", element + " has " + byItem.size()
                    + " items; the homogeneity check needs at least " + HomogeneityCheck.RECOMMENDED_ITEMS);
        }
        int m = -1;
        double[][] items = new double[byItem.size()][];
        int t = 0;
        for (Map.Entry<String, TreeMap<Integer, Double>> e : byItem.entrySet()) {
            int count = e.getValue().size();
            if (count < 2) {
                throw QualificationCsv.error(firstLine.get(e.getKey()), "replicate", "item " + e.getKey() + " of " + element
                        + " has " + count + " replicate; at least 2 are needed");
            }
            if (m >= 0 && count != m) {
                throw QualificationCsv.error(firstLine.get(e.getKey()), "replicate", "item " + e.getKey() + " of " + element
                        + " has " + count + " replicates, other items " + m + "; every item needs the same number");
            }
            m = count;
            items[t++] = e.getValue().values().stream().mapToDouble(Double::doubleValue).toArray();
        }
        return items;
    }

    private static String csvOf(List<QualificationCsv.HomogeneityRow> rows) {
        StringBuilder data = new StringBuilder("item,replicate,measurand,value\n");
        rows.forEach(r -> data.append(r.item()).append(',').append(r.replicate()).append(',').append(r.element())
                .append(',').append(r.valueText()).append('\n'));
        return data.toString();
    }

    private void store(long roundId, List<Stored> stored) {
        OffsetDateTime now = now();
        for (Stored s : stored) {
            String dataHash = Secrets.sha256Hex(s.csv());
            entityManager.createNativeQuery("""
                    INSERT INTO qualification_check (round_id, element, kind, sigma_pt, sigma_pt_source, data_csv,
                           data_sha256, figures_json, passed, uploaded_by, uploaded_at, level_label)
                    VALUES (:r, :e, :k, :sigma, :source, :csv, :sha, :figures, :passed, :by, :at, CAST(:level AS varchar))
                    """).setParameter("r", roundId).setParameter("level", s.level()).setParameter("e", s.element()).setParameter("k", s.kind())
                    .setParameter("sigma", java.math.BigDecimal.valueOf(s.sigma().value()))
                    .setParameter("source", s.sigma().source())
                    .setParameter("csv", s.csv()).setParameter("sha", dataHash).setParameter("figures", s.figures())
                    .setParameter("passed", s.passed()).setParameter("by", currentUser.actor().name()).setParameter("at", now)
                    .executeUpdate();
            audit.record(new AuditTrail.Event(currentUser.actor(), "qualification." + s.kind().toLowerCase(Locale.ROOT)
                    + "-uploaded", "round", Long.toString(roundId), null, dataHash,
                    "element=" + s.element() + (s.level() == null ? "" : " level=" + s.level()) + " passed=" + s.passed()));
        }
    }

    private Optional<String> latestData(long roundId, String element, String kind) {
        @SuppressWarnings("unchecked")
        List<String> rows = entityManager.createNativeQuery("""
                SELECT data_csv FROM qualification_check WHERE round_id = :r AND element = :e AND kind = :k
                   AND level_label IS NULL ORDER BY id DESC LIMIT 1
                """).setParameter("r", roundId).setParameter("e", element).setParameter("k", kind).getResultList();
        return rows.stream().findFirst();
    }

    private <T> T read(String json, Class<T> type) {
        if (json == null) {
            return null;
        }
        try {
            return mapper.readValue(json, type);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private String json(Object figures) {
        try {
            return mapper.writeValueAsString(figures);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
