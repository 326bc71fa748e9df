package org.roundtable.submission;

import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.annotation.security.RolesAllowed;
import jakarta.ws.rs.GET;
import jakarta.ws.rs.Path;
import jakarta.ws.rs.Produces;
import jakarta.ws.rs.core.MediaType;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.notice.NoticeService;
import org.roundtable.scheme.EnrolmentService;
import org.roundtable.scheme.RoundAction;
import org.roundtable.scheme.RoundState;
import org.roundtable.scheme.RoundStateMachine;

import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;

/**
 * Where an analyst or a laboratory manager starts: the laboratory's rounds and what is due in each — acknowledge
 * the sample, results due (deadline in the round's and the viewer's zone, named), comment period open, report
 * issued, a question answered — each with its link; then the person's unread notices (from the notice service).
 */
@Path("/laboratory")
@Produces(MediaType.TEXT_HTML)
public class LaboratoryHomePage {

    /** Rounds shown here: those still running or with reports; cancelled and archived ones are on "My rounds". */
    private static final Set<String> SHOWN_STATES = Set.of("ENROLLING", "ITEMS_QUALIFIED", "DISPATCHED",
            "OPEN_FOR_RESULTS", "CLOSED", "EVALUATING", "PRELIMINARY_ISSUED", "COMMENT_PERIOD", "FINAL_ISSUED",
            "AMENDED");
    /** Unread notices shown on the home page; the rest are on the notice list. */
    static final int NOTICES_SHOWN = 5;

    /** Something the laboratory should do or read now, with where to do it. */
    public record Due(String what, String detail, String link, String linkText, OffsetDateTime deadline, String zone) {
    }

    /** One of the laboratory's rounds with what is due in it. */
    public record RoundLine(long roundId, String roundCode, String schemeName, String participantCode, String state,
                            OffsetDateTime resultDeadline, String timeZone, List<Due> due) {
    }

    @CheckedTemplate(basePath = "submission")
    static class Templates {
        static native TemplateInstance home(List<RoundLine> rounds, List<NoticeService.NoticeView> notices,
                                            long unread);
    }

    private final EnrolmentService enrolments;
    private final SubmissionQueries queries;
    private final SubmissionMessages messages;
    private final NoticeService notices;
    private final CurrentUser currentUser;

    public LaboratoryHomePage(EnrolmentService enrolments, SubmissionQueries queries, SubmissionMessages messages,
                              NoticeService notices, CurrentUser currentUser) {
        this.enrolments = enrolments;
        this.queries = queries;
        this.messages = messages;
        this.notices = notices;
        this.currentUser = currentUser;
    }

    @GET
    @RolesAllowed({Role.LAB_MANAGER_NAME, Role.LAB_MEMBER_NAME})
    public TemplateInstance home() {
        List<RoundLine> lines = new ArrayList<>();
        // what is due in every round from one query each (items, revisions, messages), never a query per round
        java.util.Map<Long, List<String>> waiting = enrolments.myItemsAwaitingReceipt();
        java.util.Map<Long, Integer> revisions = queries.myCurrentRevisions();
        Set<Long> answered = messages.roundsAnsweredLast();
        for (EnrolmentService.MyRoundSummary r : enrolments.myRounds()) {
            if (SHOWN_STATES.contains(r.state())) {
                lines.add(new RoundLine(r.roundId(), r.roundCode(), r.schemeName(), r.participantCode(), r.state(),
                        r.resultDeadline(), r.timeZone(), due(r, waiting.getOrDefault(r.roundId(), List.of()),
                        revisions.get(r.roundId()), answered.contains(r.roundId()))));
            }
        }
        // rounds with something due first, then as "My rounds" lists them (latest deadline first)
        List<RoundLine> ordered = new ArrayList<>(lines.stream().filter(l -> !l.due().isEmpty()).toList());
        ordered.addAll(lines.stream().filter(l -> l.due().isEmpty()).toList());
        // an API token acts for the laboratory, not for a person with notices
        NoticeService.NoticePage page = currentUser.userId().map(id -> notices.page(id, 1)).orElse(null);
        List<NoticeService.NoticeView> unread = page == null ? List.of()
                : page.notices().stream().filter(n -> !n.read()).limit(NOTICES_SHOWN).toList();
        return Templates.home(ordered, unread, page == null ? 0 : page.unread());
    }

    private static List<Due> due(EnrolmentService.MyRoundSummary r, List<String> waiting, Integer currentRevision,
                                 boolean answered) {
        List<Due> due = new ArrayList<>();
        String round = "/my-rounds/" + r.roundId();
        if (r.state().equals("DISPATCHED") || r.state().equals("OPEN_FOR_RESULTS")) {
            boolean receiptOpen = RoundStateMachine.allows(RoundState.valueOf(r.state()), RoundAction.ACKNOWLEDGE_RECEIPT);
            if (receiptOpen && !waiting.isEmpty()) {
                due.add(new Due("Acknowledge the sample", (waiting.size() == 1 ? "Item " : "Items ")
                        + String.join(", ", waiting) + ": tell us when and in what condition it arrived.", round,
                        "Acknowledge receipt", null, null));
            }
        }
        if (r.state().equals("OPEN_FOR_RESULTS")) {
            String sent = currentRevision == null ? "Not sent yet."
                    : "Revision " + currentRevision + " received; you may still send a new one.";
            due.add(new Due("Results due", sent, round + "/results",
                    currentRevision == null ? "Enter results" : "See or change results", r.resultDeadline(),
                    r.timeZone()));
        }
        if (r.state().equals("COMMENT_PERIOD")) {
            due.add(new Due("Comment period open", "Read the preliminary report and comment on it if something is wrong.",
                    round + "/reports", "Read and comment", null, null));
        }
        if (r.state().equals("PRELIMINARY_ISSUED") || r.state().equals("FINAL_ISSUED") || r.state().equals("AMENDED")) {
            due.add(new Due("Report issued", r.state().equals("PRELIMINARY_ISSUED") ? "The preliminary report is out."
                    : "The final report is out.", round + "/reports", "Read the report", null, null));
        }
        if (!r.state().equals("ENROLLING") && !r.state().equals("ITEMS_QUALIFIED")) {
            if (answered) {
                due.add(new Due("Your question was answered", "The coordinator answered on the results page.",
                        round + "/results#messages", "Read the answer", null, null));
            }
        }
        return due;
    }
}
