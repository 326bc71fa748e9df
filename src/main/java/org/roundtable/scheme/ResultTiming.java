package org.roundtable.scheme;

import java.time.Instant;

/**
 * How a result arriving at a given moment is to be treated under the round's late-result policy — for the
 * submissions feature, which asks {@link RoundService#resultTiming(long)} with the injected clock's "now".
 * <ul>
 *   <li>results are taken only while the round is {@code OPEN_FOR_RESULTS}; closing the round ends them all;</li>
 *   <li>up to and including the deadline a result is on time;</li>
 *   <li>after it: refused under {@code REFUSE}; otherwise accepted and flagged late, scored or not as the policy
 *       says.</li>
 * </ul>
 */
public enum ResultTiming {
    ON_TIME, LATE_SCORED, LATE_UNSCORED, REFUSED;

    public static ResultTiming of(RoundState state, Instant deadline, Round.LatePolicy policy, Instant at) {
        if (state != RoundState.OPEN_FOR_RESULTS) {
            return REFUSED;
        }
        if (!at.isAfter(deadline)) {
            return ON_TIME;
        }
        return switch (policy) {
            case REFUSE -> REFUSED;
            case ACCEPT_FLAGGED_SCORED -> LATE_SCORED;
            case ACCEPT_FLAGGED_UNSCORED -> LATE_UNSCORED;
        };
    }
}
