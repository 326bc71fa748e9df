package org.roundtable.scheme;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.panache.common.Sort;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.CurrentUser;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.notice.NoticeKind;
import org.roundtable.notice.NoticeService;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.qualification.QualificationService;

import java.time.Clock;
import java.time.DateTimeException;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.OffsetDateTime;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/**
 * Rounds (coordinators): creating and editing a draft, the evaluation plan (draft, freeze, new versions) and
 * every lifecycle step. Each step locks the round ({@link RoundGate}), checks the state table
 * ({@link RoundStateMachine}), checks its own preconditions, changes the state and writes an audit event with
 * the round's hash before and after — all in one transaction.
 *
 * <p>Preconditions beyond the state table:
 * <ul>
 *   <li>freezing needs a draft plan that is valid against the scheme's catalogue <em>now</em>;</li>
 *   <li>confirming qualification needs every planned measurand cleared: its homogeneity check passed (and
 *       stability, where uploaded) or a decision with a reason recorded ({@link QualificationService});</li>
 *   <li>dispatching needs at least one enrolled laboratory; it creates one item record per laboratory and label;</li>
 *   <li>a new plan version needs a reason and is refused once results are visible beyond their own laboratory.</li>
 * </ul>
 */
@ApplicationScoped
public class RoundService {

    private static final DateTimeFormatter LOCAL = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm", Locale.ROOT);

    private final RoundRepository rounds;
    private final SchemeService schemes;
    private final RoundGate gate;
    private final PlanStore plans;
    private final PrecisionPlanStore precisionPlans;
    private final EnrolmentService enrolments;
    private final QualificationService qualification;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final ObjectMapper mapper;
    private final Clock clock;
    private final NoticeService notices;
    private final RoundResults results;

    public RoundService(RoundRepository rounds, SchemeService schemes, RoundGate gate, PlanStore plans,
                        EnrolmentService enrolments, QualificationService qualification, AuditTrail audit,
                        CurrentUser currentUser, EntityManager entityManager, ObjectMapper mapper, Clock clock,
                        NoticeService notices, PrecisionPlanStore precisionPlans, RoundResults results) {
        this.results = results;
        this.rounds = rounds;
        this.precisionPlans = precisionPlans;
        this.schemes = schemes;
        this.gate = gate;
        this.plans = plans;
        this.enrolments = enrolments;
        this.qualification = qualification;
        this.audit = audit;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.mapper = mapper;
        this.clock = clock;
        this.notices = notices;
    }

    /**
     * Round details as entered. {@code resultDeadline} is a local date and time ({@code 2027-03-15T17:00}) in
     * {@code timeZone} (an IANA zone such as {@code Europe/Berlin}); {@code itemLabels} one per item.
     */
    public record RoundDetails(Long schemeId, String code, String itemDescription, Integer itemsPerLaboratory,
                               List<String> itemLabels, String dispatchDate, String resultDeadline, String timeZone,
                               String instructions, String latePolicy, String codeScope) {
    }

    public record RoundView(long id, long schemeId, String schemeName, String code, String itemDescription,
                            int itemsPerLaboratory, List<String> itemLabels, LocalDate dispatchDate,
                            OffsetDateTime resultDeadline, String resultDeadlineLocal, String timeZone,
                            String instructions, String latePolicy, String codeScope, String state,
                            OffsetDateTime stateChangedAt, List<String> allowedActions, String draftPlan,
                            Integer planVersion, String planSha256) {
    }

    public record PlanChange(EvaluationPlan plan, String reason) {
    }

    // ---- rounds ---------------------------------------------------------------------------------------------

    @Transactional
    public RoundView create(RoundDetails details) {
        if (details == null || details.schemeId() == null) {
            throw new DomainException.BadRequest("A round needs its scheme.");
        }
        Scheme scheme = schemes.find(details.schemeId());
        Round round = new Round();
        round.schemeId = scheme.id;
        round.state = RoundState.DRAFT;
        round.createdAt = now();
        round.stateChangedAt = round.createdAt;
        apply(round, details);
        if (rounds.count("code", round.code) > 0) {
            throw new DomainException.Conflict("A round with the code " + round.code + " exists already.");
        }
        rounds.persist(round);
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.created", "round", round.id.toString(), null,
                hash(round), "code=" + round.code + " scheme=" + scheme.id));
        return view(round);
    }

    /**
     * Creates a precision experiment (ISO 5725-2): a round whose items are the plan's levels, with the plan as
     * its draft. {@code itemsPerLaboratory} and {@code itemLabels} of the details are ignored.
     */
    @Transactional
    public RoundView createPrecisionExperiment(RoundDetails details, PrecisionPlan plan) {
        if (details == null || details.schemeId() == null) {
            throw new DomainException.BadRequest("A precision experiment needs its scheme.");
        }
        Scheme scheme = schemes.find(details.schemeId());
        PrecisionPlan.Canonical canonical = PrecisionPlan.canonical(plan, schemes.catalogue(scheme.id), mapper);
        Round round = new Round();
        round.schemeId = scheme.id;
        round.kind = RoundKind.PRECISION_EXPERIMENT;
        round.state = RoundState.DRAFT;
        round.createdAt = now();
        round.stateChangedAt = round.createdAt;
        apply(round, new RoundDetails(details.schemeId(), details.code(), details.itemDescription(), 1, List.of("A"),
                details.dispatchDate(), details.resultDeadline(), details.timeZone(), details.instructions(),
                details.latePolicy(), details.codeScope()));
        round.itemsPerLaboratory = canonical.plan().levels().size();
        round.itemLabels = String.join(",", canonical.plan().levelLabels());
        round.draftPlan = canonical.json();
        if (rounds.count("code", round.code) > 0) {
            throw new DomainException.Conflict("A round with the code " + round.code + " exists already.");
        }
        rounds.persist(round);
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.created", "round", round.id.toString(), null,
                hash(round), "code=" + round.code + " scheme=" + scheme.id + " kind=" + round.kind
                        + " planSha256=" + canonical.sha256()));
        return view(round);
    }

    /** Replaces the draft plan of a precision experiment still in draft; its items follow the levels. */
    @Transactional
    public RoundView savePrecisionDraftPlan(long roundId, PrecisionPlan plan) {
        Round round = gate.enter(roundId, RoundAction.EDIT_DRAFT_PLAN);
        if (round.kind != RoundKind.PRECISION_EXPERIMENT) {
            throw new DomainException.NotFound("The precision experiment");
        }
        PrecisionPlan.Canonical canonical = PrecisionPlan.canonical(plan, schemes.catalogue(round.schemeId), mapper);
        String before = hash(round);
        round.draftPlan = canonical.json();
        round.itemsPerLaboratory = canonical.plan().levels().size();
        round.itemLabels = String.join(",", canonical.plan().levelLabels());
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.draft-plan-saved", "round", round.id.toString(),
                before, hash(round), "planSha256=" + canonical.sha256()));
        return view(round);
    }

    /** Changes a draft round's details (the scheme stays). */
    @Transactional
    public RoundView update(long roundId, RoundDetails details) {
        Round round = gate.enter(roundId, RoundAction.EDIT_DETAILS);
        if (details == null) {
            throw new DomainException.BadRequest("The round details are missing.");
        }
        String before = hash(round);
        String oldCode = round.code;
        int items = round.itemsPerLaboratory;
        String labels = round.itemLabels;
        apply(round, round.kind == RoundKind.PRECISION_EXPERIMENT
                ? new RoundDetails(details.schemeId(), details.code(), details.itemDescription(), 1, List.of("A"),
                        details.dispatchDate(), details.resultDeadline(), details.timeZone(), details.instructions(),
                        details.latePolicy(), details.codeScope()) : details);
        if (round.kind == RoundKind.PRECISION_EXPERIMENT) {
            // a precision experiment's items are its levels: they change with the plan only
            round.itemsPerLaboratory = items;
            round.itemLabels = labels;
        }
        if (!round.code.equals(oldCode) && rounds.count("code = ?1 and id <> ?2", round.code, round.id) > 0) {
            throw new DomainException.Conflict("A round with the code " + round.code + " exists already.");
        }
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.details-changed", "round", round.id.toString(),
                before, hash(round), null));
        return view(round);
    }

    @Transactional
    public List<RoundView> list() {
        return rounds.listAll(Sort.by("createdAt").descending().and("id").descending()).stream().map(this::view).toList();
    }

    @Transactional
    public RoundView get(long roundId) {
        return view(gate.find(roundId));
    }

    // ---- the evaluation plan -----------------------------------------------------------------------------

    /** Saves the draft plan of a draft round, checked against the catalogue. */
    @Transactional
    public RoundView saveDraftPlan(long roundId, EvaluationPlan plan) {
        Round round = gate.enter(roundId, RoundAction.EDIT_DRAFT_PLAN);
        PlanDocument.Canonical canonical = canonical(round, plan);
        String before = hash(round);
        round.draftPlan = canonical.json();
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.draft-plan-saved", "round", round.id.toString(),
                before, hash(round), "planSha256=" + canonical.sha256()));
        return view(round);
    }

    /**
     * Stores a new version of a frozen plan, with its reason. Refused without a reason, in states where the
     * plan is not open to change, and always once results are visible beyond their own laboratory.
     */
    @Transactional
    public PlanStore.PlanVersion newPlanVersion(long roundId, PlanChange change) {
        Round round = gate.enter(roundId, RoundAction.NEW_PLAN_VERSION);
        if (resultsVisibleBeyondOwnLab(round)) {
            throw new DomainException.Conflict("Results of this round are visible beyond their own laboratory: the plan can no longer change.");
        }
        if (change == null || change.reason() == null || change.reason().isBlank() || change.reason().length() > 1000) {
            throw new DomainException.BadRequest("A new plan version needs a reason (1 to 1000 characters).");
        }
        PlanDocument.Canonical canonical = canonical(round, change.plan());
        PlanStore.PlanVersion previous = plans.latest(roundId).orElseThrow();
        if (previous.sha256().equals(canonical.sha256())) {
            throw new DomainException.Conflict("The plan is unchanged (same hash as version " + previous.version() + ").");
        }
        PlanStore.PlanVersion version = plans.append(roundId, canonical, change.reason().strip(), currentUser.actor().name(), now());
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.plan-version", "evaluation-plan",
                roundId + "/" + version.version(), previous.sha256(), version.sha256(),
                "version=" + version.version() + " reason=" + version.reason()));
        return version;
    }

    /**
     * The early warnings of the latest plan version of each round in {@code :rounds} (primary key of
     * {@code evaluation_plan}, round first). Public for the history benchmark.
     */
    public static final String EARLY_WARNING_PLANS_SQL = """
            SELECT DISTINCT ON (round_id) round_id, (canonical_json::jsonb -> 'earlyWarnings')::text
              FROM evaluation_plan WHERE round_id IN (:rounds) ORDER BY round_id, plan_version DESC
            """;

    /**
     * The early warnings of each round's plan in force (its latest frozen version), for laboratories' histories:
     * one query for all {@code roundIds}; a round without a frozen plan is left out, a plan stored before plans
     * named early warnings maps to null. No access check: thresholds only, no results.
     */
    @Transactional
    public java.util.Map<Long, EvaluationPlan.EarlyWarningPlan> earlyWarningPlans(java.util.Collection<Long> roundIds) {
        java.util.Map<Long, EvaluationPlan.EarlyWarningPlan> out = new java.util.HashMap<>();
        if (roundIds.isEmpty()) {
            return out;
        }
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(EARLY_WARNING_PLANS_SQL).setParameter("rounds", roundIds)
                .getResultList();
        for (Object[] r : rows) {
            EvaluationPlan.EarlyWarningPlan w = null;
            if (r[1] != null) {
                try {
                    w = mapper.readValue(r[1].toString(), EvaluationPlan.EarlyWarningPlan.class);
                } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
                    throw new IllegalStateException("stored plan is not readable", e);
                }
            }
            out.put(((Number) r[0]).longValue(), w);
        }
        return out;
    }

    @Transactional
    public List<PlanStore.PlanVersion> planVersions(long roundId) {
        gate.find(roundId);
        return plans.versions(roundId);
    }

    /**
     * Whether any result of the round may have been seen by someone other than the laboratory that reported
     * it. For now: the round has reached {@code PRELIMINARY_ISSUED} or a later state. The submissions and
     * report features may make this finer (e.g. an early release of results to one party).
     */
    @Transactional
    public boolean resultsVisibleBeyondOwnLab(long roundId) {
        return resultsVisibleBeyondOwnLab(gate.find(roundId));
    }

    /** How a result arriving now (injected clock) would be treated under the round's state and late-result policy. */
    @Transactional
    public ResultTiming resultTiming(long roundId) {
        Round round = gate.find(roundId);
        return ResultTiming.of(round.state, round.resultDeadline.toInstant(), round.latePolicy, clock.instant());
    }

    static boolean resultsVisibleBeyondOwnLab(Round round) {
        return round.state.resultsVisibleBeyondOwnLab();
    }

    // ---- lifecycle -------------------------------------------------------------------------------------

    /** Takes a lifecycle step; refuses, with the state named, a step that is not possible now. */
    @Transactional
    public RoundView transition(long roundId, String actionName) {
        return transition(roundId, actionName, null);
    }

    /**
     * Takes a lifecycle step; {@code reason} is recorded in the audit trail. Cancelling a round that holds
     * laboratories' results needs a reason.
     */
    @Transactional
    public RoundView transition(long roundId, String actionName, String reason) {
        RoundAction action = parseAction(actionName);
        if (reason != null && reason.length() > 1000) {
            throw new DomainException.BadRequest("The reason is longer than 1000 characters.");
        }
        if (!action.changesState()) {
            throw new DomainException.BadRequest(RoundStateMachine.describe(action) + " is not a lifecycle step.");
        }
        Round round = gate.enter(roundId, action);
        if (!action.availableNow()) {
            throw new DomainException.Conflict(RoundStateMachine.describe(action)
                    + " is taken by the evaluation and report features, not here.");
        }
        RoundState next = RoundStateMachine.next(round.state, action).orElseThrow();
        String detail = null;
        switch (action) {
            case FREEZE_PLAN -> {
                if (round.draftPlan == null) {
                    throw new DomainException.Conflict("Write and save the evaluation plan before freezing it.");
                }
                if (round.kind == RoundKind.PRECISION_EXPERIMENT) {
                    PrecisionPlan.Canonical precision = PrecisionPlan.canonical(PrecisionPlan.read(round.draftPlan, mapper),
                            schemes.catalogue(round.schemeId), mapper);
                    PrecisionPlanStore.Version v = precisionPlans.append(round.id, precision, "Frozen before enrolment",
                            currentUser.actor().name(), now());
                    detail = "planVersion=1 planSha256=" + v.sha256();
                    break;
                }
                PlanDocument.Canonical canonical = canonical(round, PlanDocument.read(round.draftPlan, mapper));
                PlanStore.PlanVersion v = plans.append(round.id, canonical, "Frozen before enrolment", currentUser.actor().name(), now());
                detail = "planVersion=1 planSha256=" + v.sha256();
            }
            case CONFIRM_QUALIFICATION, OPEN_FOR_RESULTS -> {
                List<String> open = qualification.unclearedElements(round.id);
                if (!open.isEmpty()) {
                    throw new DomainException.Conflict("Sample qualification is not settled for " + String.join(", ", open)
                            + ": upload homogeneity data that passes, or record a decision with a reason.");
                }
            }
            case CANCEL -> {
                long holding = results.laboratoriesWithResults(round.id);
                if (holding > 0 && (reason == null || reason.isBlank())) {
                    throw new DomainException.BadRequest("The round holds results from " + holding
                            + (holding == 1 ? " laboratory" : " laboratories") + ": give a reason for cancelling it.");
                }
                detail = "laboratoriesWithResults=" + holding;
            }
            case DISPATCH_ITEMS -> {
                int items = enrolments.dispatchAll(round);
                if (items == 0) {
                    throw new DomainException.Conflict("No laboratory is enrolled: there is nothing to dispatch.");
                }
                detail = "items=" + items;
            }
            default -> {
            }
        }
        String before = hash(round);
        RoundState from = round.state;
        round.state = next;
        round.stateChangedAt = now();
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), "round." + action.name().toLowerCase(Locale.ROOT)
                .replace('_', '-'), "round", round.id.toString(), before, hash(round),
                "from=" + from + " to=" + next + (detail == null ? "" : " " + detail)
                        + (reason == null || reason.isBlank() ? "" : " reason=" + reason.strip())));
        if (action == RoundAction.OPEN_FOR_RESULTS) {
            notices.notifyLaboratoriesOfRound(NoticeKind.ROUND_OPENED, "round:" + round.id, round.id, false,
                    java.util.Map.of("round", round.code, "roundId", round.id, "deadline", round.resultDeadline));
        }
        return view(round);
    }

    /**
     * Takes a lifecycle step that belongs to the evaluation and report features ({@link RoundAction#availableNow()}
     * false, e.g. {@code ISSUE_PRELIMINARY}), in the caller's transaction and under the round's row lock; they
     * call it only with the evidence of the step in hand (an issued report). Audited like {@link #transition}.
     *
     * @return the state the round is in afterwards
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public RoundState takeReportStep(long roundId, RoundAction action, Actor actor, String detail) {
        if (!action.changesState() || action.availableNow()) {
            throw new IllegalArgumentException(action + " is not a step of the evaluation and report features");
        }
        Round round = gate.enter(roundId, action);
        RoundState next = RoundStateMachine.next(round.state, action).orElseThrow();
        String before = hash(round);
        RoundState from = round.state;
        round.state = next;
        round.stateChangedAt = now();
        entityManager.flush();
        if (action == RoundAction.OPEN_COMMENT_PERIOD) {
            // the period's end, from the round's length setting; the notice job tells laboratories before it
            entityManager.createNativeQuery("UPDATE round SET comment_period_ends_at = CAST(:at AS timestamptz)"
                    + " + comment_period_days * interval '1 day' WHERE id = :id").setParameter("at", round.stateChangedAt)
                    .setParameter("id", roundId).executeUpdate();
            detail = (detail == null ? "" : detail + " ") + "comment period ends " + commentPeriodEnd(roundId).orElseThrow();
        }
        audit.record(new AuditTrail.Event(actor, "round." + action.name().toLowerCase(Locale.ROOT).replace('_', '-'),
                "round", round.id.toString(), before, hash(round),
                "from=" + from + " to=" + next + (detail == null ? "" : " " + detail)));
        return next;
    }

    /** When the round's comment period on the preliminary report ends, once it has been opened. */
    @Transactional
    public java.util.Optional<OffsetDateTime> commentPeriodEnd(long roundId) {
        @SuppressWarnings("unchecked")
        java.util.List<Object> rows = entityManager.createNativeQuery(
                        "SELECT comment_period_ends_at FROM round WHERE id = :id AND comment_period_ends_at IS NOT NULL")
                .setParameter("id", roundId).getResultList();
        return rows.stream().findFirst().map(org.roundtable.platform.Timestamps::utc);
    }

    /** The round's current state, read under the round's row lock (for the report feature's checks). */
    @Transactional(Transactional.TxType.MANDATORY)
    public RoundState lockState(long roundId) {
        Round round = entityManager.find(Round.class, roundId, jakarta.persistence.LockModeType.PESSIMISTIC_WRITE);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        return round.state;
    }

    static RoundAction parseAction(String name) {
        try {
            return RoundAction.valueOf(name == null ? "" : name.strip().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new DomainException.BadRequest("Unknown action. Lifecycle steps: " + java.util.Arrays.stream(RoundAction.values())
                    .filter(RoundAction::changesState).map(Enum::name).toList() + ".");
        }
    }

    // ---- internals -------------------------------------------------------------------------------------

    private PlanDocument.Canonical canonical(Round round, EvaluationPlan plan) {
        return PlanDocument.canonical(plan, schemes.catalogue(round.schemeId),
                new PlanDocument.RoundSettings(round.code, round.latePolicy, round.codeScope), mapper);
    }

    private void apply(Round round, RoundDetails d) {
        String code = d.code() == null ? "" : d.code().strip();
        if (!code.matches("[A-Za-z0-9][A-Za-z0-9._-]{1,39}")) {
            throw new DomainException.BadRequest("The round code has 2 to 40 letters, digits and . _ - characters.");
        }
        round.code = code;
        round.itemDescription = SchemeService.text(d.itemDescription(), "item description", 1000);
        int items = d.itemsPerLaboratory() == null ? 1 : d.itemsPerLaboratory();
        if (items != 1 && items != 2) {
            throw new DomainException.BadRequest("A laboratory receives 1 item, or 2 for a split-level pair.");
        }
        List<String> labels = d.itemLabels() == null || d.itemLabels().isEmpty()
                ? (items == 1 ? List.of("A") : List.of("A", "B")) : d.itemLabels().stream().map(l -> l == null ? "" : l.strip()).toList();
        if (labels.size() != items || new LinkedHashSet<>(labels).size() != items
                || labels.stream().anyMatch(l -> !l.matches("[A-Za-z0-9-]{1,8}"))) {
            throw new DomainException.BadRequest("Give one distinct label per item (1 to 8 letters, digits or -).");
        }
        round.itemsPerLaboratory = items;
        round.itemLabels = String.join(",", labels);
        ZoneId zone;
        try {
            zone = ZoneId.of(d.timeZone() == null ? "" : d.timeZone().strip());
        } catch (DateTimeException e) {
            throw new DomainException.BadRequest("The time zone is an IANA zone such as Europe/Berlin or UTC.");
        }
        try {
            round.dispatchDate = LocalDate.parse(d.dispatchDate() == null ? "" : d.dispatchDate().strip());
        } catch (DateTimeParseException e) {
            throw new DomainException.BadRequest("The dispatch date is written as 2027-03-01.");
        }
        try {
            round.resultDeadline = LocalDateTime.parse(d.resultDeadline() == null ? "" : d.resultDeadline().strip())
                    .atZone(zone).toOffsetDateTime().withOffsetSameInstant(ZoneOffset.UTC);
        } catch (DateTimeParseException e) {
            throw new DomainException.BadRequest("The result deadline is a local date and time such as 2027-03-15T17:00.");
        }
        round.deadlineTimeZone = zone.getId();
        if (round.dispatchDate.isAfter(round.resultDeadline.toLocalDate())) {
            throw new DomainException.BadRequest("The result deadline comes before the dispatch date.");
        }
        round.instructions = SchemeService.text(d.instructions(), "instructions to participants", 20000);
        round.latePolicy = enumOf(Round.LatePolicy.class, d.latePolicy(), Round.LatePolicy.REFUSE, "late-result policy");
        round.codeScope = enumOf(Round.CodeScope.class, d.codeScope(), Round.CodeScope.ROUND, "participant-code scope");
    }

    private static <E extends Enum<E>> E enumOf(Class<E> type, String value, E fallback, String what) {
        if (value == null || value.isBlank()) {
            return fallback;
        }
        try {
            return Enum.valueOf(type, value.strip().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new DomainException.BadRequest("The " + what + " is one of " + List.of(type.getEnumConstants()) + ".");
        }
    }

    RoundView view(Round r) {
        Optional<PlanStore.PlanVersion> plan = plans.latest(r.id);
        String schemeName = schemes.find(r.schemeId).name;
        List<String> actions = new ArrayList<>();
        RoundStateMachine.allowed(r.state).stream().filter(a -> a.changesState() && a.availableNow())
                .forEach(a -> actions.add(a.name()));
        return new RoundView(r.id, r.schemeId, schemeName, r.code, r.itemDescription, r.itemsPerLaboratory,
                List.of(r.itemLabels.split(",")), r.dispatchDate, r.resultDeadline,
                LOCAL.format(r.resultDeadline.atZoneSameInstant(ZoneId.of(r.deadlineTimeZone))), r.deadlineTimeZone,
                r.instructions, r.latePolicy.name(), r.codeScope.name(), r.state.name(), r.stateChangedAt, actions,
                r.draftPlan, plan.map(PlanStore.PlanVersion::version).orElse(null),
                plan.map(PlanStore.PlanVersion::sha256).orElse(null));
    }

    static String hash(Round r) {
        Map<String, Object> fields = new HashMap<>();
        fields.put("id", r.id);
        fields.put("schemeId", r.schemeId);
        fields.put("code", r.code);
        fields.put("itemDescription", r.itemDescription);
        fields.put("itemsPerLaboratory", r.itemsPerLaboratory);
        fields.put("itemLabels", r.itemLabels);
        fields.put("dispatchDate", r.dispatchDate);
        fields.put("resultDeadline", r.resultDeadline == null ? null : r.resultDeadline.toInstant());
        fields.put("deadlineTimeZone", r.deadlineTimeZone);
        fields.put("instructions", r.instructions);
        fields.put("latePolicy", r.latePolicy);
        fields.put("codeScope", r.codeScope);
        fields.put("state", r.state);
        fields.put("draftPlan", r.draftPlan);
        if (r.kind == RoundKind.PRECISION_EXPERIMENT) {
            fields.put("kind", r.kind);
        }
        return ObjectHash.of(fields);
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
