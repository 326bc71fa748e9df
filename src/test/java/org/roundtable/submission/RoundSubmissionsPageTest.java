package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.job.JobRunner;
import org.roundtable.notice.NoticeService;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Mailbox;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The coordinator's submissions page: who has submitted, who is late and who is missing, by laboratory name with
 * the participant code, filtered, searched and paged; a page per laboratory with its revisions; a confirmed reminder
 * to the missing ones through the notices and their e-mail.
 */
@QuarkusTest
class RoundSubmissionsPageTest {

    @Inject
    World world;

    @Inject
    JobRunner runner;

    @ConfigProperty(name = "quarkus.mailer.port")
    int smtpPort;

    private Mailbox mailbox;
    private long onTime;
    private long late;
    private long missing;
    private long round;
    private World.Browser coordinator;

    @BeforeEach
    void round() {
        sendMail(); // what earlier tests left queued goes now, before this test's server counts messages
        mailbox = new Mailbox(smtpPort);
        onTime = world.laboratory();
        late = world.laboratory();
        missing = world.laboratory();
        round = world.round(RoundState.OPEN_FOR_RESULTS, World.simplePlan("0.10"), Round.LatePolicy.ACCEPT_FLAGGED_SCORED,
                onTime, late, missing);
        world.reportResult(round, onTime, "Cr", "18.12", "0.05", "SPARK_OES", false);
        world.reportResult(round, late, "Cr", "18.30", null, "XRF", true);
        coordinator = world.signIn(world.user("coordinator", null));
    }

    @AfterEach
    void stopSmtp() {
        mailbox.close();
    }

    @Test
    void theCoordinatorSeesWhoSubmittedWhoIsLateAndWhoIsMissingByLaboratoryNameAndCode() {
        String html = page("").asString();
        assertThat(html).contains(name(onTime)).contains(name(late)).contains(name(missing))
                .contains(code(onTime)).contains(code(missing))
                .contains("3</strong> enrolled").contains("1 submitted<").contains("1 submitted late<").contains("1 missing<")
                .contains("/rounds/" + round + "/submissions/" + onTime + "\"");
        // missing first, then late, then submitted
        assertThat(html.indexOf(name(missing))).isLessThan(html.indexOf(name(late)));
        assertThat(html.indexOf(name(late))).isLessThan(html.indexOf(name(onTime)));
    }

    @Test
    void theFilterShowsOnlyTheLaboratoriesOfAStatusAndTheSearchFindsByNameOrCode() {
        String missingOnly = page("?status=MISSING").asString();
        assertThat(missingOnly).contains(name(missing)).doesNotContain(name(late)).doesNotContain(name(onTime))
                .contains("Rows 1–1 of 1.");
        String lateOnly = page("?status=late").asString();
        assertThat(lateOnly).contains(name(late)).doesNotContain(name(missing));
        assertThat(page("?q=" + code(onTime)).asString()).contains(name(onTime)).doesNotContain(name(missing));
        assertThat(page("?q=%25").asString()).contains("No rows.");
        assertThat(page("?status=WHATEVER").statusCode()).isEqualTo(400);
    }

    @Test
    void aLongListIsPagedWithTheFilterKeptInThePageLinks() {
        long[] labs = new long[7];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long big = world.round(RoundState.OPEN_FOR_RESULTS, labs);
        // the test profile's budget is 5 rows (roundtable.display.page-size)
        String first = coordinator.request().get("/rounds/" + big + "/submissions?status=MISSING").asString();
        assertThat(first).contains("Rows 1–5 of 7.").contains("page=2&amp;status=MISSING");
        String second = coordinator.request().get("/rounds/" + big + "/submissions?status=MISSING&page=2").asString();
        assertThat(second).contains("Rows 6–7 of 7.");
    }

    @Test
    void eachRowLeadsToTheLaboratorysRevisionsAndValues() {
        Response own = coordinator.request().get("/rounds/" + round + "/submissions/" + late);
        assertThat(own.statusCode()).isEqualTo(200);
        assertThat(own.asString()).contains(name(late)).contains(code(late)).contains("Revision 1").contains("18.30")
                .contains("after the deadline");
        assertThat(coordinator.request().get("/rounds/" + round + "/submissions/" + missing).asString())
                .contains("has sent no results");
        long outsider = world.laboratory();
        assertThat(coordinator.request().get("/rounds/" + round + "/submissions/" + outsider).statusCode()).isEqualTo(404);
    }

    @Test
    void aConfirmedReminderReachesOnlyTheMissingLaboratoryByNoticeAndEmail() {
        String missingMember = person(missing);
        String lateMember = person(late);
        Response step = coordinator.form().formParam("reason", "Please send your Cr result.")
                .post("/rounds/" + round + "/submissions/reminders");
        assertThat(step.statusCode()).isEqualTo(200);
        assertThat(step.asString()).contains("Remind the 1 laboratory without results").contains("by e-mail");
        assertThat(world.insert("SELECT count(*) FROM notice_reminder WHERE round_id = ?", round)).isZero();

        Response sent = coordinator.form().formParam("reason", "Please send your Cr result.").formParam("confirmed", "yes")
                .post("/rounds/" + round + "/submissions/reminders");
        assertThat(sent.statusCode()).isEqualTo(200);
        assertThat(sent.asString()).contains("Reminder sent to 1 laboratory without results (1 person).");
        assertThat(world.insert("SELECT count(*) FROM notice n JOIN app_user u ON u.id = n.recipient_id "
                + "WHERE n.kind = 'reminder' AND u.laboratory_id = ?", missing)).isEqualTo(1);
        assertThat(world.insert("SELECT count(*) FROM audit_event WHERE action = 'notice.reminder-sent' AND detail LIKE ?",
                "round=" + round + " %")).isEqualTo(1);
        sendMail();
        assertThat(mailbox.to(missingMember + "@mail.example")).singleElement()
                .satisfies(m -> assertThat(m.text()).contains("Please send your Cr result."));
        assertThat(mailbox.to(lateMember + "@mail.example")).isEmpty();
    }

    @Test
    void aReminderWithoutAMessageIsRefusedOnThePage() {
        Response refused = coordinator.form().formParam("reason", " ").post("/rounds/" + round + "/submissions/reminders");
        assertThat(refused.statusCode()).isEqualTo(400);
        assertThat(refused.asString()).contains("Write the reminder").contains("id=\"reminder-problem\"");
    }

    private Response page(String query) {
        Response response = coordinator.request().get("/rounds/" + round + "/submissions" + query);
        return response;
    }

    private String name(long laboratory) {
        return world.text("SELECT name FROM laboratory WHERE id = ?", laboratory);
    }

    private String code(long laboratory) {
        return world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, laboratory);
    }

    private String person(long laboratory) {
        String username = world.user("lab-member", laboratory);
        world.sql("UPDATE app_user SET email = ? WHERE username = ?", username + "@mail.example", username);
        return username;
    }

    private void sendMail() {
        org.roundtable.testing.MailJobs.runAll(runner, world, NoticeService.JOB_KIND);
    }
}
