package org.roundtable.demo;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import io.quarkus.test.junit.TestProfile;
import jakarta.inject.Inject;
import java.net.URL;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.World;

/**
 * docs/guide-coordinator.md, step by step, on a freshly loaded demo: Kestrel's analyst uploads the laboratory's
 * file to the open round (the journey starts with a laboratory's submission); the coordinator opens the round's
 * results, checks homogeneity, watches the submissions and reminds the missing laboratories, closes the round,
 * evaluates, reviews a measurand, marks Veldhaven's Ni slip as a blunder and evaluates again, issues the
 * preliminary report, answers Kestrel's comment, signs off and issues the final report. The guide's images are
 * its screenshots (docs/images/coordinator/ with -Dguides.images=docs/images).
 */
@QuarkusTest
@TestProfile(CoordinatorGuideBrowserTest.FreshDemo.class)
class CoordinatorGuideBrowserTest {

    /** A demo of its own: this walk closes the open round. */
    public static class FreshDemo extends DemoProfile {
    }

    @TestHTTPResource("/")
    URL home;

    @Inject
    World world;

    @Inject
    JobRunner jobs;

    @Test
    void aCoordinatorFollowsTheGuideFromTheOpenRoundsResultsToItsFinalReport() {
        String roundId = world.text("SELECT id FROM round WHERE state = 'OPEN_FOR_RESULTS'");
        String code = world.text("SELECT code FROM round WHERE id = ?", Long.parseLong(roundId));
        try (GuideWalk walk = new GuideWalk(home, "coordinator", jobs)) {
            // before the guide: a laboratory reports (the laboratory guide, task 3)
            walk.signIn("kestrel.analyst");
            walk.open("/my-rounds/" + roundId + "/results");
            walk.upload(By.id("file"), GuideWalk.demoFile("kestrel-results.csv"));
            walk.click(By.cssSelector("#upload-form button[type=submit]"));
            assertThat(walk.text(By.id("receipt"))).contains("Received: revision 1");

            // task 1: sign in; what needs you now
            walk.signIn("coordinator");
            assertThat(walk.text(By.tagName("h1"))).isEqualTo("What needs you now");
            walk.image("01-needs-me");

            // task 2: the round's results: Rounds, the open round, Submissions
            walk.clickLink("Rounds");
            walk.clickLink(code);
            assertThat(walk.text(By.id("round-state"))).isEqualTo("Open for results");
            walk.click(By.id("submissions-link"));
            assertThat(walk.text(By.id("submission-counts"))).contains("24").contains("15 submitted").contains("9 missing");
            walk.image("03-submissions");
            walk.clickLink("Kestrel Alloys QC Laboratory");
            assertThat(walk.text(By.tagName("h1"))).contains("Kestrel Alloys QC Laboratory");
            walk.browser.navigate().back();

            // task 3: homogeneity on the qualification page
            walk.click(By.id("round-link"));
            walk.click(By.id("qualification-link"));
            assertThat(walk.text(By.id("checks-Mn"))).contains("sufficient");
            assertThat(walk.text(By.id("decision-Si"))).contains("Widen σpt");
            walk.show(By.id("measurand-Si"));
            walk.image("04-qualification");

            // task 4: remind the laboratories without results
            walk.click(By.id("round-link"));
            walk.click(By.id("submissions-link"));
            new Select(walk.find(By.id("status"))).selectByVisibleText("Missing");
            walk.click(By.cssSelector("form.filters button"));
            assertThat(walk.text(By.id("submissions"))).contains("Tarnvik Metallab").doesNotContain("Kestrel");
            walk.show(By.id("reminder"));
            walk.image("05-reminder");
            walk.click(By.id("remind-missing"));
            assertThat(walk.text(By.id("confirm-title"))).contains("Remind the 9 laboratories");
            walk.clickForNotice(By.id("confirm-do"));

            // task 5: close the round early (the demo's deadline is two weeks away), with the reason
            walk.click(By.id("round-link"));
            walk.find(By.cssSelector("button[data-action=CLOSE]")).click();
            org.roundtable.testing.Browser.waitFor(walk.browser, By.cssSelector("#confirm-dialog[open] #confirm-consequence"));
            walk.find(By.cssSelector("#confirm-dialog #confirm-reason")).sendKeys("Demo: closed early to try the evaluation.");
            walk.click(By.cssSelector("#confirm-dialog #confirm-do"));
            walk.waitUntil(d -> "Closed".equals(d.findElement(By.id("round-state")).getText()));

            // task 6: evaluate
            walk.click(By.id("evaluation-link"));
            walk.click(By.id("start-run"));
            walk.runJobs();
            org.roundtable.testing.Browser.waitFor(walk.browser, By.id("job-version")).click();
            walk.waitUntil(d -> d.getCurrentUrl().endsWith("/evaluation/1"));
            assertThat(walk.text(By.id("measurands"))).contains("Ni, item A");
            walk.image("07-evaluation");

            // task 7: review a measurand: Ni, the unsatisfactory ones
            walk.clickLink("Ni, item A");
            assertThat(walk.text(By.id("robust"))).contains("Algorithm A");
            new Select(walk.find(By.id("verdict"))).selectByValue("unsatisfactory");
            walk.click(By.cssSelector("form.filters button"));
            String veldhaven = world.text("SELECT rp.participant_code FROM round_participant rp JOIN laboratory l ON l.id = "
                    + "rp.laboratory_id WHERE rp.round_id = ? AND l.name = 'Veldhaven Metaallab'", Long.parseLong(roundId));
            assertThat(walk.text(By.id("score-table"))).contains(veldhaven).contains("Unsatisfactory");
            walk.show(By.id("score-table"));
            walk.image("08-measurand");

            // task 8: mark the slip as a blunder, evaluate again
            walk.open("/rounds/" + roundId);
            walk.click(By.id("exclusions-link"));
            new Select(walk.find(By.id("participantCode"))).selectByValue(veldhaven);
            new Select(walk.find(By.id("element"))).selectByValue("Ni");
            walk.type(By.id("reason"), "Ten times the other results: a slipped decimal point (0.2 % read as 2 %).");
            walk.image("09-blunder");
            walk.clickForNotice(By.cssSelector("#mark-form button[type=submit]"));
            assertThat(walk.text(By.id("current-exclusions"))).contains(veldhaven).contains("slipped decimal");
            walk.open("/rounds/" + roundId + "/evaluation");
            walk.click(By.id("start-run"));
            walk.runJobs();
            org.roundtable.testing.Browser.waitFor(walk.browser, By.id("job-version")).click();
            walk.waitUntil(d -> d.getCurrentUrl().endsWith("/evaluation/2"));

            // task 9: the preliminary report
            walk.open("/rounds/" + roundId + "/reports");
            assertThat(walk.find(By.id("preliminary-version")).getText()).contains("run 2");
            walk.type(By.id("preliminary-comments"), "Preliminary results of the round; comments are welcome for two weeks.");
            walk.click(By.id("issue-preliminary"));
            assertThat(walk.text(By.id("confirm-consequence"))).contains("Every participant receives");
            walk.image("10-preliminary");
            walk.clickForNotice(By.id("confirm-do"));
            walk.runJobs();
            walk.open("/rounds/" + roundId + "/reports");
            assertThat(walk.text(By.id("documents"))).contains(code + "-R-P1");
            walk.clickForNotice(By.id("open-comment-period"));
            assertThat(walk.text(By.id("round-state"))).isEqualTo("Comment period");

            // task 10: a laboratory comments; the coordinator answers
            walk.signIn("kestrel.manager");
            walk.open("/my-rounds/" + roundId + "/reports");
            walk.type(By.id("comment-body"), "Our Cr result was measured on the wrong face of the disc; may we send a new one?");
            walk.clickForNotice(By.id("send-comment"));
            walk.signIn("coordinator");
            assertThat(walk.text(By.cssSelector("#needs-me tr[data-round='" + code + "']"))).contains("1 comment waiting");
            walk.click(By.cssSelector("#needs-me tr[data-round='" + code + "'] a.button"));
            walk.show(By.cssSelector(".comment"));
            walk.type(By.cssSelector(".comment textarea"), "Results cannot change after the deadline; the report notes your remark.");
            walk.image("11-comment");
            walk.clickForNotice(By.cssSelector(".comment .answer-button"));
            assertThat(walk.text(By.cssSelector(".comment .answer"))).contains("cannot change");

            // task 11: sign off, issue the final report
            new Select(walk.find(By.id("sign-version"))).selectByVisibleText("run 2");
            walk.clickForNotice(By.id("sign-off"));
            assertThat(walk.find(By.cssSelector("#sign-offs tbody tr td:nth-child(2)")).getText()).isEqualTo("2");
            assertThat(walk.text(By.id("sign-offs"))).contains("Marta Ilves");
            walk.click(By.id("issue-final"));
            walk.clickForNotice(By.id("confirm-do"));
            walk.runJobs();
            walk.open("/rounds/" + roundId + "/reports");
            assertThat(walk.text(By.id("round-state"))).isEqualTo("Final report issued");
            assertThat(walk.text(By.id("documents"))).contains(code + "-R-F");
            walk.top();
            walk.image("12-final");
        }
    }
}
