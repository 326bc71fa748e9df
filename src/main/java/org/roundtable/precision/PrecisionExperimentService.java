package org.roundtable.precision;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeMap;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.platform.Timestamps;
import org.roundtable.scheme.PrecisionPlan;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundService;
import org.roundtable.scheme.RoundState;
import org.roundtable.submission.SubmissionQueries;

/**
 * Precision experiments (ISO 5725-2) for coordinators: creating one with its plan, the data by participant code,
 * exclusion decisions with reasons (append-only, table {@code precision_exclusion}; never automatic) and evaluation
 * runs (append-only, numbered, table {@code precision_evaluation_run}). The round's lifecycle, enrolment, dispatch and
 * submissions are the shared ones; the first evaluation takes the round from closed to being evaluated.
 */
@ApplicationScoped
public class PrecisionExperimentService {

    /** Longest reason accepted. */
    public static final int MAX_REASON = 500;

    private static final Set<RoundState> OPEN_TO_DECISIONS = Set.of(RoundState.CLOSED, RoundState.EVALUATING);

    private final RoundService roundService;
    private final org.roundtable.account.CurrentUser currentUser;
    private final RoundAccess rounds;
    private final SubmissionQueries submissions;
    private final EntityManager entityManager;
    private final AuditTrail audit;
    private final ObjectMapper mapper;
    private final Clock clock;

    public PrecisionExperimentService(RoundService roundService, RoundAccess rounds, SubmissionQueries submissions,
                                      EntityManager entityManager, AuditTrail audit, ObjectMapper mapper, Clock clock,
                                      org.roundtable.account.CurrentUser currentUser) {
        this.roundService = roundService;
        this.currentUser = currentUser;
        this.rounds = rounds;
        this.submissions = submissions;
        this.entityManager = entityManager;
        this.audit = audit;
        this.mapper = mapper;
        this.clock = clock;
    }

    /** {@code {round: {...round details...}, plan: {...}}}. */
    public record CreateRequest(RoundService.RoundDetails round, PrecisionPlan plan) {
    }

    /** {@code {participantCode, measurand, level, reason}}. */
    public record ExclusionRequest(String participantCode, String measurand, String level, String reason) {
    }

    /** {@code {reason}}. */
    public record WithdrawalRequest(String reason) {
    }

    /** An exclusion decision, with its withdrawal when withdrawn. */
    public record Exclusion(long id, String participantCode, String measurand, String level, String reason,
                            String decidedBy, OffsetDateTime decidedAt, Long withdrawalId, String withdrawalReason,
                            OffsetDateTime withdrawnAt) {
        public boolean current() {
            return withdrawalId == null;
        }
    }

    /** One replicate as reported, under the laboratory's participant code. */
    public record DataRow(String participantCode, String measurand, String level, int replicate, String valueAsReported,
                          String unit, double value) {
    }

    /** A stored evaluation run. */
    public record Run(long id, int runNumber, int planVersion, String inputsSha256, String createdBy,
                      OffsetDateTime createdAt, PrecisionCalculation.Study study) {
    }

    /** The study as the coordinator's overview shows it. */
    public record StudyView(long roundId, String roundCode, String state, Integer planVersion, String planSha256,
                            PrecisionPlan plan, Map<String, String> units, int enrolled, int submitted,
                            Integer latestRun) {
    }

    // ---- creating and planning ------------------------------------------------------------------------------

    public RoundService.RoundView create(CreateRequest request) {
        if (request == null) {
            throw new DomainException.BadRequest("Send the round details and the plan.");
        }
        return roundService.createPrecisionExperiment(request.round(), request.plan());
    }

    public RoundService.RoundView savePlan(long roundId, PrecisionPlan plan) {
        return roundService.savePrecisionDraftPlan(roundId, plan);
    }

    /** The study with its frozen plan (or draft plan before freezing). */
    @Transactional
    public StudyView view(long roundId) {
        if (!rounds.isPrecisionExperiment(roundId)) {
            throw new DomainException.NotFound("The precision experiment");
        }
        RoundService.RoundView round = roundService.get(roundId);
        Optional<RoundAccess.PrecisionStudy> study = rounds.precisionStudy(roundId);
        PrecisionPlan plan = study.map(RoundAccess.PrecisionStudy::plan)
                .orElseGet(() -> round.draftPlan() == null ? null : PrecisionPlan.read(round.draftPlan(), mapper));
        int enrolled = rounds.participantCodes(roundId).size();
        int submitted = (int) submissions.currentReplicates(roundId).stream().mapToLong(SubmissionQueries.ReplicateRow::laboratoryId)
                .distinct().count();
        return new StudyView(roundId, round.code(), round.state(), study.map(RoundAccess.PrecisionStudy::planVersion).orElse(null),
                study.map(RoundAccess.PrecisionStudy::planSha256).orElse(null), plan,
                study.map(RoundAccess.PrecisionStudy::units).orElse(Map.of()), enrolled, submitted,
                latestRun(roundId).map(Run::runNumber).orElse(null));
    }

    /** Every precision experiment, newest first. */
    @Transactional
    public List<StudyView> list() {
        return rounds.precisionExperimentIds().stream().map(this::view).toList();
    }

    // ---- data ---------------------------------------------------------------------------------------------

    /** Every laboratory's current replicates, under participant codes, ordered by code, measurand, level, replicate. */
    @Transactional
    public List<DataRow> data(long roundId) {
        study(roundId);
        Map<Long, String> codes = rounds.participantCodes(roundId);
        List<DataRow> rows = new ArrayList<>();
        for (SubmissionQueries.ReplicateRow r : submissions.currentReplicates(roundId)) {
            rows.add(new DataRow(codes.getOrDefault(r.laboratoryId(), "?"), r.element(), r.level(), r.replicate(),
                    r.valueAsReported(), r.unitAsReported(), r.value().doubleValue()));
        }
        rows.sort(java.util.Comparator.comparing(DataRow::participantCode).thenComparing(DataRow::measurand)
                .thenComparing(DataRow::level).thenComparingInt(DataRow::replicate));
        return rows;
    }

    // ---- exclusion decisions --------------------------------------------------------------------------------

    /** Records the decision to exclude a laboratory's cell from the precision values, with a reason. */
    @Transactional
    public Exclusion exclude(long roundId, ExclusionRequest request, Actor actor) {
        RoundAccess.PrecisionStudy study = study(roundId);
        requireOpenToDecisions(roundId);
        if (request == null) {
            throw new DomainException.BadRequest("Name the participant code, measurand, level and the reason.");
        }
        String reason = reason(request.reason());
        String code = request.participantCode() == null ? "" : request.participantCode().strip();
        Long laboratoryId = rounds.participantCodes(roundId).entrySet().stream().filter(e -> e.getValue().equals(code))
                .map(Map.Entry::getKey).findFirst()
                .orElseThrow(() -> new DomainException.BadRequest("No laboratory has the participant code '" + code + "' in this study."));
        String measurand = request.measurand() == null ? "" : request.measurand().strip();
        String level = request.level() == null ? "" : request.level().strip();
        if (!study.plan().measurands().contains(measurand) || !study.plan().levelLabels().contains(level)) {
            throw new DomainException.BadRequest("The study has the measurands " + study.plan().measurands()
                    + " and the levels " + study.plan().levelLabels() + ".");
        }
        boolean reported = submissions.currentReplicates(roundId).stream().anyMatch(r -> r.laboratoryId() == laboratoryId
                && r.element().equals(measurand) && r.level().equals(level));
        if (!reported) {
            throw new DomainException.Conflict("Participant " + code + " reported no results for " + measurand + " at level " + level + ".");
        }
        if (currentExclusions(roundId).stream().anyMatch(e -> e.participantCode().equals(code)
                && e.measurand().equals(measurand) && e.level().equals(level))) {
            throw new DomainException.Conflict("That cell is excluded already; withdraw the decision first to change its reason.");
        }
        Number id = (Number) entityManager.createNativeQuery("""
                INSERT INTO precision_exclusion (round_id, action, laboratory_id, element, level_label, reason, recorded_by,
                       recorded_at) VALUES (:r, 'MARK', :l, :e, :level, :reason, :by, :at) RETURNING id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("e", measurand)
                .setParameter("level", level).setParameter("reason", reason).setParameter("by", actor.name())
                .setParameter("at", now()).getSingleResult();
        audit.record(new AuditTrail.Event(actor, "precision.cell-excluded", "precision_exclusion", id.toString(), null,
                Secrets.sha256Hex(code + "|" + measurand + "|" + level + "|" + reason),
                "round=" + roundId + " code=" + code + " measurand=" + measurand + " level=" + level + " reason=" + reason));
        return exclusions(roundId).stream().filter(e -> e.id() == id.longValue()).findFirst().orElseThrow();
    }

    /** Withdraws an exclusion decision, with its own reason; the cell counts again from the next run. */
    @Transactional
    public Exclusion withdraw(long roundId, long exclusionId, WithdrawalRequest request, Actor actor) {
        study(roundId);
        requireOpenToDecisions(roundId);
        String reason = reason(request == null ? null : request.reason());
        Exclusion mark = exclusions(roundId).stream().filter(e -> e.id() == exclusionId).findFirst()
                .orElseThrow(() -> new DomainException.NotFound("The exclusion decision"));
        if (!mark.current()) {
            throw new DomainException.Conflict("That decision has been withdrawn already.");
        }
        Object laboratoryId = entityManager.createNativeQuery("SELECT laboratory_id FROM precision_exclusion WHERE id = :id")
                .setParameter("id", exclusionId).getSingleResult();
        Number id = (Number) entityManager.createNativeQuery("""
                INSERT INTO precision_exclusion (round_id, action, laboratory_id, element, level_label, withdraws, reason,
                       recorded_by, recorded_at) VALUES (:r, 'WITHDRAW', :l, :e, :level, :w, :reason, :by, :at) RETURNING id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("e", mark.measurand())
                .setParameter("level", mark.level()).setParameter("w", exclusionId).setParameter("reason", reason)
                .setParameter("by", actor.name()).setParameter("at", now()).getSingleResult();
        audit.record(new AuditTrail.Event(actor, "precision.exclusion-withdrawn", "precision_exclusion", id.toString(),
                null, Secrets.sha256Hex(exclusionId + "|" + reason), "round=" + roundId + " withdraws=" + exclusionId
                + " reason=" + reason));
        return exclusions(roundId).stream().filter(e -> e.id() == exclusionId).findFirst().orElseThrow();
    }

    /** Every decision of the study, oldest first, each with its withdrawal if any. */
    @Transactional
    public List<Exclusion> exclusions(long roundId) {
        study(roundId);
        Map<Long, String> codes = rounds.participantCodes(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT m.id, m.laboratory_id, m.element, m.level_label, m.reason, m.recorded_by, m.recorded_at,
                       w.id, w.reason, w.recorded_at
                  FROM precision_exclusion m LEFT JOIN precision_exclusion w ON w.withdraws = m.id
                 WHERE m.round_id = :r AND m.action = 'MARK' ORDER BY m.id
                """).setParameter("r", roundId).getResultList();
        return rows.stream().map(r -> new Exclusion(((Number) r[0]).longValue(),
                codes.getOrDefault(((Number) r[1]).longValue(), "?"), (String) r[2], (String) r[3], (String) r[4],
                (String) r[5], Timestamps.utc(r[6]), r[7] == null ? null : ((Number) r[7]).longValue(), (String) r[8],
                r[9] == null ? null : Timestamps.utc(r[9]))).toList();
    }

    private List<Exclusion> currentExclusions(long roundId) {
        return exclusions(roundId).stream().filter(Exclusion::current).toList();
    }

    // ---- evaluation runs ------------------------------------------------------------------------------------

    /**
     * Evaluates the study from the current revisions and the current exclusion decisions and stores the run. The
     * first run takes the round from closed to being evaluated. Refused before the round closes and once a final
     * report is issued.
     */
    @Transactional
    public Run evaluate(long roundId, Actor actor) {
        RoundAccess.PrecisionStudy study = study(roundId);
        RoundState state = roundService.lockState(roundId);
        if (state == RoundState.CLOSED) {
            roundService.takeReportStep(roundId, RoundAction.START_EVALUATION, actor, "precision experiment");
        } else if (state != RoundState.EVALUATING) {
            throw new DomainException.Conflict("A precision experiment is evaluated after it closes and before its"
                    + " draft report is issued; it is " + state.name().toLowerCase(java.util.Locale.ROOT).replace('_', ' ') + ".");
        }
        Inputs inputs = inputs(roundId, study);
        PrecisionCalculation.Study result = PrecisionCalculation.evaluate(inputs.design(), inputs.cells(), inputs.exclusions());
        int next = latestRun(roundId).map(Run::runNumber).orElse(0) + 1;
        String json = write(result);
        OffsetDateTime now = now();
        Number id = (Number) entityManager.createNativeQuery("""
                INSERT INTO precision_evaluation_run (round_id, run_number, plan_version, inputs_sha256, result_json,
                       created_by, created_at) VALUES (:r, :n, :v, :sha, :json, :by, :at) RETURNING id
                """).setParameter("r", roundId).setParameter("n", next).setParameter("v", study.planVersion())
                .setParameter("sha", inputs.sha256()).setParameter("json", json).setParameter("by", actor.name())
                .setParameter("at", now).getSingleResult();
        audit.record(new AuditTrail.Event(actor, "precision.evaluated", "precision_evaluation_run", id.toString(), null,
                Secrets.sha256Hex(json), "round=" + roundId + " run=" + next + " inputs=" + inputs.sha256()
                + " exclusions=" + inputs.exclusions().size()));
        return new Run(id.longValue(), next, study.planVersion(), inputs.sha256(), actor.name(), now, result);
    }

    /** The latest run, if any. */
    @Transactional
    public Optional<Run> latestRun(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, run_number, plan_version, inputs_sha256, created_by, created_at, result_json
                  FROM precision_evaluation_run WHERE round_id = :r ORDER BY run_number DESC LIMIT 1
                """).setParameter("r", roundId).getResultList();
        return rows.stream().findFirst().map(this::run);
    }

    /** A run by its row id (for the report). */
    @Transactional
    public Optional<Run> run(long roundId, long runId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, run_number, plan_version, inputs_sha256, created_by, created_at, result_json
                  FROM precision_evaluation_run WHERE round_id = :r AND id = :id
                """).setParameter("r", roundId).setParameter("id", runId).getResultList();
        return rows.stream().findFirst().map(this::run);
    }

    /** Whether the current inputs (revisions, decisions, plan) are those the latest run was computed from. */
    @Transactional
    public boolean latestRunIsCurrent(long roundId) {
        RoundAccess.PrecisionStudy study = study(roundId);
        return latestRun(roundId).map(r -> r.inputsSha256().equals(inputs(roundId, study).sha256())).orElse(false);
    }

    private Run run(Object[] r) {
        try {
            return new Run(((Number) r[0]).longValue(), ((Number) r[1]).intValue(), ((Number) r[2]).intValue(),
                    r[3].toString().strip(), (String) r[4], Timestamps.utc(r[5]),
                    mapper.readValue((String) r[6], PrecisionCalculation.Study.class));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("stored precision run unreadable", e);
        }
    }

    record Inputs(PrecisionCalculation.Design design, List<PrecisionCalculation.Cell> cells,
                  List<PrecisionCalculation.Exclusion> exclusions, String sha256) {
    }

    private Inputs inputs(long roundId, RoundAccess.PrecisionStudy study) {
        Map<Long, String> codes = rounds.participantCodes(roundId);
        Map<String, List<Double>> values = new TreeMap<>();
        StringBuilder hashed = new StringBuilder("plan=" + study.planSha256() + "\n");
        for (SubmissionQueries.ReplicateRow r : submissions.currentReplicates(roundId)) {
            String code = codes.getOrDefault(r.laboratoryId(), "?");
            values.computeIfAbsent(code + "\u0000" + r.level() + "\u0000" + r.element(), k -> new ArrayList<>())
                    .add(r.value().doubleValue());
            hashed.append(code).append('|').append(r.element()).append('|').append(r.level()).append('|')
                    .append(r.replicate()).append('|').append(r.value().stripTrailingZeros().toPlainString()).append('\n');
        }
        List<PrecisionCalculation.Cell> cells = new ArrayList<>();
        values.forEach((key, v) -> {
            String[] k = key.split("\u0000");
            cells.add(new PrecisionCalculation.Cell(k[0], k[1], k[2], v.stream().mapToDouble(Double::doubleValue).toArray()));
        });
        List<PrecisionCalculation.Exclusion> exclusions = new ArrayList<>();
        for (Exclusion e : currentExclusions(roundId)) {
            exclusions.add(new PrecisionCalculation.Exclusion(e.participantCode(), e.level(), e.measurand(), e.reason()));
            hashed.append("excluded ").append(e.id()).append('|').append(e.participantCode()).append('|')
                    .append(e.measurand()).append('|').append(e.level()).append('\n');
        }
        PrecisionPlan plan = study.plan();
        Map<String, String> materials = new LinkedHashMap<>();
        plan.levels().forEach(l -> materials.put(l.label(), l.material()));
        PrecisionCalculation.Design design = new PrecisionCalculation.Design(plan.levelLabels(), materials,
                new LinkedHashMap<>(study.units()), plan.replicates(), plan.alphaStraggler(), plan.alphaOutlier(),
                plan.fitRelationship());
        return new Inputs(design, cells, exclusions, Secrets.sha256Hex(hashed.toString()));
    }

    // ---- feeding a proficiency round's σpt ------------------------------------------------------------------

    /**
     * The precision values of a published study, in the fields of a proficiency round's plan for the σpt method
     * {@code PRECISION_DATA} (decimal strings in the measurand's unit): at a level of the study, or, with
     * {@code atLevel} null and a value {@code m}, from the study's fitted relationships at m.
     */
    public record PrecisionData(String sourceStudy, String reportId, String measurand, String unit, String basis,
                                String sigmaPtMethod, String reproducibilitySd, String repeatabilitySd) {
    }

    /** Only from a study whose final report is issued (409 before). */
    @Transactional
    public PrecisionData precisionData(long roundId, String measurand, String atLevel, String m) {
        RoundAccess.PrecisionStudy study = study(roundId);
        if (!Set.of("FINAL_ISSUED", "AMENDED", "ARCHIVED").contains(study.state())) {
            throw new DomainException.Conflict("Precision values are taken from a study whose final report is issued.");
        }
        String reportId = study.roundCode() + "-PRECISION";
        Run run = latestRun(roundId).orElseThrow(() -> new DomainException.Conflict("The study has no evaluation run."));
        PrecisionCalculation.MeasurandResult result = run.study().measurands().stream()
                .filter(x -> x.measurand().equals(measurand)).findFirst()
                .orElseThrow(() -> new DomainException.BadRequest("The study has no measurand '" + measurand + "'."));
        int digits = study.reportingDigits().getOrDefault(measurand, 4) + 2;
        if (atLevel != null && !atLevel.isBlank()) {
            PrecisionCalculation.LevelResult level = result.levels().stream().filter(l -> l.level().equals(atLevel.strip()))
                    .findFirst().orElseThrow(() -> new DomainException.BadRequest("The study has no level '" + atLevel + "'."));
            return new PrecisionData(study.roundCode(), reportId, measurand, result.unit(), "level " + level.level()
                    + " (m = " + org.roundtable.platform.NumberFormats.plain(level.generalMean(), digits) + ")",
                    "PRECISION_DATA", org.roundtable.platform.NumberFormats.plain(level.reproducibilitySd(), digits),
                    org.roundtable.platform.NumberFormats.plain(level.repeatabilitySd(), digits));
        }
        double at;
        try {
            at = Double.parseDouble(m == null ? "" : m.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("Give a level of the study, or a value m for the fitted relationships.");
        }
        PrecisionCalculation.FitResult r = PrecisionReportDocument.best(result.repeatabilityFits());
        PrecisionCalculation.FitResult bigR = PrecisionReportDocument.best(result.reproducibilityFits());
        if (r == null || bigR == null) {
            throw new DomainException.Conflict("The study fitted no precision–level relationship; choose one of its levels.");
        }
        double lo = result.levels().stream().mapToDouble(PrecisionCalculation.LevelResult::generalMean).min().orElse(0);
        double hi = result.levels().stream().mapToDouble(PrecisionCalculation.LevelResult::generalMean).max().orElse(0);
        if (at < lo || at > hi) {
            throw new DomainException.BadRequest("m lies outside the levels studied; the relationships hold between them only.");
        }
        return new PrecisionData(study.roundCode(), reportId, measurand, result.unit(), "fitted at m = " + m.strip(),
                "PRECISION_DATA", org.roundtable.platform.NumberFormats.plain(PrecisionReportDocument.predict(bigR, at), digits),
                org.roundtable.platform.NumberFormats.plain(PrecisionReportDocument.predict(r, at), digits));
    }

    // ---- internals ------------------------------------------------------------------------------------------

    /** The study with its frozen plan; 404 for another kind of round or a missing one, 409 before freezing. */
    RoundAccess.PrecisionStudy study(long roundId) {
        if (!rounds.isPrecisionExperiment(roundId)) {
            throw new DomainException.NotFound("The precision experiment");
        }
        return rounds.precisionStudy(roundId)
                .orElseThrow(() -> new DomainException.Conflict("The precision experiment's plan is not frozen yet."));
    }

    /**
     * The calling laboratory must be enrolled in the precision experiment; otherwise the same 404 as for a study
     * that does not exist (no existence oracle).
     */
    @Transactional
    public void requireEnrolled(long roundId) {
        Long lab = currentUser.laboratoryId().orElse(null);
        if (!rounds.isPrecisionExperiment(roundId) || lab == null || rounds.participantCode(roundId, lab).isEmpty()) {
            throw new DomainException.NotFound("The precision experiment");
        }
    }

    private void requireOpenToDecisions(long roundId) {
        RoundState state = roundService.lockState(roundId);
        if (!OPEN_TO_DECISIONS.contains(state)) {
            throw new DomainException.Conflict("Exclusion decisions are taken after the study closes and before its draft"
                    + " report is issued; it is " + state.name().toLowerCase(java.util.Locale.ROOT).replace('_', ' ') + ".");
        }
    }

    private static String reason(String text) {
        String reason = text == null ? "" : text.strip();
        if (reason.isEmpty() || reason.length() > MAX_REASON) {
            throw new DomainException.BadRequest("Give the reason (1 to " + MAX_REASON + " characters).");
        }
        return reason;
    }

    private String write(Object value) {
        try {
            return mapper.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
