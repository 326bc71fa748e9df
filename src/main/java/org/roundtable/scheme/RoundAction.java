package org.roundtable.scheme;

/**
 * Everything that can be done to a round. Lifecycle actions move it to another state; the others act on
 * it and are allowed only in some states. {@link RoundStateMachine} holds the one table of which action is
 * allowed where.
 */
public enum RoundAction {
    // lifecycle: state changes
    FREEZE_PLAN(true, true),
    OPEN_ENROLMENT(true, true),
    CONFIRM_QUALIFICATION(true, true),
    DISPATCH_ITEMS(true, true),
    OPEN_FOR_RESULTS(true, true),
    CLOSE(true, true),
    START_EVALUATION(true, false),
    ISSUE_PRELIMINARY(true, false),
    OPEN_COMMENT_PERIOD(true, false),
    ISSUE_FINAL(true, false),
    AMEND(true, false),
    ARCHIVE(true, false),
    CANCEL(true, true),
    // work within a state
    EDIT_DETAILS(false, true),
    EDIT_DRAFT_PLAN(false, true),
    NEW_PLAN_VERSION(false, true),
    ENROL(false, true),
    UPLOAD_QUALIFICATION_DATA(false, true),
    RECORD_QUALIFICATION_DECISION(false, true),
    ACKNOWLEDGE_RECEIPT(false, true),
    REPLACE_ITEM(false, true),
    WITHDRAW_ITEM(false, true);

    private final boolean changesState;
    private final boolean availableNow;

    RoundAction(boolean changesState, boolean availableNow) {
        this.changesState = changesState;
        this.availableNow = availableNow;
    }

    /** Whether the action moves the round to another state. */
    public boolean changesState() {
        return changesState;
    }

    /**
     * Whether a coordinator can take this action through the round API today. Evaluation and report actions
     * are in the table already but are taken by the features that produce their evidence (scores, reports).
     */
    public boolean availableNow() {
        return availableNow;
    }
}
