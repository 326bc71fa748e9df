package org.roundtable.scheme;

/**
 * The states of a round, in their usual order, with our own names. A round moves only by a
 * {@link RoundAction} that {@link RoundStateMachine} allows in its current state.
 * <ul>
 *   <li>{@code DRAFT} — round details and the evaluation plan are being written;</li>
 *   <li>{@code PLAN_FROZEN} — plan version 1 is stored with its hash; details no longer change;</li>
 *   <li>{@code ENROLLING} — laboratories are enrolled and get participant codes; items are qualified;</li>
 *   <li>{@code ITEMS_QUALIFIED} — every measurand passed homogeneity/stability or has a recorded decision;</li>
 *   <li>{@code DISPATCHED} — items are on their way; laboratories acknowledge receipt;</li>
 *   <li>{@code OPEN_FOR_RESULTS} — results are accepted (the submissions feature);</li>
 *   <li>{@code CLOSED} — no more results except as the late-result policy allows; data frozen;</li>
 *   <li>{@code EVALUATING}, {@code PRELIMINARY_ISSUED}, {@code COMMENT_PERIOD}, {@code FINAL_ISSUED},
 *       {@code AMENDED}, {@code ARCHIVED} — evaluation and reports (driven by later features);</li>
 *   <li>{@code CANCELLED} — side state: the round was abandoned before evaluation.</li>
 * </ul>
 * A withdrawn item is not a round state here: it is recorded on the items and announced in a notice, and
 * the round goes on with its other items and measurands.
 */
public enum RoundState {
    DRAFT, PLAN_FROZEN, ENROLLING, ITEMS_QUALIFIED, DISPATCHED, OPEN_FOR_RESULTS, CLOSED, EVALUATING,
    PRELIMINARY_ISSUED, COMMENT_PERIOD, FINAL_ISSUED, AMENDED, ARCHIVED, CANCELLED;

    /**
     * Whether results of this round may have been shown to someone other than the laboratory that
     * reported them: from the preliminary report on. The submissions feature may refine this.
     */
    public boolean resultsVisibleBeyondOwnLab() {
        return switch (this) {
            case PRELIMINARY_ISSUED, COMMENT_PERIOD, FINAL_ISSUED, AMENDED, ARCHIVED -> true;
            default -> false;
        };
    }

    /** Whether the round has been enrolled and items may be handled (receipts, replacements). */
    public boolean itemsOut() {
        return this == DISPATCHED || this == OPEN_FOR_RESULTS || this == CLOSED;
    }
}
