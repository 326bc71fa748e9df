package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.LockModeType;
import jakarta.transaction.Transactional;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.qualification.QualificationService;

import java.math.BigDecimal;
import java.time.OffsetDateTime;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * What other features (submissions, evaluation) may know of a round, without reaching into its entities: the
 * submission window under a shared row lock, the measurands open for results, and participant codes.
 */
@ApplicationScoped
public class RoundAccess {

    private final EntityManager entityManager;
    private final PlanStore plans;
    private final SchemeService schemes;
    private final QualificationService qualification;

    private final PrecisionPlanStore precisionPlans;

    public RoundAccess(EntityManager entityManager, PlanStore plans, SchemeService schemes,
                       QualificationService qualification, PrecisionPlanStore precisionPlans) {
        this.entityManager = entityManager;
        this.precisionPlans = precisionPlans;
        this.plans = plans;
        this.schemes = schemes;
        this.qualification = qualification;
    }

    /** The part of a round that decides whether results may be written now. */
    public record SubmissionWindow(long roundId, String roundCode, String state, OffsetDateTime resultDeadline,
                                   String deadlineTimeZone, String latePolicy, List<String> itemLabels) {
        public boolean openForResults() {
            return RoundState.OPEN_FOR_RESULTS.name().equals(state);
        }

        /** Closed for laboratories but before any report: the window for a coordinator's correction. */
        public boolean closedBeforeIssue() {
            return RoundState.CLOSED.name().equals(state) || RoundState.EVALUATING.name().equals(state);
        }

        /** How a result arriving at {@code at} is treated under the round's state and late-result policy. */
        public ResultTiming timingAt(java.time.Instant at) {
            return ResultTiming.of(RoundState.valueOf(state), resultDeadline.toInstant(), Round.LatePolicy.valueOf(latePolicy), at);
        }
    }

    /**
     * A precision experiment as other features see it: its frozen plan (version and content) and the catalogue's
     * unit and reporting digits of each planned measurand.
     */
    public record PrecisionStudy(long roundId, String roundCode, String state, long schemeId, int planVersion,
                                 String planSha256, PrecisionPlan plan, Map<String, String> units,
                                 Map<String, Integer> reportingDigits) {
    }

    /** Whether the round is a precision experiment (empty for a missing round too). */
    @Transactional
    public boolean isPrecisionExperiment(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        return round != null && round.kind == RoundKind.PRECISION_EXPERIMENT;
    }

    /** The precision experiment with its frozen plan; empty for another kind of round or one not yet frozen. */
    @Transactional
    public Optional<PrecisionStudy> precisionStudy(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        if (round == null || round.kind != RoundKind.PRECISION_EXPERIMENT) {
            return Optional.empty();
        }
        return precisionPlans.current(roundId).map(v -> {
            Map<String, String> units = new LinkedHashMap<>();
            Map<String, Integer> digits = new LinkedHashMap<>();
            Map<String, Measurand> catalogue = new LinkedHashMap<>();
            schemes.catalogue(round.schemeId).forEach(m -> catalogue.put(m.element, m));
            for (String element : v.plan().measurands()) {
                Measurand m = catalogue.get(element);
                units.put(element, m == null ? "%" : m.unit);
                digits.put(element, m == null ? 4 : m.reportingDigits);
            }
            return new PrecisionStudy(round.id, round.code, round.state.name(), round.schemeId, v.version(), v.sha256(),
                    v.plan(), units, digits);
        });
    }

    /** The precision experiments of the installation, newest first (ids). */
    @Transactional
    public List<Long> precisionExperimentIds() {
        @SuppressWarnings("unchecked")
        List<Number> ids = entityManager.createNativeQuery(
                "SELECT id FROM round WHERE kind = 'PRECISION_EXPERIMENT' ORDER BY created_at DESC, id DESC").getResultList();
        return ids.stream().map(Number::longValue).toList();
    }

    /**
     * A measurand open for results, with what the catalogue says about it and whether the frozen plan accepts
     * negative results of it ({@link EvaluationPlan.MeasurandPlan#negativeAllowed()}).
     */
    public record OpenMeasurand(String element, String unit, int reportingDigits, BigDecimal expectedMin,
                                BigDecimal expectedMax, List<String> methodGroups, boolean negativeAllowed) {
    }

    /**
     * Reads the round's submission window holding a shared row lock ({@code FOR SHARE}) until the transaction
     * ends: a lifecycle step (which takes the row for update) waits for writes in flight and vice versa, so a
     * submission racing the close is either fully in or refused.
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public SubmissionWindow lockForSubmission(long roundId) {
        Round round = entityManager.find(Round.class, roundId, LockModeType.PESSIMISTIC_READ);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        return window(round);
    }

    /**
     * What a submission needs to know of the round, read in one statement under the shared row lock of
     * {@link #lockForSubmission(long)}: the window, the kind of round, the laboratory's participant code (empty when
     * it is not enrolled) and the stamp of everything the round's upload rules are made of.
     *
     * @param rulesStamp changes whenever the upload rules may change: a new version of the round row (state, item
     *                   labels, kind…), a new frozen plan version (evaluation or precision plan), a new qualification
     *                   decision (a withdrawn measurand), a measurand of the scheme's catalogue added or changed
     */
    public record SubmissionHead(SubmissionWindow window, boolean precisionExperiment, Optional<String> participantCode,
                                 String rulesStamp) {
    }

    /**
     * As {@link #lockForSubmission(long)}, with the laboratory's enrolment and the stamp of the upload rules in the
     * same statement (one round trip for everything a submission reads of the round).
     *
     * @throws DomainException.NotFound the round does not exist
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public SubmissionHead lockForSubmission(long roundId, long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, r.code, r.state, r.result_deadline, r.deadline_time_zone, r.late_policy, r.item_labels, r.kind,
                       p.participant_code,
                       r.version || ':' || coalesce((SELECT max(e.plan_version) FROM evaluation_plan e WHERE e.round_id = r.id), 0)
                         || ':' || coalesce((SELECT max(pp.plan_version) FROM precision_plan pp WHERE pp.round_id = r.id), 0)
                         || ':' || coalesce((SELECT max(q.id) FROM qualification_decision q WHERE q.round_id = r.id), 0)
                         || ':' || (SELECT count(*) || '.' || coalesce(sum(m.version), 0) FROM measurand m WHERE m.scheme_id = r.scheme_id)
                  FROM round r LEFT JOIN round_participant p ON p.round_id = r.id AND p.laboratory_id = :l
                 WHERE r.id = :r
                   FOR SHARE OF r
                """).setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        if (rows.isEmpty()) {
            throw new DomainException.NotFound("The round");
        }
        Object[] row = rows.get(0);
        SubmissionWindow window = new SubmissionWindow(((Number) row[0]).longValue(), (String) row[1], (String) row[2],
                org.roundtable.platform.Timestamps.utc(row[3]), (String) row[4], (String) row[5],
                List.of(((String) row[6]).split(",")));
        return new SubmissionHead(window, RoundKind.PRECISION_EXPERIMENT.name().equals(row[7]),
                Optional.ofNullable((String) row[8]), (String) row[9]);
    }

    @Transactional
    public SubmissionWindow window(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        return window(round);
    }

    /** The laboratory's participant code in the round, or empty when it is not enrolled. */
    @Transactional
    public Optional<String> participantCode(long roundId, long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<String> codes = entityManager.createNativeQuery(
                        "SELECT participant_code FROM round_participant WHERE round_id = :r AND laboratory_id = :l")
                .setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        return codes.stream().findFirst();
    }

    /** Laboratory id to participant code for every enrolled laboratory (coordinators only). */
    @Transactional
    public Map<Long, String> participantCodes(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(
                        "SELECT laboratory_id, participant_code FROM round_participant WHERE round_id = :r ORDER BY participant_code")
                .setParameter("r", roundId).getResultList();
        Map<Long, String> codes = new LinkedHashMap<>();
        rows.forEach(row -> codes.put(((Number) row[0]).longValue(), (String) row[1]));
        return codes;
    }

    /**
     * The measurands laboratories report in this round: those of the frozen plan, as the scheme's catalogue
     * describes them, less any withdrawn by a qualification decision.
     */
    @Transactional
    public List<OpenMeasurand> openMeasurands(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        EvaluationPlan plan = plans.current(roundId)
                .orElseThrow(() -> new DomainException.Conflict("The round has no frozen evaluation plan."));
        Map<String, Measurand> catalogue = new LinkedHashMap<>();
        schemes.catalogue(round.schemeId).forEach(m -> catalogue.put(m.element, m));
        java.util.Set<String> withdrawn = qualification.withdrawnElements(roundId);
        return plan.measurands().stream()
                .filter(p -> catalogue.containsKey(p.element()))
                .filter(p -> !withdrawn.contains(p.element()))
                .map(p -> {
                    Measurand m = catalogue.get(p.element());
                    return new OpenMeasurand(m.element, m.unit, m.reportingDigits, m.expectedMin, m.expectedMax,
                            Arrays.asList(m.methodGroups.split(",")), p.negativeResultsAllowed());
                })
                .toList();
    }

    /** The elements of the round's scheme in the catalogue's order (how the scheme lists its measurands). */
    @Transactional
    public List<String> measurandOrder(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        return schemes.catalogue(round.schemeId).stream().map(m -> m.element).toList();
    }

    /** Rounds still open for results whose deadline has passed and which refuse late results. */
    @Transactional
    public List<Long> dueForClosing(OffsetDateTime now) {
        @SuppressWarnings("unchecked")
        List<Number> ids = entityManager.createNativeQuery("""
                SELECT id FROM round WHERE state = 'OPEN_FOR_RESULTS' AND late_policy = 'REFUSE' AND result_deadline < :now
                """).setParameter("now", now).getResultList();
        return ids.stream().map(Number::longValue).toList();
    }

    private static SubmissionWindow window(Round round) {
        return new SubmissionWindow(round.id, round.code, round.state.name(), round.resultDeadline, round.deadlineTimeZone,
                round.latePolicy.name(), List.of(round.itemLabels.split(",")));
    }
}
