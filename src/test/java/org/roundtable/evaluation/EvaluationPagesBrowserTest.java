package org.roundtable.evaluation;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.roundtable.job.JobRunner;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator previews the evaluation of a round that is still open, in Chromium, and reads the run: x_pt, σpt
 * and the participants' scores by code. A laboratory member is refused the same pages.
 */
@QuarkusTest
class EvaluationPagesBrowserTest {

    @TestHTTPResource("/")
    URL base;

    @Inject
    World world;

    @Inject
    JobRunner runner;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    @Test
    void coordinatorPreviewsTheRoundAndReadsEveryScoreWhileLaboratoriesAreRefused() {
        // invented Cr results around 18.1 %, one far off; σpt 0.10 % by the simple plan
        String[] values = {"18.02", "18.05", "18.08", "18.10", "18.11", "18.12", "18.13", "18.15", "18.18", "18.21", "18.95"};
        long[] labs = new long[values.length];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.OPEN_FOR_RESULTS, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", values[i], "0.08", "spark-oes", false);
        }
        String member = world.user("lab-member", labs[0]);
        world.signIn(member).request().get("/rounds/" + round + "/evaluation").then().statusCode(403);

        browser = Browser.start();
        browser.get(base + "login");
        browser.findElement(By.id("username")).sendKeys(world.user("coordinator", null));
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> !url.contains("/login"));

        browser.get(base + "rounds/" + round + "/evaluation");
        assertThat(browser.findElement(By.id("runs")).getText()).contains("No evaluation yet");
        assertThat(browser.findElements(By.id("start-run"))).as("a round still open can only be previewed").isEmpty();
        browser.findElement(By.id("start-preview")).click();
        // the preview runs as a background job; the page reloads itself until the job links its version
        Browser.waitForUrl(browser, url -> url.contains("/evaluation?job="));
        assertThat(browser.findElement(By.id("evaluation-job")).getText()).contains("waiting to start");
        while (runner.runNext()) {
            // the test profile polls no jobs by itself: run the queued preview here, as a worker would
        }
        Browser.waitFor(browser, By.id("job-version")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/evaluation/1"));

        String page = browser.findElement(By.id("content")).getText();
        assertThat(page).contains("evaluation version 1 (preview)").contains("for coordinators only")
                .contains("Consensus of all participants").contains("Fixed by the scheme");
        String scores = browser.findElement(By.cssSelector("section.measurand table.scores")).getText();
        assertThat(scores.lines().filter(l -> l.contains("Spark OES")).count()).isEqualTo(values.length);
        assertThat(scores).contains("unsatisfactory").contains("satisfactory");
        Browser.screenshot(browser, "evaluation-run");

        browser.get(base + "rounds/" + round + "/evaluation");
        assertThat(browser.findElement(By.id("runs")).getText()).contains("preview");
    }
}
