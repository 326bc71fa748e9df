package org.roundtable.evaluation;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Timestamps;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.PlanStore;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundState;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Results the coordinator marks as blunders (wrong unit, wrong element, a slipped decimal point…), with a reason,
 * and withdrawals of such marks (table {@code result_exclusion}, append-only).
 *
 * <p>Rules: a mark names a participant code, an element of the round's plan and an item label, and needs a reason;
 * the laboratory must have a current result for it; a result has at most one current mark. Marks and withdrawals
 * are allowed while the round is open for results, closed or being evaluated. An evaluation run applies the marks
 * current when it runs: the result is left out of every statistic but still scored, with {@code "blunder: "} and
 * the reason on its score (see {@link EvaluationService}). Coordinators only; every mark and withdrawal is audited.
 */
@ApplicationScoped
public class ExclusionService {

    /** Longest reason accepted. */
    public static final int MAX_REASON = 500;
    /** Prefix of a score's excluded reason for a marked blunder. */
    public static final String BLUNDER = "blunder: ";

    private static final Set<RoundState> OPEN_TO_MARKS = Set.of(RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED,
            RoundState.EVALUATING);

    private final EntityManager entityManager;
    private final RoundAccess rounds;
    private final PlanStore plans;
    private final AuditTrail audit;
    private final Clock clock;

    public ExclusionService(EntityManager entityManager, RoundAccess rounds, PlanStore plans, AuditTrail audit,
                            Clock clock) {
        this.entityManager = entityManager;
        this.rounds = rounds;
        this.plans = plans;
        this.audit = audit;
        this.clock = clock;
    }

    /** {@code {participantCode, element, itemLabel, reason}}. */
    public record MarkRequest(String participantCode, String element, String itemLabel, String reason) {
    }

    /** {@code {reason}}. */
    public record WithdrawalRequest(String reason) {
    }

    /** A withdrawal of a mark. */
    public record Withdrawal(long id, String reason, String withdrawnBy, OffsetDateTime withdrawnAt) {
    }

    /** A mark, with its withdrawal when it was withdrawn. */
    public record Exclusion(long id, String participantCode, String element, String itemLabel, String reported,
                            String reason, String markedBy, OffsetDateTime markedAt, Withdrawal withdrawal) {
        public boolean current() {
            return withdrawal == null;
        }
    }

    /**
     * The round's marks: current ones and withdrawn ones, each by participant code, element, item; with what a
     * mark may name (participant codes, the plan's elements, the item labels) and whether marks are open now.
     */
    public record RoundExclusions(long roundId, String roundCode, String roundState, boolean open,
                                  List<Exclusion> current, List<Exclusion> withdrawn, List<String> participantCodes,
                                  List<String> elements, List<String> itemLabels) {
    }

    /** A current mark as the evaluation applies it. */
    public record Current(long id, long laboratoryId, String element, String itemLabel, String reason) {

        /** The key of the marked result in {@link #current(long)}. */
        public static String key(long laboratoryId, String element, String itemLabel) {
            return laboratoryId + "\u0000" + element + "\u0000" + itemLabel;
        }
    }

    // ---- writing ------------------------------------------------------------------------------------------------

    @Transactional
    public Exclusion mark(long roundId, MarkRequest request, Actor actor) {
        RoundAccess.SubmissionWindow window = lockOpenRound(roundId);
        if (request == null) {
            throw new DomainException.BadRequest("Name the participant code, element, item and the reason.");
        }
        String reason = reason(request.reason(), "A blunder needs a reason.");
        String code = request.participantCode() == null ? "" : request.participantCode().strip().toUpperCase(java.util.Locale.ROOT);
        Long laboratoryId = null;
        for (Map.Entry<Long, String> e : rounds.participantCodes(roundId).entrySet()) {
            if (e.getValue().equals(code)) {
                laboratoryId = e.getKey();
            }
        }
        if (laboratoryId == null) {
            throw new DomainException.Unprocessable(code.isEmpty() ? "Name the participant code of the result."
                    : "No participant of this round has the code " + code + ".");
        }
        String element = null;
        List<String> planned = plans.current(roundId).map(p -> p.measurands().stream()
                .map(EvaluationPlan.MeasurandPlan::element).toList()).orElse(List.of());
        for (String e : planned) {
            if (request.element() != null && e.equalsIgnoreCase(request.element().strip())) {
                element = e;
            }
        }
        if (element == null) {
            throw new DomainException.Unprocessable((request.element() == null || request.element().isBlank()
                    ? "Name the element of the result." : request.element().strip() + " is not a measurand of this round.")
                    + " The round's measurands: " + String.join(", ", planned) + ".");
        }
        List<String> items = window.itemLabels().stream().map(String::strip).filter(l -> !l.isEmpty()).toList();
        String item = request.itemLabel() == null || request.itemLabel().isBlank()
                ? (items.size() == 1 ? items.get(0) : null) : request.itemLabel().strip();
        if (item == null || !items.contains(item)) {
            throw new DomainException.Unprocessable((item == null ? "Name the item." : "The round has no item " + item + ".")
                    + " Its items: " + String.join(", ", items) + ".");
        }
        @SuppressWarnings("unchecked")
        List<String> reported = entityManager.createNativeQuery("""
                SELECT rr.value_as_reported
                  FROM submission s
                  JOIN submission_revision sr ON sr.submission_id = s.id AND sr.revision = s.current_revision
                  JOIN reported_result rr ON rr.revision_id = sr.id
                 WHERE s.round_id = :r AND s.laboratory_id = :l AND rr.element = :e AND rr.item_label = :i
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("e", element)
                .setParameter("i", item).getResultList();
        if (reported.isEmpty()) {
            throw new DomainException.Unprocessable(code + " has no current result for " + element + " on item " + item
                    + " to exclude.");
        }
        Current already = current(roundId).get(Current.key(laboratoryId, element, item));
        if (already != null) {
            throw new DomainException.Conflict("The result of " + code + " for " + element + " on item " + item
                    + " is already marked as a blunder (exclusion " + already.id() + "); withdraw that mark first.");
        }
        OffsetDateTime now = now();
        long id = ((Number) entityManager.createNativeQuery("""
                INSERT INTO result_exclusion (round_id, action, laboratory_id, element, item_label, reported, reason,
                    recorded_by, recorded_at)
                VALUES (:r, 'MARK', :l, :e, :i, :reported, :reason, :by, :at) RETURNING id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("e", element)
                .setParameter("i", item).setParameter("reported", reported.get(0)).setParameter("reason", reason)
                .setParameter("by", actor.name()).setParameter("at", now).getSingleResult()).longValue();
        audit.record(new AuditTrail.Event(actor, "evaluation.exclusion-marked", "round", Long.toString(roundId), null,
                null, "exclusion " + id + ": " + code + " " + element + " item " + item + " (" + reported.get(0)
                + "), reason: " + reason));
        return new Exclusion(id, code, element, item, reported.get(0), reason, actor.name(), now, null);
    }

    @Transactional
    public Exclusion withdraw(long roundId, long exclusionId, WithdrawalRequest request, Actor actor) {
        lockOpenRound(roundId);
        Exclusion mark = all(roundId).stream().filter(e -> e.id() == exclusionId).findFirst()
                .orElseThrow(() -> new DomainException.NotFound("The exclusion"));
        if (!mark.current()) {
            throw new DomainException.Conflict("Exclusion " + exclusionId + " was already withdrawn.");
        }
        String reason = reason(request == null ? null : request.reason(), "A withdrawal needs a reason.");
        OffsetDateTime now = now();
        long id = ((Number) entityManager.createNativeQuery("""
                INSERT INTO result_exclusion (round_id, action, laboratory_id, element, item_label, withdraws, reason,
                    recorded_by, recorded_at)
                SELECT round_id, 'WITHDRAW', laboratory_id, element, item_label, id, :reason, :by, :at
                  FROM result_exclusion WHERE id = :mark
                RETURNING id
                """).setParameter("mark", exclusionId).setParameter("reason", reason).setParameter("by", actor.name())
                .setParameter("at", now).getSingleResult()).longValue();
        audit.record(new AuditTrail.Event(actor, "evaluation.exclusion-withdrawn", "round", Long.toString(roundId),
                null, null, "exclusion " + exclusionId + " withdrawn (" + id + "): " + mark.participantCode() + " "
                + mark.element() + " item " + mark.itemLabel() + ", reason: " + reason));
        return new Exclusion(mark.id(), mark.participantCode(), mark.element(), mark.itemLabel(), mark.reported(),
                mark.reason(), mark.markedBy(), mark.markedAt(), new Withdrawal(id, reason, actor.name(), now));
    }

    // ---- reading ------------------------------------------------------------------------------------------------

    /** The round's marks, current and withdrawn, each ordered by participant code, element, item. */
    @Transactional
    public RoundExclusions list(long roundId) {
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        List<Exclusion> current = new ArrayList<>();
        List<Exclusion> withdrawn = new ArrayList<>();
        all(roundId).stream().sorted(java.util.Comparator.comparing(Exclusion::participantCode)
                        .thenComparing(Exclusion::element).thenComparing(Exclusion::itemLabel).thenComparing(Exclusion::id))
                .forEach(e -> (e.current() ? current : withdrawn).add(e));
        List<String> elements = plans.current(roundId).map(p -> p.measurands().stream()
                .map(EvaluationPlan.MeasurandPlan::element).toList()).orElse(List.of());
        return new RoundExclusions(roundId, window.roundCode(), window.state(),
                OPEN_TO_MARKS.contains(RoundState.valueOf(window.state())), current, withdrawn,
                rounds.participantCodes(roundId).values().stream().sorted().toList(), elements,
                window.itemLabels().stream().map(String::strip).filter(l -> !l.isEmpty()).toList());
    }

    /** The marks current now, by {@link Current#key}, for an evaluation run (in the caller's transaction). */
    @Transactional(Transactional.TxType.MANDATORY)
    public Map<String, Current> current(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT m.id, m.laboratory_id, m.element, m.item_label, m.reason
                  FROM result_exclusion m
                 WHERE m.round_id = :r AND m.action = 'MARK'
                   AND NOT EXISTS (SELECT 1 FROM result_exclusion w WHERE w.withdraws = m.id)
                 ORDER BY m.id
                """).setParameter("r", roundId).getResultList();
        Map<String, Current> current = new LinkedHashMap<>();
        for (Object[] r : rows) {
            Current c = new Current(((Number) r[0]).longValue(), ((Number) r[1]).longValue(), (String) r[2],
                    (String) r[3], (String) r[4]);
            current.put(Current.key(c.laboratoryId(), c.element(), c.itemLabel()), c);
        }
        return current;
    }

    private List<Exclusion> all(long roundId) {
        Map<Long, String> codes = rounds.participantCodes(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, action, laboratory_id, element, item_label, reported, withdraws, reason, recorded_by,
                       recorded_at
                  FROM result_exclusion WHERE round_id = :r ORDER BY id
                """).setParameter("r", roundId).getResultList();
        Map<Long, Withdrawal> withdrawals = new HashMap<>();
        for (Object[] r : rows) {
            if ("WITHDRAW".equals(r[1])) {
                withdrawals.put(((Number) r[6]).longValue(), new Withdrawal(((Number) r[0]).longValue(), (String) r[7],
                        (String) r[8], Timestamps.utc(r[9])));
            }
        }
        List<Exclusion> marks = new ArrayList<>();
        for (Object[] r : rows) {
            if ("MARK".equals(r[1])) {
                long id = ((Number) r[0]).longValue();
                marks.add(new Exclusion(id, codes.getOrDefault(((Number) r[2]).longValue(), "?"), (String) r[3],
                        (String) r[4], (String) r[5], (String) r[7], (String) r[8], Timestamps.utc(r[9]),
                        withdrawals.get(id)));
            }
        }
        return marks;
    }

    private RoundAccess.SubmissionWindow lockOpenRound(long roundId) {
        entityManager.createNativeQuery("SELECT id FROM round WHERE id = :r FOR UPDATE").setParameter("r", roundId)
                .getResultList();
        RoundAccess.SubmissionWindow window = rounds.window(roundId); // 404 for a round that does not exist
        RoundState state = RoundState.valueOf(window.state());
        if (!OPEN_TO_MARKS.contains(state)) {
            throw new DomainException.Conflict("Blunders are marked or withdrawn while the round is open for results,"
                    + " closed or being evaluated; this round is " + state + ".");
        }
        return window;
    }

    private static String reason(String text, String missing) {
        if (text == null || text.isBlank()) {
            throw new DomainException.BadRequest(missing);
        }
        String reason = text.strip();
        if (reason.length() > MAX_REASON) {
            throw new DomainException.BadRequest("The reason has at most " + MAX_REASON + " characters.");
        }
        return reason;
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
