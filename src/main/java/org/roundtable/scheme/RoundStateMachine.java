package org.roundtable.scheme;

import org.roundtable.platform.DomainException;

import java.util.Collections;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * The one table of the round workflow (ASVS v5.0.0-2.3.1): for each state, which actions are allowed and,
 * for lifecycle actions, the state they lead to. Every service method that acts on a round asks
 * {@link #require} first, under a row lock on the round, so two coordinators cannot race past a check.
 *
 * <p>Rules worth stating:
 * <ul>
 *   <li>the plan is frozen before anything else happens; a new plan version is possible from
 *       {@code PLAN_FROZEN} up to {@code EVALUATING} — never once results are visible beyond their own
 *       laboratory ({@link RoundState#resultsVisibleBeyondOwnLab()}), which is checked here too;</li>
 *   <li>enrolment is open in {@code ENROLLING} and, for latecomers before dispatch, {@code ITEMS_QUALIFIED};</li>
 *   <li>qualification data and decisions are taken in {@code ENROLLING} (items are prepared while laboratories
 *       enrol) and decisions stay possible until results open, e.g. to withdraw a measurand;</li>
 *   <li>receipts, replacements and withdrawals of items happen while items are out
 *       ({@code DISPATCHED}, {@code OPEN_FOR_RESULTS}, {@code CLOSED});</li>
 *   <li>a round may be cancelled until it is closed; after that, the record is kept and amended instead.</li>
 * </ul>
 */
public final class RoundStateMachine {

    private static final Map<RoundState, Map<RoundAction, RoundState>> TRANSITIONS = new EnumMap<>(RoundState.class);
    private static final Map<RoundState, Set<RoundAction>> WORK = new EnumMap<>(RoundState.class);

    static {
        for (RoundState state : RoundState.values()) {
            TRANSITIONS.put(state, new EnumMap<>(RoundAction.class));
            WORK.put(state, EnumSet.noneOf(RoundAction.class));
        }
        move(RoundState.DRAFT, RoundAction.FREEZE_PLAN, RoundState.PLAN_FROZEN);
        move(RoundState.PLAN_FROZEN, RoundAction.OPEN_ENROLMENT, RoundState.ENROLLING);
        move(RoundState.ENROLLING, RoundAction.CONFIRM_QUALIFICATION, RoundState.ITEMS_QUALIFIED);
        move(RoundState.ITEMS_QUALIFIED, RoundAction.DISPATCH_ITEMS, RoundState.DISPATCHED);
        move(RoundState.DISPATCHED, RoundAction.OPEN_FOR_RESULTS, RoundState.OPEN_FOR_RESULTS);
        move(RoundState.OPEN_FOR_RESULTS, RoundAction.CLOSE, RoundState.CLOSED);
        move(RoundState.CLOSED, RoundAction.START_EVALUATION, RoundState.EVALUATING);
        move(RoundState.EVALUATING, RoundAction.ISSUE_PRELIMINARY, RoundState.PRELIMINARY_ISSUED);
        move(RoundState.PRELIMINARY_ISSUED, RoundAction.OPEN_COMMENT_PERIOD, RoundState.COMMENT_PERIOD);
        move(RoundState.COMMENT_PERIOD, RoundAction.ISSUE_FINAL, RoundState.FINAL_ISSUED);
        move(RoundState.FINAL_ISSUED, RoundAction.AMEND, RoundState.AMENDED);
        move(RoundState.AMENDED, RoundAction.AMEND, RoundState.AMENDED);
        move(RoundState.FINAL_ISSUED, RoundAction.ARCHIVE, RoundState.ARCHIVED);
        move(RoundState.AMENDED, RoundAction.ARCHIVE, RoundState.ARCHIVED);
        for (RoundState state : EnumSet.of(RoundState.DRAFT, RoundState.PLAN_FROZEN, RoundState.ENROLLING,
                RoundState.ITEMS_QUALIFIED, RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS)) {
            move(state, RoundAction.CANCEL, RoundState.CANCELLED);
        }

        work(RoundAction.EDIT_DETAILS, RoundState.DRAFT);
        work(RoundAction.EDIT_DRAFT_PLAN, RoundState.DRAFT);
        work(RoundAction.NEW_PLAN_VERSION, RoundState.PLAN_FROZEN, RoundState.ENROLLING, RoundState.ITEMS_QUALIFIED,
                RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED, RoundState.EVALUATING);
        work(RoundAction.ENROL, RoundState.ENROLLING, RoundState.ITEMS_QUALIFIED);
        work(RoundAction.UPLOAD_QUALIFICATION_DATA, RoundState.ENROLLING);
        work(RoundAction.RECORD_QUALIFICATION_DECISION, RoundState.ENROLLING, RoundState.ITEMS_QUALIFIED,
                RoundState.DISPATCHED);
        work(RoundAction.ACKNOWLEDGE_RECEIPT, RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED);
        work(RoundAction.REPLACE_ITEM, RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED);
        work(RoundAction.WITHDRAW_ITEM, RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED);

        // the plan may never change once results are visible beyond their own laboratory
        for (RoundState state : RoundState.values()) {
            if (state.resultsVisibleBeyondOwnLab() && WORK.get(state).contains(RoundAction.NEW_PLAN_VERSION)) {
                throw new IllegalStateException("plan change allowed after results became visible: " + state);
            }
        }
    }

    private RoundStateMachine() {
    }

    private static void move(RoundState from, RoundAction action, RoundState to) {
        TRANSITIONS.get(from).put(action, to);
    }

    private static void work(RoundAction action, RoundState... states) {
        for (RoundState state : states) {
            WORK.get(state).add(action);
        }
    }

    /** Whether the action is allowed in the state. */
    public static boolean allows(RoundState state, RoundAction action) {
        return action.changesState() ? TRANSITIONS.get(state).containsKey(action) : WORK.get(state).contains(action);
    }

    /** The state a lifecycle action leads to from {@code state}, if allowed. */
    public static Optional<RoundState> next(RoundState state, RoundAction action) {
        return Optional.ofNullable(TRANSITIONS.get(state).get(action));
    }

    /** The actions allowed in a state, lifecycle and work, in declaration order. */
    public static Set<RoundAction> allowed(RoundState state) {
        EnumSet<RoundAction> all = EnumSet.noneOf(RoundAction.class);
        all.addAll(TRANSITIONS.get(state).keySet());
        all.addAll(WORK.get(state));
        return Collections.unmodifiableSet(all);
    }

    /** Refuses, with a message naming the state, an action that is not allowed in it. */
    public static void require(RoundState state, RoundAction action) {
        if (!allows(state, action)) {
            throw new DomainException.Conflict(refusal(state, action));
        }
    }

    static String refusal(RoundState state, RoundAction action) {
        return "The round is " + describe(state) + ": " + describe(action) + " is not possible now.";
    }

    public static String describe(RoundState state) {
        return state.name().toLowerCase(java.util.Locale.ROOT).replace('_', ' ');
    }

    public static String describe(RoundAction action) {
        String words = action.name().toLowerCase(java.util.Locale.ROOT).replace('_', ' ');
        return Character.toUpperCase(words.charAt(0)) + words.substring(1);
    }
}
