package org.roundtable.scheme;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.platform.DomainException;

import java.util.Arrays;
import java.util.EnumSet;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;

import static java.util.Map.entry;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/**
 * The state table, every action in every state, against an expectation written out independently here
 * (the workflow of the round as designed; common practice, no source).
 */
class RoundStateMachineTest {

    /** state.action → next state, for every allowed lifecycle step. */
    static final Map<String, RoundState> EXPECTED_MOVES = Map.ofEntries(
            entry("DRAFT.FREEZE_PLAN", RoundState.PLAN_FROZEN),
            entry("PLAN_FROZEN.OPEN_ENROLMENT", RoundState.ENROLLING),
            entry("ENROLLING.CONFIRM_QUALIFICATION", RoundState.ITEMS_QUALIFIED),
            entry("ITEMS_QUALIFIED.DISPATCH_ITEMS", RoundState.DISPATCHED),
            entry("DISPATCHED.OPEN_FOR_RESULTS", RoundState.OPEN_FOR_RESULTS),
            entry("OPEN_FOR_RESULTS.CLOSE", RoundState.CLOSED),
            entry("CLOSED.START_EVALUATION", RoundState.EVALUATING),
            entry("EVALUATING.ISSUE_PRELIMINARY", RoundState.PRELIMINARY_ISSUED),
            entry("PRELIMINARY_ISSUED.OPEN_COMMENT_PERIOD", RoundState.COMMENT_PERIOD),
            entry("COMMENT_PERIOD.ISSUE_FINAL", RoundState.FINAL_ISSUED),
            entry("FINAL_ISSUED.AMEND", RoundState.AMENDED),
            entry("AMENDED.AMEND", RoundState.AMENDED),
            entry("FINAL_ISSUED.ARCHIVE", RoundState.ARCHIVED),
            entry("AMENDED.ARCHIVE", RoundState.ARCHIVED),
            entry("DRAFT.CANCEL", RoundState.CANCELLED),
            entry("PLAN_FROZEN.CANCEL", RoundState.CANCELLED),
            entry("ENROLLING.CANCEL", RoundState.CANCELLED),
            entry("ITEMS_QUALIFIED.CANCEL", RoundState.CANCELLED),
            entry("DISPATCHED.CANCEL", RoundState.CANCELLED),
            entry("OPEN_FOR_RESULTS.CANCEL", RoundState.CANCELLED));

    /** Work actions and the states they are allowed in. */
    static final Map<RoundAction, Set<RoundState>> EXPECTED_WORK = Map.of(
            RoundAction.EDIT_DETAILS, EnumSet.of(RoundState.DRAFT),
            RoundAction.EDIT_DRAFT_PLAN, EnumSet.of(RoundState.DRAFT),
            RoundAction.NEW_PLAN_VERSION, EnumSet.of(RoundState.PLAN_FROZEN, RoundState.ENROLLING,
                    RoundState.ITEMS_QUALIFIED, RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED,
                    RoundState.EVALUATING),
            RoundAction.ENROL, EnumSet.of(RoundState.ENROLLING, RoundState.ITEMS_QUALIFIED),
            RoundAction.UPLOAD_QUALIFICATION_DATA, EnumSet.of(RoundState.ENROLLING),
            RoundAction.RECORD_QUALIFICATION_DECISION, EnumSet.of(RoundState.ENROLLING, RoundState.ITEMS_QUALIFIED,
                    RoundState.DISPATCHED),
            RoundAction.ACKNOWLEDGE_RECEIPT, EnumSet.of(RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED),
            RoundAction.REPLACE_ITEM, EnumSet.of(RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED),
            RoundAction.WITHDRAW_ITEM, EnumSet.of(RoundState.DISPATCHED, RoundState.OPEN_FOR_RESULTS, RoundState.CLOSED));

    static Stream<Arguments> everyActionInEveryState() {
        return Arrays.stream(RoundState.values())
                .flatMap(state -> Arrays.stream(RoundAction.values()).map(action -> Arguments.of(state, action)));
    }

    @ParameterizedTest(name = "{1} in {0}")
    @MethodSource("everyActionInEveryState")
    void everyActionIsAllowedExactlyWhereTheWorkflowSays(RoundState state, RoundAction action) {
        boolean expected;
        if (action.changesState()) {
            RoundState next = EXPECTED_MOVES.get(state.name() + "." + action.name());
            expected = next != null;
            assertThat(RoundStateMachine.next(state, action)).isEqualTo(java.util.Optional.ofNullable(next));
        } else {
            expected = EXPECTED_WORK.get(action).contains(state);
            assertThat(RoundStateMachine.next(state, action)).isEmpty();
        }
        assertThat(RoundStateMachine.allows(state, action)).isEqualTo(expected);
        if (expected) {
            RoundStateMachine.require(state, action);
        } else {
            assertThatThrownBy(() -> RoundStateMachine.require(state, action))
                    .isInstanceOf(DomainException.Conflict.class)
                    .hasMessageContaining("The round is " + state.name().toLowerCase().replace('_', ' '))
                    .hasMessageContaining("is not possible now");
        }
    }

    @Test
    void thePlanCanNeverChangeOnceResultsAreVisibleBeyondTheirOwnLaboratory() {
        for (RoundState state : RoundState.values()) {
            if (state.resultsVisibleBeyondOwnLab()) {
                assertThat(RoundStateMachine.allows(state, RoundAction.NEW_PLAN_VERSION)).as(state.name()).isFalse();
                assertThat(RoundStateMachine.allows(state, RoundAction.EDIT_DRAFT_PLAN)).as(state.name()).isFalse();
            }
        }
    }

    @Test
    void onlyArchivedAndCancelledRoundsHaveNoWayOut() {
        for (RoundState state : RoundState.values()) {
            boolean hasExit = Arrays.stream(RoundAction.values())
                    .anyMatch(a -> a.changesState() && RoundStateMachine.next(state, a).filter(n -> n != state).isPresent());
            assertThat(hasExit).as(state.name()).isEqualTo(state != RoundState.ARCHIVED && state != RoundState.CANCELLED);
        }
    }
}
