package org.roundtable.coordinator;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The next step of a round in each state that needs a coordinator, and the coordinator's home listing each kind of
 * round that needs action with the link to its step. Rounds are placed straight in their state (testing/World) with
 * the rows that state implies: results, evaluation runs, issued round reports, comments, sign-offs.
 */
@QuarkusTest
class NextStepsTest {

    @Inject
    World world;

    @Inject
    NextSteps nextSteps;

    private String code(long round) {
        return world.text("SELECT code FROM round WHERE id = ?", round);
    }

    private void reported(long round, long laboratory) {
        world.insert("INSERT INTO submission (round_id, laboratory_id, current_revision, created_at, updated_at) "
                + "VALUES (?, ?, 1, now(), now()) RETURNING id", round, laboratory);
    }

    private long run(long round) {
        return world.insert("INSERT INTO evaluation_run (round_id, version, preview, round_state, plan_version, plan_sha256, "
                + "inputs_sha256, outputs_sha256, code_version, created_by, created_at) VALUES (?, 1, false, 'CLOSED', 1, "
                + "repeat('a', 64), repeat('b', 64), repeat('c', 64), 'test', 'world', now()) RETURNING id", round);
    }

    private long roundReport(long round, String status) {
        String id = World.unique("RT-NS");
        return world.insert("INSERT INTO issued_document (report_id, kind, status, round_id, content_type, bytes, sha256, "
                + "issued_at, issued_by) VALUES (?, 'ROUND', ?, ?, 'application/pdf', convert_to(?, 'UTF8'), "
                + "encode(sha256(convert_to(?, 'UTF8')), 'hex'), now(), 'world') RETURNING id", id, status, round, id, id);
    }

    private void signOff(long round, long run, String role, String username) {
        world.insert("INSERT INTO report_sign_off (round_id, sequence, evaluation_run_id, role, username, display_name, "
                + "signed_at) VALUES (?, 0, ?, ?, ?, 'A coordinator', now()) RETURNING id", round, run, role, username);
    }

    /** A round in the comment period: its run, its preliminary round report. Returns {round, run, document}. */
    private long[] inCommentPeriod(long laboratory) {
        long round = world.round(RoundState.COMMENT_PERIOD, laboratory);
        reported(round, laboratory);
        long run = run(round);
        long document = roundReport(round, "PRELIMINARY");
        return new long[]{round, run, document};
    }

    /** The kind of every step of the given rounds, by round. */
    private Map<Long, String> kinds(long... rounds) {
        Map<Long, String> kinds = new LinkedHashMap<>();
        for (long round : rounds) {
            kinds.put(round, nextSteps.forRound(round).kind());
        }
        return kinds;
    }

    @Test
    void eachStateOfARoundHasItsNextStepWithTheLinkToThePageWhereItIsTaken() {
        long labA = world.laboratory();
        long labB = world.laboratory();

        long noPlan = world.round(RoundState.DRAFT);
        world.sql("UPDATE round SET draft_plan = NULL WHERE id = ?", noPlan);
        long draft = world.round(RoundState.DRAFT);
        long enrolling = world.round(RoundState.ENROLLING, labA);

        long soon = world.round(RoundState.OPEN_FOR_RESULTS, labA, labB);
        world.sql("UPDATE round SET result_deadline = now() + interval '2 days' WHERE id = ?", soon);
        reported(soon, labA);
        long later = world.round(RoundState.OPEN_FOR_RESULTS, labA, labB);
        reported(later, labA);
        long due = world.round(RoundState.OPEN_FOR_RESULTS, labA);
        world.sql("UPDATE round SET result_deadline = now() - interval '1 hour' WHERE id = ?", due);
        reported(due, labA);

        long closed = world.round(RoundState.CLOSED, labA);
        long evaluated = world.round(RoundState.CLOSED, labA);
        run(evaluated);
        long preliminary = world.round(RoundState.PRELIMINARY_ISSUED, labA);

        long[] commented = inCommentPeriod(labA);
        world.insert("INSERT INTO report_comment (round_id, document_id, laboratory_id, participant_code, body, written_by, "
                + "written_at) VALUES (?, ?, ?, 'ABCD', 'Our Cr value was typed with a comma', 'world', now()) RETURNING id",
                commented[0], commented[2], labA);
        long[] unsigned = inCommentPeriod(labA);
        long[] halfSigned = inCommentPeriod(labA);
        world.sql("UPDATE scheme SET second_reviewer_required = true WHERE id = (SELECT scheme_id FROM round WHERE id = ?)",
                halfSigned[0]);
        signOff(halfSigned[0], halfSigned[1], "COORDINATOR", "first-coordinator");
        long[] signed = inCommentPeriod(labA);
        signOff(signed[0], signed[1], "COORDINATOR", "first-coordinator");
        long finished = world.round(RoundState.FINAL_ISSUED, labA);

        assertThat(kinds(noPlan, draft, enrolling, soon, later, due, closed, evaluated, preliminary, commented[0],
                unsigned[0], halfSigned[0], signed[0], finished).values()).containsExactly("write-plan", "freeze-plan",
                "qualify", "results-missing", "collecting", "close", "evaluate", "review", "comment-period", "comments",
                "sign-off", "second-sign-off", "issue-final", "done");

        NextStep missing = nextSteps.forRound(soon);
        assertThat(missing.heading()).isEqualTo("Deadline near, results missing");
        assertThat(missing.detail()).contains("1 of 2 laboratories have reported").contains("Remind the 1 missing");
        assertThat(missing.actionPath()).isEqualTo("/rounds/" + soon + "/submissions");
        assertThat(missing.due()).isNotNull();
        assertThat(missing.needsMe()).isTrue();
        assertThat(nextSteps.forRound(later).needsMe()).isFalse();
        assertThat(nextSteps.forRound(noPlan).actionPath()).isEqualTo("/rounds/" + noPlan + "/plan");
        assertThat(nextSteps.forRound(closed).actionPath()).isEqualTo("/rounds/" + closed + "/evaluation");
        assertThat(nextSteps.forRound(evaluated).actionPath()).isEqualTo("/rounds/" + evaluated + "/evaluation/1");
        assertThat(nextSteps.forRound(commented[0]).heading()).isEqualTo("1 comment waiting for an answer");
        assertThat(nextSteps.forRound(signed[0]).actionPath()).isEqualTo("/rounds/" + signed[0] + "/reports");
        NextStep done = nextSteps.forRound(finished);
        assertThat(done.finished()).isTrue();
        assertThat(done.needsMe()).isFalse();

        List<Long> needing = nextSteps.needingMe().stream().map(NextStep::roundId).toList();
        assertThat(needing).contains(noPlan, draft, enrolling, soon, due, closed, evaluated, preliminary, commented[0],
                unsigned[0], halfSigned[0], signed[0]).doesNotContain(later, finished);
        // the most urgent first: missing results before evaluation, evaluation before reports, reports before preparation
        assertThat(needing.indexOf(due)).isLessThan(needing.indexOf(closed));
        assertThat(needing.indexOf(closed)).isLessThan(needing.indexOf(evaluated));
        assertThat(needing.indexOf(evaluated)).isLessThan(needing.indexOf(commented[0]));
        assertThat(needing.indexOf(signed[0])).isLessThan(needing.indexOf(noPlan));
    }

    @Test
    void theCoordinatorsHomeListsEachKindOfRoundThatNeedsActionWithItsNextStep() {
        long lab = world.laboratory();
        long other = world.laboratory();
        long soon = world.round(RoundState.OPEN_FOR_RESULTS, lab, other);
        world.sql("UPDATE round SET result_deadline = now() + interval '1 day' WHERE id = ?", soon);
        long closed = world.round(RoundState.CLOSED, lab);
        long evaluated = world.round(RoundState.CLOSED, lab);
        run(evaluated);
        long[] commented = inCommentPeriod(lab);
        world.insert("INSERT INTO report_comment (round_id, document_id, laboratory_id, participant_code, body, written_by, "
                + "written_at) VALUES (?, ?, ?, 'ABCD', 'Please check our Mn result', 'world', now()) RETURNING id",
                commented[0], commented[2], lab);
        long[] unsigned = inCommentPeriod(lab);
        long[] signed = inCommentPeriod(lab);
        signOff(signed[0], signed[1], "COORDINATOR", "first-coordinator");
        long finished = world.round(RoundState.FINAL_ISSUED, lab);

        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        assertThat(coordinator.request().redirects().follow(false).get("/home").header("Location")).endsWith("/coordinator");
        String pages = allPages(coordinator);
        assertThat(pages).contains("What needs you now");
        Map<Long, String> expected = Map.of(soon, "results-missing", closed, "evaluate", evaluated, "review",
                commented[0], "comments", unsigned[0], "sign-off", signed[0], "issue-final");
        expected.forEach((round, kind) -> assertThat(pages)
                .as("round " + round).contains("<tr data-kind=\"" + kind + "\" data-round=\"" + code(round) + "\">"));
        assertThat(pages).contains("href=\"/rounds/" + soon + "/submissions\"").contains("See who has not reported")
                .contains("href=\"/rounds/" + closed + "/evaluation\"").contains("Evaluate the results")
                .contains("href=\"/rounds/" + evaluated + "/evaluation/1\"")
                .contains("href=\"/rounds/" + commented[0] + "/reports#comments\"").contains("Answer the comments")
                .contains("Sign the final report off").contains("Issue the final report")
                .doesNotContain("data-round=\"" + code(finished) + "\"");
        // the deadline is shown with the shared deadline tag (its zone named)
        assertThat(pages).contains("class=\"deadline\"");

        World.Browser member = world.signIn(world.user("lab-member", lab));
        assertThat(member.request().accept("text/html").get("/coordinator").statusCode()).isEqualTo(403);
    }

    /** Every page of the coordinator's home, one after the other (other tests' rounds share the database). */
    private static String allPages(World.Browser coordinator) {
        StringBuilder all = new StringBuilder();
        Pattern pages = Pattern.compile("Page \\d+ of (\\d+)");
        int count = 1;
        for (int page = 1; page <= count && page <= 200; page++) {
            String html = coordinator.request().accept("text/html").queryParam("page", page).get("/coordinator")
                    .then().statusCode(200).extract().asString();
            Matcher m = pages.matcher(html);
            if (m.find()) {
                count = Integer.parseInt(m.group(1));
            }
            all.append(html);
        }
        return all.toString();
    }
}
