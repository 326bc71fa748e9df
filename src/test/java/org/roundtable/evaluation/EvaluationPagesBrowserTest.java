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
 * A coordinator previews the evaluation of a round that is still open, in Chromium, and reviews the run: the
 * summary per measurand, then the measurand's page with its statistics, the report's charts and the scores by code
 * (filtered by verdict). A laboratory member is refused the same pages.
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

    @Inject
    EvaluationService evaluations;

    @Test
    void theWarningsOfAMeasurandReadInTheTradesWordsWithNumbersAtSensibleDigits() {
        // invented Mn results in two method groups whose centres differ by more than the plan allows; the spark OES
        // group gives the assigned value, so u(x_pt) is large against σpt and z′ is used (three warnings at least)
        String[] values = {"10.13", "10.21", "10.62", "11.07", "11.19"};
        long[] labs = new long[values.length];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.CLOSED, new org.roundtable.scheme.EvaluationPlan(java.util.List.of(
                new org.roundtable.scheme.EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_METHOD_GROUP", "SPARK_OES",
                        null, null, null, null, "FIXED", "0.5", null, null, null, null, null, null, "3", "0.3", null,
                        null, null, null))), org.roundtable.scheme.Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, i < 3 ? "spark-oes" : "xrf", false);
        }
        EvaluationViews.Run run = evaluations.run(round, false,
                new org.roundtable.audit.Actor("evaluation-test", "coordinator", null));
        EvaluationViews.MeasurandOutcome mn = run.measurands().get(0);
        assertThat(mn.warnings()).extracting(EvaluationViews.Warning::code)
                .contains("subset-consensus", "method-groups-differ", "uncertainty-of-assigned-value-large");

        browser = Browser.start();
        Browser.signIn(browser, base, world.user("coordinator", null));
        browser.get(base + "rounds/" + round + "/evaluation/" + run.run().version() + "/measurands/Mn-" + mn.itemLabel());
        String warnings = browser.findElement(By.id("warnings")).getText();
        assertThat(warnings).contains("σpt").contains("u(xpt)").contains("differ by");
        String visible = browser.findElement(By.tagName("body")).getText();
        java.util.regex.Matcher number = java.util.regex.Pattern.compile("\\d+\\.\\d+").matcher(visible);
        while (number.find()) {
            assertThat(new java.math.BigDecimal(number.group()).stripTrailingZeros().precision())
                    .as("significant digits of %s on the page", number.group()).isLessThanOrEqualTo(6);
        }
        assertThat(visible).doesNotContain("sigma_pt").doesNotContainPattern("[A-Za-z]+_[A-Za-z]+");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById('warnings').scrollIntoView(true); window.scrollBy(0, -90);");
        Browser.screenshot(browser, "foundation/40-evaluation-warnings");
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
        Browser.signIn(browser, base, world.user("coordinator", null));

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

        // the version page: one row per measurand, no per-laboratory rows
        String page = browser.findElement(By.id("content")).getText();
        assertThat(page).contains("evaluation version 1 (preview)").contains("for coordinators only")
                .contains("Consensus of all participants").contains("Fixed by the scheme");
        String summary = browser.findElement(By.id("measurands")).getText();
        assertThat(summary).contains("Cr, item A");
        assertThat(browser.findElements(By.cssSelector("#measurands tbody tr"))).hasSize(1);
        Browser.screenshot(browser, "coordinator/30-evaluation-summary");

        // the measurand's page: statistics, the report's charts as images, the scores a page at a time
        browser.findElement(By.cssSelector("a.measurand-link")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/measurands/Cr-A"));
        assertThat(browser.findElement(By.id("robust")).getText()).contains("Algorithm A x*");
        assertThat(browser.findElement(By.id("method-groups")).getText()).contains("Spark OES");
        java.util.List<org.openqa.selenium.WebElement> charts = browser.findElements(By.cssSelector("#charts img"));
        assertThat(charts).hasSize(3);
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20)).until(d ->
                charts.stream().allMatch(img -> Boolean.TRUE.equals(((org.openqa.selenium.JavascriptExecutor) d)
                        .executeScript("return arguments[0].complete && arguments[0].naturalWidth > 0", img))));
        String scores = browser.findElement(By.id("score-table")).getText();
        assertThat(scores.lines().filter(l -> l.contains("Spark OES")).count()).isBetween(1L, (long) values.length);
        assertThat(browser.findElement(By.cssSelector("nav.pager")).getText()).contains("of " + values.length + ".");
        // the far-off result alone, by the verdict filter
        new org.openqa.selenium.support.ui.Select(browser.findElement(By.id("verdict"))).selectByValue("unsatisfactory");
        Browser.submit(browser, By.cssSelector("form.filters button"));
        assertThat(browser.findElement(By.id("score-table")).getText()).contains("18.95").contains("Unsatisfactory")
                .doesNotContain("18.12");
        browser.get(base + "rounds/" + round + "/evaluation/1/measurands/Cr-A");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript("window.scrollTo(0, 0)");
        Browser.screenshot(browser, "coordinator/31-measurand-review");
        Browser.screenshot(browser, "evaluation-run");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript("document.getElementById('charts').scrollIntoView()");
        Browser.screenshot(browser, "coordinator/31b-measurand-charts");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript("document.getElementById('scores').scrollIntoView()");
        Browser.screenshot(browser, "coordinator/31c-measurand-scores");

        browser.get(base + "rounds/" + round + "/evaluation");
        assertThat(browser.findElement(By.id("runs")).getText()).contains("preview");
    }
}
