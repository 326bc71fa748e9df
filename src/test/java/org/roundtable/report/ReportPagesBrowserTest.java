package org.roundtable.report;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

/** The core of the report lifecycle in Chromium: preliminary issue, a laboratory's comment, the answer, final issue. */
@QuarkusTest
class ReportPagesBrowserTest {

    @TestHTTPResource("/")
    URL base;

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    JobRunner runner;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    private void signIn(String username, String path) {
        browser.get(base + "login?next=" + path);
        browser.findElement(By.id("username")).sendKeys(username);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith(path));
    }

    private void signOut() {
        browser.findElement(By.cssSelector("form[action='/logout'] button")).click();
        Browser.waitForUrl(browser, url -> !url.contains("/reports"));
    }

    private void runJobs() {
        while (runner.runNext()) {
            // the report issue job among any queued
        }
    }

    @Test
    void aCoordinatorIssuesThePreliminaryReportALaboratoryCommentsAndTheFinalReportFollows() {
        browser = Browser.start();
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        String coordinator = world.user("coordinator", null);
        String member = world.user("lab-member", ids[1]);
        String coordinatorPage = "/rounds/" + round + "/reports";
        String labPage = "/my-rounds/" + round + "/reports";

        signIn(coordinator, coordinatorPage);
        Browser.submit(browser, By.id("issue-preliminary")); // answers the second step, not a notice
        // issuing cannot be undone: the second step names the consequence first
        assertThat(browser.findElement(By.id("confirm-consequence")).getText()).contains("Every participant receives");
        submit(By.id("confirm-do"));
        runJobs();
        browser.get(base + coordinatorPage.substring(1));
        assertThat(browser.findElement(By.id("documents")).getText()).contains(code + "-R-P1");
        submit(By.id("open-comment-period"));
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Comment period");
        signOut();

        signIn(member, labPage);
        assertThat(browser.findElement(By.id("my-documents")).getText()).contains(code + "-R-P1").contains("your laboratory report");
        browser.findElement(By.id("comment-body")).sendKeys("Please confirm the Cr assigned value.");
        browser.findElement(By.id("send-comment")).click();
        assertThat(Browser.waitFor(browser, By.cssSelector(".my-comment")).getText()).isEqualTo("Please confirm the Cr assigned value.");
        signOut();

        signIn(coordinator, coordinatorPage);
        assertThat(browser.findElement(By.cssSelector(".comment")).getText()).contains("Please confirm the Cr assigned value.");
        browser.findElement(By.cssSelector(".comment textarea")).sendKeys("Confirmed: robust mean of all results.");
        submit(By.cssSelector(".comment .answer-button"));
        assertThat(browser.findElement(By.cssSelector(".comment .answer")).getText()).contains("Confirmed");
        submit(By.id("sign-off"));
        Browser.submit(browser, By.id("issue-final")); // answers the second step, not a notice
        submit(By.id("confirm-do"));
        runJobs();
        browser.get(base + coordinatorPage.substring(1));
        assertThat(browser.findElement(By.id("documents")).getText()).contains(code + "-R-F");
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Final report issued");
        Browser.screenshot(browser, "round-reports");
        signOut();

        signIn(member, labPage);
        assertThat(browser.findElement(By.cssSelector(".answer")).getText()).contains("Confirmed: robust mean of all results.");
        assertThat(browser.findElement(By.id("my-documents")).getText()).contains(code + "-R-F");
    }

    /** Submits a form by its button, waits for the answering page, then for its success notice. */
    private void submit(By button) {
        Browser.submit(browser, button);
        Browser.waitFor(browser, By.cssSelector(".notice-ok"));
    }
}
