package org.roundtable.coordinator;

import java.time.OffsetDateTime;

/**
 * The next step of a round, in plain words, with the page where it is taken.
 *
 * @param roundId    the round
 * @param roundCode  its code
 * @param schemeName its scheme
 * @param state      the round's state (a {@code RoundState} name; pages show its label)
 * @param kind       what kind of step (a stable key such as {@code results-missing}; for tests and styling only)
 * @param heading    what is the matter, in a few words ("Closed, not evaluated")
 * @param detail     one sentence: what to do and why
 * @param actionLabel the words of the link to the step ("Evaluate the results"); null when there is nothing to do
 * @param actionPath  where the step is taken; null when there is nothing to do
 * @param due        the moment that matters (the result deadline), or null
 * @param dueZone    the zone {@code due} is shown in (the round's)
 * @param needsMe    whether a coordinator has to act (shown on the coordinator's home)
 * @param finished   whether the round is done (final report issued, archived or cancelled)
 * @param order      urgency for sorting the home page: lower first
 */
public record NextStep(long roundId, String roundCode, String schemeName, String state, String kind, String heading,
                       String detail, String actionLabel, String actionPath, OffsetDateTime due, String dueZone,
                       boolean needsMe, boolean finished, int order) {

    /**
     * Whether the step is taken on the page {@code page} of the round ({@code round}, {@code plan}, {@code evaluation},
     * {@code reports}, {@code submissions}), so that the page need not link to itself.
     */
    public boolean takenOn(String page) {
        if (actionPath == null || page == null) {
            return false;
        }
        String path = actionPath.contains("#") ? actionPath.substring(0, actionPath.indexOf('#')) : actionPath;
        String round = "/rounds/" + roundId;
        return "round".equals(page) ? path.equals(round) : path.equals(round + "/" + page);
    }
}
