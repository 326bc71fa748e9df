package org.roundtable.coordinator;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.inject.Named;
import jakarta.transaction.Transactional;
import org.roundtable.evaluation.RunsOfRounds;
import org.roundtable.platform.DomainException;
import org.roundtable.report.ReportWork;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundKind;
import org.roundtable.scheme.RoundState;
import org.roundtable.scheme.RoundStateMachine;
import org.roundtable.scheme.RoundSummaries;
import org.roundtable.submission.ResultCounts;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The next step of a round, whatever page it is taken on, and the rounds that need a coordinator now. The facts
 * come from each feature in one query for all rounds asked about (rounds and enrolment, results, evaluation runs,
 * reports); {@link #decide} turns one round's facts into its step. Templates ask {@code inject:nextSteps}.
 *
 * <p>A round "needs me" when a coordinator has to act: prepare it (plan, enrolment, qualification, dispatch,
 * opening), chase missing results when the deadline is near ({@link #DEADLINE_NEAR}) or past, close it, evaluate
 * it, review the evaluation and issue the preliminary report, open the comment period, answer comments, sign the
 * final report off, issue it. Waiting for the laboratories before the deadline, or for a report job, does not.
 */
@ApplicationScoped
@Named("nextSteps")
public class NextSteps {

    /** How soon before the result deadline missing results become something to chase (common practice, no source). */
    public static final Duration DEADLINE_NEAR = Duration.ofDays(7);

    private final RoundSummaries rounds;
    private final ResultCounts results;
    private final RunsOfRounds runs;
    private final ReportWork reports;
    private final Clock clock;

    public NextSteps(RoundSummaries rounds, ResultCounts results, RunsOfRounds runs, ReportWork reports, Clock clock) {
        this.rounds = rounds;
        this.results = results;
        this.runs = runs;
        this.reports = reports;
        this.clock = clock;
    }

    /** What is known about a round for deciding its next step. */
    record Facts(RoundSummaries.Summary round, long reported, RunsOfRounds.LatestRun run, ReportWork.Open reports) {
    }

    /** The next step of one round; "not found" for a missing round. */
    @Transactional
    public NextStep forRound(long roundId) {
        List<NextStep> steps = ofRounds(List.of(roundId));
        if (steps.isEmpty()) {
            throw new DomainException.NotFound("The round");
        }
        return steps.get(0);
    }

    /** The next steps of every round that is not finished and needs a coordinator, the most urgent first. */
    @Transactional
    public List<NextStep> needingMe() {
        return steps(rounds.unfinished()).stream().filter(NextStep::needsMe)
                .sorted(Comparator.comparingInt(NextStep::order)
                        .thenComparing(s -> s.due() == null ? Instant.MAX : s.due().toInstant())
                        .thenComparing(NextStep::roundCode))
                .toList();
    }

    /** The next steps of the given rounds, in the order of their ids. */
    @Transactional
    public List<NextStep> ofRounds(Collection<Long> roundIds) {
        return steps(rounds.of(roundIds));
    }

    /** Whether the state table allows the action in the state (for pages that hide forms that would be refused). */
    public boolean allows(String state, String action) {
        try {
            return RoundStateMachine.allows(RoundState.valueOf(state), RoundAction.valueOf(action));
        } catch (IllegalArgumentException | NullPointerException e) {
            return false;
        }
    }

    private List<NextStep> steps(List<RoundSummaries.Summary> summaries) {
        List<Long> ids = summaries.stream().map(RoundSummaries.Summary::id).toList();
        Map<Long, Long> reported = results.laboratoriesWithResults(ids);
        Map<Long, RunsOfRounds.LatestRun> latest = runs.latest(ids);
        Map<Long, ReportWork.Open> open = reports.of(ids);
        Instant now = clock.instant();
        List<NextStep> steps = new ArrayList<>();
        for (RoundSummaries.Summary s : summaries) {
            steps.add(decide(new Facts(s, reported.getOrDefault(s.id(), 0L), latest.get(s.id()),
                    open.getOrDefault(s.id(), ReportWork.Open.NONE)), now));
        }
        return steps;
    }

    /** The next step of a round from its facts at {@code now}. */
    static NextStep decide(Facts f, Instant now) {
        RoundSummaries.Summary r = f.round();
        Step step = new Step(r);
        String round = "/rounds/" + r.id();
        String steps = round + "#steps";
        if (r.kind() == RoundKind.PRECISION_EXPERIMENT && !finished(r.state())) {
            return step.needs(60, "precision", "Precision experiment",
                    "Its plan, results, evaluation and report are handled on the experiment's own page.",
                    "Open the precision experiment", "/precision-experiments/" + r.id());
        }
        switch (r.state()) {
            case DRAFT -> {
                return r.hasDraftPlan()
                        ? step.needs(80, "freeze-plan", "Draft, plan written",
                        "Check the evaluation plan and freeze it: enrolment opens after that.", "Freeze the plan", steps)
                        : step.needs(80, "write-plan", "Draft, no plan yet",
                        "Write the evaluation plan: for each measurand, how the assigned value and σpt are found.",
                        "Write the evaluation plan", round + "/plan");
            }
            case PLAN_FROZEN -> {
                return step.needs(81, "open-enrolment", "Plan frozen",
                        "Open enrolment so that laboratories can be enrolled and given their participant codes.",
                        "Open enrolment", steps);
            }
            case ENROLLING -> {
                return step.needs(82, "qualify", "Enrolling",
                        r.enrolled() + (r.enrolled() == 1 ? " laboratory is" : " laboratories are")
                                + " enrolled. Check homogeneity and stability of the items, then confirm the qualification.",
                        "Qualify the items", round + "/qualification");
            }
            case ITEMS_QUALIFIED -> {
                return step.needs(83, "dispatch", "Items qualified",
                        "Dispatch the items to the " + r.enrolled() + " enrolled "
                                + (r.enrolled() == 1 ? "laboratory." : "laboratories."), "Dispatch the items", steps);
            }
            case DISPATCHED -> {
                return step.needs(84, "open-results", "Items dispatched",
                        "Open the round for results when the laboratories have their items.",
                        "Open for results", steps);
            }
            case OPEN_FOR_RESULTS -> {
                long missing = Math.max(0, r.enrolled() - f.reported());
                boolean past = !r.resultDeadline().toInstant().isAfter(now);
                boolean near = !past && Duration.between(now, r.resultDeadline().toInstant()).compareTo(DEADLINE_NEAR) <= 0;
                String count = f.reported() + " of " + r.enrolled() + " laboratories have reported.";
                if (past) {
                    return missing > 0
                            ? step.due(r).needs(10, "results-missing", "Deadline passed, results missing",
                            count + " Remind the " + missing + " missing, or close the round.",
                            "See who has not reported", round + "/submissions")
                            : step.due(r).needs(11, "close", "Deadline passed, every result in",
                            count + " Close the round to evaluate it.", "Close the round", steps);
                }
                if (near && missing > 0) {
                    return step.due(r).needs(12, "results-missing", "Deadline near, results missing",
                            count + " Remind the " + missing + " missing before the deadline.",
                            "See who has not reported", round + "/submissions");
                }
                if (missing == 0) {
                    return step.due(r).waiting("collecting", "Open for results, every result in",
                            count + " The round can be closed before its deadline.", "Close the round", steps);
                }
                return step.due(r).waiting("collecting", "Open for results",
                        count + " Nothing to do before the deadline.", "See the submissions", round + "/submissions");
            }
            case CLOSED, EVALUATING -> {
                if (f.reports().issuing()) {
                    return step.waiting("issuing", "Reports being issued",
                            "The preliminary reports are being rendered in the background.", "Follow the issue",
                            round + "/reports");
                }
                if (f.run() == null) {
                    return step.needs(20, "evaluate", "Closed, not evaluated",
                            f.reported() + " of " + r.enrolled() + " laboratories reported. Evaluate the results.",
                            "Evaluate the results", round + "/evaluation");
                }
                return step.needs(30, "review", "Evaluation ready for review",
                        "Review evaluation version " + f.run().version()
                                + ", then issue the preliminary report from it on the reports page.",
                        "Review evaluation version " + f.run().version(), round + "/evaluation/" + f.run().version());
            }
            case PRELIMINARY_ISSUED -> {
                return step.needs(40, "comment-period", "Preliminary report issued",
                        "Open the comment period so that laboratories can comment on the preliminary report.",
                        "Open the comment period", round + "/reports");
            }
            case COMMENT_PERIOD -> {
                if (f.reports().issuing()) {
                    return step.waiting("issuing", "Final reports being issued",
                            "The final reports are being rendered in the background.", "Follow the issue",
                            round + "/reports");
                }
                long comments = f.reports().unansweredComments();
                if (comments > 0) {
                    return step.needs(41, "comments", comments == 1 ? "1 comment waiting for an answer"
                                    : comments + " comments waiting for an answer",
                            "Answer the laboratories' comments on the preliminary report before the final sign-off.",
                            "Answer the comments", round + "/reports#comments");
                }
                int needed = r.secondReviewerRequired() ? 2 : 1;
                int signed = f.reports().signOffs();
                if (signed == 0) {
                    return step.needs(42, "sign-off", "Sign-off waiting",
                            "Sign the final report off for the evaluation run it is issued from"
                                    + (needed == 2 ? "; a second coordinator signs after you." : "."),
                            "Sign the final report off", round + "/reports");
                }
                if (signed < needed) {
                    return step.needs(43, "second-sign-off", "Second sign-off waiting",
                            "The scheme requires a second reviewer: another coordinator signs the final report off.",
                            "Sign off as second reviewer", round + "/reports");
                }
                return step.needs(44, "issue-final", "Final report to issue",
                        "The final report is signed off. Issue it to the laboratories.", "Issue the final report",
                        round + "/reports");
            }
            case FINAL_ISSUED, AMENDED -> {
                if (f.reports().issuing()) {
                    return step.waiting("issuing", "Amended reports being issued",
                            "The amended reports are being rendered in the background.", "Follow the issue",
                            round + "/reports");
                }
                return step.done("done", r.state() == RoundState.AMENDED ? "Amended report issued" : "Final report issued",
                        "The round is finished. An amendment, if one is ever needed, starts on the reports page.",
                        "See the reports", round + "/reports");
            }
            case ARCHIVED -> {
                return step.done("archived", "Archived", "The round is finished and archived.", "See the reports",
                        round + "/reports");
            }
            case CANCELLED -> {
                return step.done("cancelled", "Cancelled", "The round was cancelled: nothing is evaluated or reported.",
                        null, null);
            }
            default -> throw new IllegalStateException("no next step for " + r.state().name().toLowerCase(Locale.ROOT));
        }
    }

    private static boolean finished(RoundState state) {
        return state == RoundState.FINAL_ISSUED || state == RoundState.AMENDED || state == RoundState.ARCHIVED
                || state == RoundState.CANCELLED;
    }

    /** Builds the step of one round. */
    private static final class Step {
        private final RoundSummaries.Summary r;
        private boolean withDeadline;

        Step(RoundSummaries.Summary r) {
            this.r = r;
        }

        Step due(RoundSummaries.Summary round) {
            withDeadline = true;
            return this;
        }

        NextStep needs(int order, String kind, String heading, String detail, String label, String path) {
            return make(order, kind, heading, detail, label, path, true, false);
        }

        NextStep waiting(String kind, String heading, String detail, String label, String path) {
            return make(90, kind, heading, detail, label, path, false, false);
        }

        NextStep done(String kind, String heading, String detail, String label, String path) {
            return make(99, kind, heading, detail, label, path, false, true);
        }

        private NextStep make(int order, String kind, String heading, String detail, String label, String path,
                              boolean needsMe, boolean finished) {
            return new NextStep(r.id(), r.code(), r.schemeName(), r.state().name(), kind, heading, detail, label, path,
                    withDeadline ? r.resultDeadline() : null, r.timeZone(), needsMe, finished, order);
        }
    }
}
