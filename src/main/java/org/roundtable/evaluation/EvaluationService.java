package org.roundtable.evaluation;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.hibernate.Session;
import org.roundtable.platform.Timestamps;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.PlanStore;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundState;
import org.roundtable.scheme.qualification.QualificationService;
import org.roundtable.statistics.AssignedValueUncertainty;
import org.roundtable.statistics.MeasurandEvaluation;
import org.roundtable.statistics.StatisticsWarning;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.Median;
import org.roundtable.statistics.robust.QuartileRule;
import org.roundtable.statistics.robust.SortedCopy;
import org.roundtable.statistics.score.BoundaryRule;
import org.roundtable.statistics.score.ScoreKind;
import org.roundtable.statistics.sigma.MassFractionUnit;
import org.roundtable.statistics.sigma.SigmaPt;

import java.math.BigDecimal;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * Evaluates a round: applies the frozen evaluation plan to the laboratories' current results and stores the
 * outcome as a new, immutable, versioned run.
 *
 * <p>Per measurand (element) and item, in one transaction:
 * <ol>
 *   <li>reads every laboratory's current revision set-based, streamed with {@code COPY} one measurand at a time
 *       ({@link RoundEvaluator}, which also writes the outputs with {@code COPY});</li>
 *   <li>excludes late results when the round's late-result policy does not score them (recorded reason);
 *       censored ("less than") results are set aside and classified by {@link MeasurandEvaluation}; results the
 *       coordinator marked as blunders ({@link ExclusionService}, the marks current at run time) are left out of
 *       every statistic (consensus, robust statistics, method groups, n) and still scored against the assigned
 *       value, their score carrying {@code "blunder: <reason>"};</li>
 *   <li>obtains the assigned value as the plan says: {@code CONSENSUS_ALL} — Algorithm A over all results;
 *       {@code CONSENSUS_METHOD_GROUP} / {@code EXPERT_CONSENSUS} — Algorithm A over that subset, whose x* and
 *       u(x_pt) = 1.25·s*&#47;√p are then given to the evaluation of everyone; {@code CERTIFIED_REFERENCE} /
 *       {@code REFERENCE_LABORATORY} — the plan's value and U (converted to k = 2);</li>
 *   <li>obtains σpt as the plan says (fixed, % of x_pt, Horwitz with Thompson's modification, precision data,
 *       or the round's robust SD) and scores with {@link MeasurandEvaluation#evaluate}, the same code the
 *       offline {@code evaluate} command runs, so the numbers are the same;</li>
 *   <li>adds per-method-group statistics and the plan's warnings (below the plan's minimum participants,
 *       method groups further apart than allowed, u(x_pt) too large for z).</li>
 * </ol>
 * The plan's quartile rule (nIQR), Algorithm A stopping rule and boundary rule (classification) are applied and
 * recorded with its exclusion rules in each outcome's {@link EvaluationViews.Rules}. The measurand's latest
 * qualification decision is applied: {@code ADD_HOMOGENEITY_UNCERTAINTY} gives
 * u(x_pt) = sqrt(u_char² + u_hom²) with u_hom = s_s of the latest homogeneity check (a reference value only; the
 * z/z′ choice then uses it), {@code WIDEN_SIGMA_PT} gives σpt' = sqrt(σpt² + s_s²) for a σpt known before the
 * round's data (ISO 13528:2015, clause 7 and Annex B; sub-clauses from memory).
 * {@code ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY} gives u(x_pt) = sqrt(u_char² + u_hom² + u_stab²) with
 * u_stab = |ȳ1 − ȳ2|/√3 of the latest stability check, the observed difference taken as the half-width of a
 * rectangular distribution (ISO 13528:2015 / ISO Guide 35:2017 practice, from memory), again for a reference value
 * only: a consensus is measured on the items as they were during the round.
 * The run stores the SHA-256 of its inputs (plan version and hash, and every result read) and of its outputs,
 * and is audited as one event carrying the outputs hash. A preview (round still open for results) is a run like
 * any other, marked {@code preview}; all of it is for coordinators only.
 */
@ApplicationScoped
public class EvaluationService {

    static final String EXCLUDED_LATE = "late result: the round's late-result policy does not score it";

    private static final ObjectMapper CANONICAL = new ObjectMapper();

    private final EntityManager entityManager;
    private final RoundAccess rounds;
    private final PlanStore plans;
    private final AuditTrail audit;
    private final Clock clock;
    private final String codeVersion;
    private final EvaluationAdjustments adjustments;

    public EvaluationService(EntityManager entityManager, RoundAccess rounds, PlanStore plans, AuditTrail audit,
                             Clock clock,
                             @ConfigProperty(name = "quarkus.application.version", defaultValue = "unknown")
                             String codeVersion, EvaluationAdjustments adjustments) {
        this.entityManager = entityManager;
        this.rounds = rounds;
        this.plans = plans;
        this.audit = audit;
        this.clock = clock;
        this.codeVersion = codeVersion;
        this.adjustments = adjustments;
    }

    /** One result as read from a laboratory's current revision. */
    record Row(long laboratoryId, String participantCode, String element, String itemLabel, String reported,
               BigDecimal value, boolean lessThan, BigDecimal expandedUncertainty, BigDecimal coverageFactor,
               String methodGroup, boolean late) {

        double number() {
            return Double.parseDouble(value.toPlainString());
        }
    }

    /**
     * Runs the evaluation and stores it as the round's next version, then reads the stored run back. For tests and
     * offline use; the server runs evaluations as background jobs ({@link EvaluationJobs}).
     *
     * @param roundId the round
     * @param preview true for a preview on the results so far (round open for results, closed or evaluating);
     *                false for a run on a closed round (CLOSED or EVALUATING)
     * @param actor   who asked, for the run and the audit trail
     * @return the stored run with all outputs
     */
    @Transactional
    public EvaluationViews.Run run(long roundId, boolean preview, Actor actor) {
        EvaluationViews.RunSummary summary = evaluateRound(roundId, preview, actor, (done, total) -> { });
        return run(roundId, summary.version());
    }

    /**
     * Runs the evaluation and stores it as the round's next version, in one transaction: a failure leaves nothing
     * behind. The outputs are streamed to the database ({@link RoundEvaluator}), never all held in memory.
     *
     * @param progress measurands (of one item) evaluated so far, of all; called on this thread
     * @return the stored run without its outputs
     */
    @Transactional
    public EvaluationViews.RunSummary evaluateRound(long roundId, boolean preview, Actor actor,
                                                    RoundEvaluator.Progress progress) {
        entityManager.createNativeQuery("SELECT id FROM round WHERE id = :r FOR UPDATE").setParameter("r", roundId)
                .getResultList();
        RoundState state = checkRunnable(roundId, preview);
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        PlanStore.PlanVersion planVersion = plans.latest(roundId).orElseThrow();
        EvaluationPlan plan = plans.current(roundId).orElseThrow();
        Map<String, String> units = units(roundId);
        boolean lateUnscored = Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED.name().equals(window.latePolicy());
        // measurands withdrawn by a qualification decision are not evaluated; every item of the others is, even
        // without results (then with its warnings and no scores)
        Set<String> open = new HashSet<>();
        rounds.openMeasurands(roundId).forEach(m -> open.add(m.element()));
        List<RoundEvaluator.Planned> planned = plan.measurands().stream().filter(mp -> open.contains(mp.element()))
                .map(mp -> new RoundEvaluator.Planned(mp, units.getOrDefault(mp.element(), ""))).toList();
        Set<String> items = new java.util.TreeSet<>();
        window.itemLabels().stream().map(String::strip).filter(l -> !l.isEmpty()).forEach(items::add);
        // blunders marked now and qualification decisions that change the numbers: appended to the inputs text after
        // the result lines (see EvaluationAdjustments.Loaded.appendTo) and kept with the run, so that an export can
        // rebuild the inputs text; a run without them hashes exactly the text it hashed before they existed
        EvaluationAdjustments.Loaded adjusted = adjustments.load(roundId);
        StringBuilder trailer = new StringBuilder();
        adjusted.appendTo(trailer);
        RoundEvaluator.Context context = new RoundEvaluator.Context(roundId, state.name(), window.latePolicy(),
                planVersion.version(), planVersion.sha256(), planned, items, trailer.toString());
        OffsetDateTime now = OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
        RoundEvaluator.Header header = new RoundEvaluator.Header(preview, codeVersion, actor.name(), now);
        RoundEvaluator.Result result = entityManager.unwrap(Session.class).doReturningWork(connection ->
                RoundEvaluator.run(connection, context, header, measurandStep(lateUnscored, adjusted), progress));
        audit.record(new AuditTrail.Event(actor, preview ? "evaluation.preview" : "evaluation.run", "round",
                Long.toString(roundId), null, result.outputsSha256(), String.format(Locale.ROOT,
                "version %d, plan version %d, inputs %s, %d measurand(s)", result.version(), planVersion.version(),
                result.inputsSha256(), result.measurands())));
        return new EvaluationViews.RunSummary(roundId, result.version(), preview, state.name(), planVersion.version(),
                planVersion.sha256(), result.inputsSha256(), result.outputsSha256(), codeVersion, actor.name(), now);
    }

    /**
     * Refuses a run the round's state or plan does not allow (409), or a round that does not exist (404).
     *
     * @return the round's state
     */
    @Transactional
    public RoundState checkRunnable(long roundId, boolean preview) {
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        RoundState state = RoundState.valueOf(window.state());
        boolean closed = state == RoundState.CLOSED || state == RoundState.EVALUATING;
        if (preview ? !(closed || state == RoundState.OPEN_FOR_RESULTS) : !closed) {
            throw new DomainException.Conflict(preview
                    ? "A preview needs a round open for results, closed or being evaluated; this round is " + state + "."
                    : "An evaluation needs a closed round (or one being evaluated); this round is " + state
                    + ". Ask for a preview instead.");
        }
        if (plans.latest(roundId).isEmpty()) {
            throw new DomainException.Conflict("The round has no frozen evaluation plan.");
        }
        return state;
    }

    /** The evaluation of one measurand of one item, as {@link RoundEvaluator} calls it, without blunders or decisions. */
    public RoundEvaluator.Step measurandStep(boolean lateUnscored) {
        return measurandStep(lateUnscored, EvaluationAdjustments.Loaded.NONE);
    }

    /** The evaluation of one measurand of one item with the round's blunder marks and qualification decisions. */
    public RoundEvaluator.Step measurandStep(boolean lateUnscored, EvaluationAdjustments.Loaded adjusted) {
        return (mp, unit, item, results) -> evaluate(mp, unit, item, results, lateUnscored, adjusted);
    }

    /**
     * The text whose SHA-256 is a run's inputs hash: round, plan version and hash, late-result policy, then one
     * tab-separated line per result read, in the order read. {@link EvaluationExports} rebuilds it to prove that
     * the results it reconstructs for a past run are exactly the ones that run read.
     */
    static String inputsText(long roundId, int planVersion, String planSha256, String latePolicy, List<Row> rows) {
        StringBuilder inputs = new StringBuilder();
        inputs.append("round ").append(roundId).append('\n').append("plan ").append(planVersion).append(' ')
                .append(planSha256).append('\n').append("late-policy ").append(latePolicy).append('\n');
        for (Row r : rows) {
            inputs.append(String.join("\t", Long.toString(r.laboratoryId()), r.participantCode(), r.element(),
                    r.itemLabel(), r.reported(), r.value().toPlainString(), Boolean.toString(r.lessThan()),
                    r.expandedUncertainty() == null ? "" : r.expandedUncertainty().toPlainString(),
                    r.coverageFactor() == null ? "" : r.coverageFactor().toPlainString(), r.methodGroup(),
                    Boolean.toString(r.late()))).append('\n');
        }
        return inputs.toString();
    }

    /** The round's runs, oldest first. */
    @Transactional
    public List<EvaluationViews.RunSummary> runs(long roundId) {
        rounds.window(roundId); // 404 for a round that does not exist
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT round_id, version, preview, round_state, plan_version, plan_sha256, inputs_sha256,
                       outputs_sha256, code_version, created_by, created_at
                  FROM evaluation_run WHERE round_id = :r ORDER BY version
                """).setParameter("r", roundId).getResultList();
        return found.stream().map(EvaluationService::summary).toList();
    }

    /** One run with all its outputs, read back from the stored rows. */
    @Transactional
    public EvaluationViews.Run run(long roundId, int version) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT round_id, version, preview, round_state, plan_version, plan_sha256, inputs_sha256,
                       outputs_sha256, code_version, created_by, created_at, id
                  FROM evaluation_run WHERE round_id = :r AND version = :v
                """).setParameter("r", roundId).setParameter("v", version).getResultList();
        if (found.isEmpty()) {
            throw new DomainException.NotFound("The evaluation run");
        }
        long runId = ((Number) found.get(0)[11]).longValue();
        return new EvaluationViews.Run(summary(found.get(0)), storedOutcomes(runId));
    }

    /** SHA-256 of the outputs' canonical JSON (fields in declaration order, doubles in shortest exact form). */
    public static String outputsSha256(List<EvaluationViews.MeasurandOutcome> outcomes) {
        try {
            return Secrets.sha256Hex(CANONICAL.writeValueAsString(outcomes));
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    /**
     * The round's current results in the offline {@code evaluate} command's CSV format
     * ({@code participant,measurand,unit,value,expanded_uncertainty,coverage_factor,method}); participant is the
     * participant code, measurand the element (with the item label when the round has more than one item).
     */
    @Transactional
    public String exportCsv(long roundId) {
        Map<String, String> units = units(roundId);
        List<Row> rows = currentResults(roundId);
        Set<String> items = new HashSet<>();
        rows.forEach(r -> items.add(r.itemLabel()));
        StringBuilder csv = new StringBuilder("participant,measurand,unit,value,expanded_uncertainty,coverage_factor,method\r\n");
        for (Row r : rows) {
            String measurand = items.size() > 1 ? r.element() + "-" + r.itemLabel() : r.element();
            csv.append(r.participantCode()).append(',').append(measurand).append(',')
                    .append(units.getOrDefault(r.element(), "")).append(',')
                    .append(r.lessThan() ? "<" : "").append(r.value().toPlainString()).append(',')
                    .append(r.expandedUncertainty() == null ? "" : r.expandedUncertainty().toPlainString()).append(',')
                    .append(r.expandedUncertainty() == null || r.coverageFactor() == null ? ""
                            : r.coverageFactor().toPlainString()).append(',')
                    .append(r.methodGroup()).append("\r\n");
        }
        return csv.toString();
    }

    // ---- evaluation of one measurand --------------------------------------------------------------------------

    private EvaluationViews.MeasurandOutcome evaluate(EvaluationPlan.MeasurandPlan mp, String unit, String item,
                                                      List<Row> rows, boolean lateUnscored,
                                                      EvaluationAdjustments.Loaded adjusted) {
        List<Row> used = new ArrayList<>();
        Map<Long, String> excluded = new LinkedHashMap<>();
        // blunders: in `used` (they are scored) but flagged out of every statistic; reason per laboratory
        Map<Long, String> blunders = new LinkedHashMap<>();
        for (Row r : rows) {
            if (r.late() && lateUnscored) {
                excluded.put(r.laboratoryId(), EXCLUDED_LATE);
            } else {
                used.add(r);
                ExclusionService.Current mark = adjusted.exclusionOf(r.laboratoryId(), r.element(), r.itemLabel());
                if (mark != null) {
                    blunders.put(r.laboratoryId(), ExclusionService.BLUNDER + mark.reason());
                }
            }
        }
        List<Row> retained = used.stream().filter(r -> !blunders.containsKey(r.laboratoryId())).toList();
        List<MeasurandEvaluation.ParticipantResult> inputs = used.stream().map(r -> blunders.containsKey(r.laboratoryId())
                ? participant(r).excluded() : participant(r)).toList();
        MeasurandEvaluation.Rules rules = rules(mp);
        String method = mp.assignedValueMethod() == null ? EvaluationPlan.AssignedValueMethod.CONSENSUS_ALL.name()
                : mp.assignedValueMethod();
        String sigmaMethod = mp.sigmaPtMethod() == null ? EvaluationPlan.SigmaPtMethod.FIXED.name() : mp.sigmaPtMethod();
        List<EvaluationViews.Warning> extra = new ArrayList<>();

        Double assigned = null;
        Double assignedU = null;
        Integer subsetN = null;
        // the decimals of a reference value's U and k and of a fixed σpt: the z/z′ choice compares them exactly
        BigDecimal decimalU = null;
        BigDecimal decimalK = null;
        BigDecimal decimalSigma = null;
        switch (EvaluationPlan.AssignedValueMethod.valueOf(method)) {
            case CONSENSUS_ALL -> {
            }
            case CERTIFIED_REFERENCE, REFERENCE_LABORATORY -> {
                assigned = number(mp.referenceValue());
                Double bigU = number(mp.referenceExpandedUncertainty());
                Double k = number(mp.coverageFactor());
                assignedU = bigU == null ? null
                        : k == null ? bigU : bigU / k * MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR;
                decimalU = bigU == null ? null : new BigDecimal(mp.referenceExpandedUncertainty().strip());
                decimalK = k == null ? BigDecimal.valueOf(2) : new BigDecimal(mp.coverageFactor().strip());
            }
            case CONSENSUS_METHOD_GROUP, EXPERT_CONSENSUS -> {
                boolean group = method.equals(EvaluationPlan.AssignedValueMethod.CONSENSUS_METHOD_GROUP.name());
                Set<String> experts = mp.expertLaboratories() == null ? Set.of() : Set.copyOf(mp.expertLaboratories());
                List<MeasurandEvaluation.ParticipantResult> subset = new ArrayList<>();
                for (int i = 0; i < used.size(); i++) {
                    Row r = used.get(i);
                    if (group ? sameGroup(r.methodGroup(), mp.methodGroup())
                            : experts.contains(Long.toString(r.laboratoryId()))) {
                        subset.add(inputs.get(i));
                    }
                }
                MeasurandEvaluation.Result consensus = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(
                        mp.element(), unit, subset, null, null, null, rules, MeasurandEvaluation.Decimals.NONE,
                        forAssignedValueOnly(mp)));
                if (consensus.assignedValueSource() == MeasurandEvaluation.AssignedValueSource.ALGORITHM_A) {
                    assigned = consensus.assignedValue();
                    assignedU = MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR * consensus.assignedValueUncertainty();
                    extra.add(new EvaluationViews.Warning("subset-consensus", String.format(Locale.ROOT,
                            "x_pt is the Algorithm A consensus of %d result(s) of %s, u(x_pt) = 1.25·s*/√p of that"
                            + " subset; their own zeta and En are biased towards zero", consensus.n(),
                            group ? "method group " + mp.methodGroup() : "the expert laboratories")));
                    subsetN = consensus.n();
                } else {
                    extra.add(new EvaluationViews.Warning("no-subset-consensus", "The subset ("
                            + (group ? "method group " + mp.methodGroup() : "expert laboratories") + ", "
                            + subset.size() + " result(s)) gives no consensus value; not scored"));
                }
            }
        }

        Double sigma;
        MeasurandEvaluation.Result result;
        EvaluationPlan.SigmaPtMethod sm = EvaluationPlan.SigmaPtMethod.valueOf(sigmaMethod);
        boolean needsAssigned = sm == EvaluationPlan.SigmaPtMethod.PERCENT_OF_ASSIGNED
                || sm == EvaluationPlan.SigmaPtMethod.HORWITZ_THOMPSON;
        boolean subsetFailed = assigned == null && !method.equals(EvaluationPlan.AssignedValueMethod.CONSENSUS_ALL.name());
        if (needsAssigned) {
            Double x = assigned;
            if (x == null && !subsetFailed) {
                x = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(mp.element(), unit, inputs, null, null,
                        null, rules, MeasurandEvaluation.Decimals.NONE, forAssignedValueOnly(mp))).assignedValue();
            }
            sigma = x == null || !(x > 0) ? null : sm == EvaluationPlan.SigmaPtMethod.PERCENT_OF_ASSIGNED
                    ? SigmaPt.percentOfAssigned(number(mp.sigmaPtPercent()), x)
                    : SigmaPt.thompsonHorwitz(x, massFractionUnit(unit));
        } else {
            sigma = switch (sm) {
                case FIXED, EARLIER_ROUNDS -> {
                    decimalSigma = new BigDecimal(mp.sigmaPt().strip());
                    yield number(mp.sigmaPt());
                }
                case PRECISION_DATA -> SigmaPt.fromPrecision(number(mp.reproducibilitySd()),
                        number(mp.repeatabilitySd()), Integer.parseInt(mp.replicates().strip()));
                default -> null;
            };
        }
        // the qualification decision: u_hom (and u_stab) into u(x_pt) of a reference value, or σpt widened by s_s
        List<String> components = new ArrayList<>(List.of("u_char"));
        boolean widened = false;
        EvaluationAdjustments.Decision decision = adjusted.decisionOf(mp.element());
        if (decision != null && decision.changesNumbers()) {
            double ss = decision.betweenItemSd();
            boolean reference = method.equals(EvaluationPlan.AssignedValueMethod.CERTIFIED_REFERENCE.name())
                    || method.equals(EvaluationPlan.AssignedValueMethod.REFERENCE_LABORATORY.name());
            if (decision.addsStability()) {
                if (reference && assigned != null) {
                    double uChar = assignedU == null ? 0 : assignedU / MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR;
                    double uStab = AssignedValueUncertainty.stabilityFromDifference(decision.stabilityDifference());
                    double combined = AssignedValueUncertainty.combined(uChar, ss, uStab);
                    assignedU = MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR * combined;
                    components.add("u_hom");
                    components.add("u_stab");
                    extra.add(new EvaluationViews.Warning("u-hom-u-stab-added", String.format(Locale.ROOT,
                            "u(x_pt) includes u_hom = s_s = %s %s and u_stab = |ȳ1 − ȳ2|/√3 = %s/√3 = %s %s"
                            + " (qualification decision ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY): u(x_pt) ="
                            + " sqrt(u_char² + u_hom² + u_stab²) = sqrt(%s² + %s² + %s²) = %s (ISO 13528:2015, clause 7"
                            + " and Annex B; ISO Guide 35:2017; from memory)",
                            Double.toString(ss), unit, Double.toString(decision.stabilityDifference()),
                            Double.toString(uStab), unit, Double.toString(uChar), Double.toString(ss),
                            Double.toString(uStab), Double.toString(combined))));
                } else {
                    extra.add(new EvaluationViews.Warning("u-hom-u-stab-not-added", "The qualification decision adds"
                            + " u_hom and u_stab to u(x_pt), but the plan's assigned value is a consensus of the round"
                            + " (measured on the items as they were during the round) or missing: they are not added"));
                }
            } else if (decision.decision().equals(QualificationService.Decision.ADD_HOMOGENEITY_UNCERTAINTY.name())) {
                if (reference && assigned != null) {
                    double uChar = assignedU == null ? 0 : assignedU / MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR;
                    double combined = AssignedValueUncertainty.combined(uChar, ss, 0);
                    assignedU = MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR * combined;
                    components.add("u_hom");
                    extra.add(new EvaluationViews.Warning("u-hom-added", String.format(Locale.ROOT,
                            "u(x_pt) includes u_hom = s_s = %s %s (qualification decision ADD_HOMOGENEITY_UNCERTAINTY):"
                            + " u(x_pt) = sqrt(u_char² + u_hom²) = sqrt(%s² + %s²) = %s (ISO 13528:2015, clause 7)",
                            Double.toString(ss), unit, Double.toString(uChar), Double.toString(ss),
                            Double.toString(combined))));
                } else {
                    extra.add(new EvaluationViews.Warning("u-hom-not-added", "The qualification decision adds u_hom"
                            + " to u(x_pt), but the plan's assigned value is a consensus of the round (its spread"
                            + " already contains the items' inhomogeneity) or missing: u_hom is not added"));
                }
            } else if (sigma != null) {
                double wide = Math.sqrt(sigma * sigma + ss * ss);
                extra.add(new EvaluationViews.Warning("sigma-pt-widened", String.format(Locale.ROOT,
                        "sigma_pt widened by the between-item SD (qualification decision: widen σpt):"
                        + " sqrt(%s² + s_s²) with s_s = %s gives %s %s (ISO 13528:2015, Annex B)",
                        Double.toString(sigma), Double.toString(ss), Double.toString(wide), unit)));
                sigma = wide;
                widened = true;
            } else {
                extra.add(new EvaluationViews.Warning("sigma-pt-not-widened", "The qualification decision widens"
                        + " sigma_pt, but sigma_pt is not known before the round's data (the round's robust SD, which"
                        + " already contains the items' inhomogeneity, or no assigned value to take it from): not"
                        + " widened"));
            }
        }
        // exact decimals only for numbers the plan states as they are used (not changed by a qualification decision)
        boolean sameNumbers = components.size() == 1 && !widened;
        MeasurandEvaluation.Decimals decimals = sameNumbers
                ? new MeasurandEvaluation.Decimals(decimalU, decimalK, decimalSigma) : MeasurandEvaluation.Decimals.NONE;
        if (subsetFailed) {
            // no assigned value from the subset: statistics of all results, but nobody is scored
            result = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(mp.element(), unit, inputs, null, null,
                    sigma, rules, decimals, smallRounds(mp, null)));
        } else {
            result = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(mp.element(), unit, inputs, assigned,
                    assignedU, sigma, rules, decimals, smallRounds(mp, subsetN)));
        }
        if (result.scoreUsed() == ScoreKind.Z_PRIME) {
            extra.add(new EvaluationViews.Warning("uncertainty-of-assigned-value-large",
                    "u(x_pt) > 0.3·sigma_pt: z' is used instead of z (ISO 13528:2015, 9.2.1); " + result.scoreUsedReason()));
        }
        List<EvaluationViews.MethodGroupStatistics> groups = methodGroups(retained, rules);
        Double allowed = number(mp.allowedMethodGroupDifference());
        if (allowed != null) {
            List<Double> centres = groups.stream().map(g -> g.robustMean() != null ? g.robustMean() : g.median())
                    .filter(java.util.Objects::nonNull).toList();
            if (centres.size() > 1) {
                double spread = centres.stream().mapToDouble(Double::doubleValue).max().orElseThrow()
                        - centres.stream().mapToDouble(Double::doubleValue).min().orElseThrow();
                if (spread > allowed) {
                    extra.add(new EvaluationViews.Warning("method-groups-differ", String.format(Locale.ROOT,
                            "The method groups' robust means differ by %s %s, more than the %s the plan allows",
                            Double.toString(spread), unit, Double.toString(allowed))));
                }
            }
        }

        List<EvaluationViews.Warning> warnings = new ArrayList<>();
        for (StatisticsWarning w : result.warnings()) {
            if (subsetFailed && (w.code().equals("zeta-en-biased"))) {
                continue;
            }
            warnings.add(new EvaluationViews.Warning(w.code(), w.message()));
        }
        warnings.addAll(extra);

        List<EvaluationViews.Score> scores = new ArrayList<>();
        for (int i = 0; i < used.size(); i++) {
            Row r = used.get(i);
            MeasurandEvaluation.ParticipantScore s = result.scores().get(i);
            if (subsetFailed) {
                s = new MeasurandEvaluation.ParticipantScore(s.participant(), s.reported(), s.value(), null, null, null,
                        null, null);
            }
            scores.add(new EvaluationViews.Score(r.laboratoryId(), r.participantCode(), r.reported(), r.methodGroup(),
                    s.value(), s.z(), s.zPrime(), s.zeta(), s.en(), s.classification(), blunders.get(r.laboratoryId())));
        }
        for (Row r : rows) {
            if (excluded.containsKey(r.laboratoryId())) {
                scores.add(new EvaluationViews.Score(r.laboratoryId(), r.participantCode(), r.reported(),
                        r.methodGroup(), r.lessThan() ? null : r.number(), null, null, null, null, null,
                        excluded.get(r.laboratoryId())));
            }
        }
        EvaluationViews.Rules applied = new EvaluationViews.Rules(result.quartileRule().name(),
                result.stoppingRule().name(), result.boundaryRule().name(), mp.exclusionRules(),
                decision == null ? null : decision.decision(), List.copyOf(components), widened,
                result.scoreDecimals(), result.coverageFactor(), result.informationOnly(),
                smallRounds(mp, null).minimumParticipants(), smallRounds(mp, null).minimumForDataDerivedSigmaPt());
        return new EvaluationViews.MeasurandOutcome(mp.element(), item, unit, result.n(), result.censored(),
                excluded.size() + blunders.size(), method, subsetFailed ? null : result.assignedValue(),
                subsetFailed ? null : result.assignedValueUncertainty(), result.sigmaPt(), sigmaMethod,
                result.sigmaPtSource() == null ? null : result.sigmaPtSource().name(),
                subsetFailed || result.scoreUsed() == null ? null : result.scoreUsed().jsonName(),
                subsetFailed ? null : result.scoreUsedReason(), result.median(), result.madE(), result.nIqr(),
                result.robustMean(), result.robustSd(), result.iterations(), result.converged(), warnings, groups,
                scores, applied);
    }

    /** The plan's quartile, stopping and boundary rules, score decimals and k of En (defaults where the plan has none). */
    static MeasurandEvaluation.Rules rules(EvaluationPlan.MeasurandPlan mp) {
        return new MeasurandEvaluation.Rules(
                mp.quartileRule() == null ? QuartileRule.DEFAULT : QuartileRule.valueOf(mp.quartileRule()),
                mp.stoppingRule() == null ? AlgorithmA.StoppingRule.FULL_CONVERGENCE
                        : AlgorithmA.StoppingRule.valueOf(mp.stoppingRule()),
                mp.boundaryRule() == null ? BoundaryRule.DEFAULT : BoundaryRule.valueOf(mp.boundaryRule()),
                mp.scoreDecimals() == null ? org.roundtable.platform.NumberFormats.DEFAULT_SCORE_DECIMALS
                        : Integer.parseInt(mp.scoreDecimals().strip()),
                mp.scoreCoverageFactor() == null ? MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR
                        : Double.parseDouble(mp.scoreCoverageFactor().strip()));
    }

    /**
     * The small-round rules for a step that only needs a consensus x_pt (a subset's, or the one a σpt in % of x_pt
     * is taken from): the plan's minimum for a consensus, none for the σpt that step does not use. A consensus
     * below the minimum gives no x_pt, so nothing is scored against it.
     */
    static MeasurandEvaluation.SmallRounds forAssignedValueOnly(EvaluationPlan.MeasurandPlan mp) {
        MeasurandEvaluation.SmallRounds plan = smallRounds(mp, null);
        return new MeasurandEvaluation.SmallRounds(plan.minimumParticipants(), 1, false, null);
    }

    /**
     * The plan's minimums for data-derived values and what happens below them; {@code subsetN} the number of
     * results of a method group's or experts' consensus that gives x_pt (null for an independent value).
     */
    static MeasurandEvaluation.SmallRounds smallRounds(EvaluationPlan.MeasurandPlan mp, Integer subsetN) {
        int minimum = mp.minimumParticipants() == null ? MeasurandEvaluation.MINIMUM_PARTICIPANTS
                : Integer.parseInt(mp.minimumParticipants().strip());
        int sigmaMinimum = mp.minimumForDataDerivedSigmaPt() == null ? MeasurandEvaluation.MINIMUM_PARTICIPANTS
                : Integer.parseInt(mp.minimumForDataDerivedSigmaPt().strip());
        boolean informationOnly = EvaluationPlan.BelowMinimum.INFORMATION_ONLY.name().equals(mp.belowMinimum());
        return new MeasurandEvaluation.SmallRounds(minimum, sigmaMinimum, informationOnly, subsetN);
    }

    private static MeasurandEvaluation.ParticipantResult participant(Row r) {
        Double u = r.expandedUncertainty() == null ? null : Double.parseDouble(r.expandedUncertainty().toPlainString());
        Double k = u == null || r.coverageFactor() == null ? null
                : Double.parseDouble(r.coverageFactor().toPlainString());
        return new MeasurandEvaluation.ParticipantResult(r.participantCode(),
                r.lessThan() ? "<" + r.value().toPlainString() : r.value().toPlainString(), r.number(), r.lessThan(),
                u, k, r.methodGroup());
    }

    /**
     * n, median and Algorithm A (by the plan's stopping rule) per method group (censored results left out; the
     * caller leaves out blunders), groups in name order.
     */
    static List<EvaluationViews.MethodGroupStatistics> methodGroups(List<Row> rows, MeasurandEvaluation.Rules rules) {
        Map<String, List<Double>> byGroup = new TreeMap<>();
        for (Row r : rows) {
            if (!r.lessThan()) {
                byGroup.computeIfAbsent(r.methodGroup(), g -> new ArrayList<>()).add(r.number());
            }
        }
        List<EvaluationViews.MethodGroupStatistics> groups = new ArrayList<>();
        byGroup.forEach((group, values) -> {
            double[] sorted = SortedCopy.of(values.stream().mapToDouble(Double::doubleValue).toArray());
            Double mean = null;
            Double sd = null;
            if (sorted.length >= 2) {
                AlgorithmA.Result a = rules.algorithmA().evaluateSorted(sorted);
                if (a.scaleEstimable()) {
                    mean = a.robustMean();
                    sd = a.robustSd();
                }
            }
            groups.add(new EvaluationViews.MethodGroupStatistics(group, sorted.length, Median.ofSorted(sorted), mean, sd));
        });
        return groups;
    }

    /** A reported method code ({@code spark-oes}) against the plan's group name ({@code SPARK_OES}). */
    static boolean sameGroup(String reportedCode, String planGroup) {
        return planGroup != null && reportedCode.strip().replace('-', '_').equalsIgnoreCase(planGroup.strip());
    }

    private static MassFractionUnit massFractionUnit(String unit) {
        return switch (unit.strip()) {
            case "%" -> MassFractionUnit.PERCENT;
            case "mg/kg" -> MassFractionUnit.MILLIGRAMS_PER_KILOGRAM;
            case "g/kg" -> MassFractionUnit.GRAMS_PER_KILOGRAM;
            default -> throw new DomainException.Conflict("Horwitz sigma_pt needs a mass fraction unit, not " + unit + ".");
        };
    }

    private static Double number(String text) {
        return text == null || text.isBlank() ? null : Double.parseDouble(text.strip());
    }

    // ---- reading and storing ----------------------------------------------------------------------------------

    /** The reporting digits (decimals) of each measurand of the round's scheme, by element. */
    @Transactional
    public Map<String, Integer> reportingDigits(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("SELECT m.element, m.reporting_digits FROM measurand m"
                + " JOIN round r ON r.scheme_id = m.scheme_id WHERE r.id = :r").setParameter("r", roundId).getResultList();
        Map<String, Integer> digits = new HashMap<>();
        found.forEach(f -> digits.put((String) f[0], ((Number) f[1]).intValue()));
        return digits;
    }

    private Map<String, String> units(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery(
                "SELECT m.element, m.unit FROM measurand m JOIN round r ON r.scheme_id = m.scheme_id WHERE r.id = :r")
                .setParameter("r", roundId).getResultList();
        Map<String, String> units = new HashMap<>();
        found.forEach(f -> units.put((String) f[0], (String) f[1]));
        return units;
    }

    /** Every laboratory's current revision's results, in element, item, participant code order (one query). */
    List<Row> currentResults(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT s.laboratory_id, rp.participant_code, rr.element, rr.item_label, rr.value_as_reported,
                       rr.value_in_measurand_unit, rr.less_than, rr.expanded_uncertainty, rr.coverage_factor,
                       rr.method_group, sr.late
                  FROM submission s
                  JOIN submission_revision sr ON sr.submission_id = s.id AND sr.revision = s.current_revision
                  JOIN reported_result rr ON rr.revision_id = sr.id
                  JOIN round_participant rp ON rp.round_id = s.round_id AND rp.laboratory_id = s.laboratory_id
                 WHERE s.round_id = :r
                 ORDER BY rr.element, rr.item_label, rp.participant_code
                """).setParameter("r", roundId).getResultList();
        return found.stream().map(f -> new Row(((Number) f[0]).longValue(), (String) f[1], (String) f[2],
                (String) f[3], (String) f[4], decimal(f[5]), (Boolean) f[6], decimal(f[7]), decimal(f[8]),
                (String) f[9], (Boolean) f[10])).toList();
    }

    private static BigDecimal decimal(Object value) {
        return value == null ? null : value instanceof BigDecimal b ? b : new BigDecimal(value.toString());
    }

    private List<EvaluationViews.MeasurandOutcome> storedOutcomes(long runId) {
        @SuppressWarnings("unchecked")
        List<Object[]> scoreRows = entityManager.createNativeQuery("""
                SELECT element, item_label, laboratory_id, participant_code, reported, method_group, value, z, z_prime,
                       zeta, en, classification, excluded_reason
                  FROM participant_score WHERE run_id = :run ORDER BY element, item_label, position
                """).setParameter("run", runId).getResultList();
        Map<String, List<Object[]>> scoresOf = new HashMap<>();
        scoreRows.forEach(s -> scoresOf.computeIfAbsent(s[0] + "\u0000" + s[1], k -> new ArrayList<>()).add(s));
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT element, item_label, unit, n, censored, excluded, assigned_value_method, assigned_value,
                       assigned_value_uncertainty, sigma_pt, sigma_pt_method, sigma_pt_source, score_used,
                       score_used_reason, median, made, niqr, robust_mean, robust_sd, iterations, converged,
                       warnings_json, method_groups_json, rules_json
                  FROM measurand_evaluation WHERE run_id = :run ORDER BY position
                """).setParameter("run", runId).getResultList();
        // the order as computed: measurands in plan order then item, participants as scored
        List<EvaluationViews.MeasurandOutcome> outcomes = new ArrayList<>();
        for (Object[] f : found) {
            List<EvaluationViews.Score> scores = new ArrayList<>();
            for (Object[] s : scoresOf.getOrDefault(f[0] + "\u0000" + f[1], List.of())) {
                scores.add(new EvaluationViews.Score(((Number) s[2]).longValue(), (String) s[3], (String) s[4],
                        (String) s[5], dbl(s[6]), dbl(s[7]), dbl(s[8]), dbl(s[9]), dbl(s[10]), (String) s[11],
                        (String) s[12]));
            }
            try {
                outcomes.add(new EvaluationViews.MeasurandOutcome((String) f[0], (String) f[1], (String) f[2],
                        ((Number) f[3]).intValue(), ((Number) f[4]).intValue(), ((Number) f[5]).intValue(),
                        (String) f[6], dbl(f[7]), dbl(f[8]), dbl(f[9]), (String) f[10], (String) f[11],
                        (String) f[12], (String) f[13], dbl(f[14]), dbl(f[15]), dbl(f[16]), dbl(f[17]), dbl(f[18]),
                        f[19] == null ? null : ((Number) f[19]).intValue(), (Boolean) f[20],
                        CANONICAL.readValue((String) f[21], new TypeReference<List<EvaluationViews.Warning>>() { }),
                        CANONICAL.readValue((String) f[22],
                                new TypeReference<List<EvaluationViews.MethodGroupStatistics>>() { }),
                        scores, f[23] == null ? null : CANONICAL.readValue((String) f[23], EvaluationViews.Rules.class)));
            } catch (JsonProcessingException e) {
                throw new IllegalStateException(e);
            }
        }
        return outcomes;
    }

    private static Double dbl(Object value) {
        return value == null ? null : ((Number) value).doubleValue();
    }

    private static EvaluationViews.RunSummary summary(Object[] r) {
        return new EvaluationViews.RunSummary(((Number) r[0]).longValue(), ((Number) r[1]).intValue(), (Boolean) r[2],
                (String) r[3], ((Number) r[4]).intValue(), r[5].toString(), r[6].toString(), r[7].toString(),
                (String) r[8], (String) r[9], Timestamps.utc(r[10]));
    }
}
