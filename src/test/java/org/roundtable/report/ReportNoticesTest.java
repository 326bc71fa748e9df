package org.roundtable.report;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.Mailbox;
import org.roundtable.testing.World;

import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The report lifecycle's notices, by e-mail through a real SMTP server (GreenMail): each laboratory hears of its own
 * report only — never another laboratory's code, name or report —, of the answer to its own comment, and of the end
 * of the comment period; a second reviewer hears of the waiting sign-off; auditors with a grant hear of the final
 * report, others do not.
 */
@QuarkusTest
class ReportNoticesTest {

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    JobRunner runner;

    @ConfigProperty(name = "quarkus.mailer.port")
    int smtpPort;

    private Mailbox mailbox;

    @BeforeEach
    void startSmtp() {
        runJobs();
        mailbox = new Mailbox(smtpPort);
    }

    @AfterEach
    void stopSmtp() {
        mailbox.close();
    }

    private void runJobs() {
        // the report issue and the notice e-mails it causes
        org.roundtable.testing.MailJobs.runAll(runner, world, null);
    }

    private String person(String role, Long laboratory) {
        String username = world.user(role, laboratory);
        world.sql("UPDATE app_user SET email = ? WHERE username = ?", username + "@mail.example", username);
        return username;
    }

    private List<Mailbox.Message> mailTo(String username) {
        return mailbox.to(username + "@mail.example");
    }

    @Test
    void eachReaderIsToldOfWhatIsTheirsAndNothingOfAnotherLaboratory() {
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        long labA = ids[1];
        long labB = ids[2];
        world.sql("UPDATE scheme SET second_reviewer_required = true WHERE id = (SELECT scheme_id FROM round WHERE id = ?)", round);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        String codeA = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, labA);
        String codeB = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, labB);
        String nameB = world.text("SELECT name FROM laboratory WHERE id = ?", labB);
        String memberA = person("lab-member", labA);
        String managerB = person("lab-manager", labB);
        String first = person("coordinator", null);
        String second = person("coordinator", null);
        String granted = person("auditor", null);
        world.grant(labA, granted);
        String ungranted = person("auditor", null);
        World.Browser coordinator = world.signIn(first);

        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/preliminary")
                .then().statusCode(202);
        runJobs();

        List<Mailbox.Message> toA = mailTo(memberA);
        assertThat(toA).singleElement().satisfies(m -> {
            assertThat(m.subject()).isEqualTo("Roundtable: Round " + code + ": preliminary report issued");
            assertThat(m.text()).contains(code + "-" + codeA + "-P1").contains(code + "-R-P1")
                    .doesNotContain(codeB).doesNotContain(nameB);
            assertThat(m.html()).doesNotContain(codeB).doesNotContain(nameB);
        });
        assertThat(mailTo(managerB)).singleElement().satisfies(m -> assertThat(m.text())
                .contains(code + "-" + codeB + "-P1").doesNotContain(codeA));
        // auditors hear of final and amended reports only
        assertThat(mailTo(granted)).isEmpty();

        // a comment of laboratory A, answered: A is told, B is not
        coordinator.json().body("{}").post("/api/v1/rounds/" + round + "/reports/comment-period").then().statusCode(200);
        // the period ends after the round's length setting (14 days unless set); the notice checks tell before it
        assertThat(world.text("SELECT (comment_period_ends_at - state_changed_at)::text FROM round WHERE id = ?", round))
                .isEqualTo("14 days");
        int comment = world.signIn(memberA).json().body("{\"body\": \"Please check our Cr result.\"}")
                .post("/api/v1/my-rounds/" + round + "/comments").then().statusCode(201).extract().path("id");
        coordinator.json().body("{\"body\": \"Checked: the result stands as reported.\"}")
                .post("/api/v1/rounds/" + round + "/reports/comments/" + comment + "/answers").then().statusCode(201);
        runJobs();
        assertThat(mailTo(memberA)).hasSize(2).last().satisfies(m -> {
            assertThat(m.subject()).contains("your comment was answered");
            assertThat(m.text()).doesNotContain("Checked: the result stands");
        });
        assertThat(mailTo(managerB)).hasSize(1);

        // the first sign-off: a sign-off waits (the other coordinator); the laboratories hear nothing of it (the
        // comment period's end is told before the end by the notice checks, NoticeDeliveryTest)
        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs")
                .then().statusCode(201);
        runJobs();
        assertThat(mailTo(memberA)).hasSize(2);
        assertThat(mailTo(managerB)).hasSize(1);
        assertThat(mailTo(second)).singleElement().satisfies(m -> assertThat(m.subject()).contains("waits for your sign-off"));
        assertThat(mailTo(first)).isEmpty();

        // the second reviewer signs, the final report is issued: the granted auditor is told, the other one is not
        world.signIn(second).json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs")
                .then().statusCode(201);
        coordinator.json().body("{}").post("/api/v1/rounds/" + round + "/reports/final").then().statusCode(202);
        runJobs();
        assertThat(mailTo(granted)).singleElement().satisfies(m -> {
            assertThat(m.subject()).contains("final report issued");
            assertThat(m.text()).contains(code + "-R-F").doesNotContain(codeB).doesNotContain(nameB)
                    .contains("/auditor/reports");
        });
        assertThat(mailTo(ungranted)).isEmpty();
        assertThat(mailTo(memberA)).hasSize(3).last().satisfies(m -> assertThat(m.text()).contains(code + "-" + codeA + "-F"));
        runJobs();
        assertThat(mailTo(memberA)).hasSize(3);
    }
}
