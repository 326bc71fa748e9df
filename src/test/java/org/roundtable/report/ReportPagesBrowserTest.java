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

    @Inject
    ReportLifecycle lifecycle;

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
        String zone = world.text("SELECT deadline_time_zone FROM round WHERE id = ?", round);
        assertThat(browser.findElement(By.id("comment-period-end")).getText()).startsWith("The comment period ends")
                .contains(zone);
        signOut();

        signIn(member, labPage);
        assertThat(browser.findElement(By.id("comment-period-end")).getText()).startsWith("The comment period ends")
                .contains(zone);
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById('comment-period-end').scrollIntoView(true); window.scrollBy(0, -120);");
        Browser.screenshot(browser, "notices/10-comment-period-end-laboratory");
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

    @Test
    void afterThePreliminaryReportALaboratorySeesItsScoresWithChartsAndCommentsFromThere() {
        browser = Browser.start();
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        String own = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, ids[1]);
        String coordinatorPage = "/rounds/" + round + "/reports";
        signIn(world.user("coordinator", null), coordinatorPage);
        Browser.submit(browser, By.id("issue-preliminary"));
        submit(By.id("confirm-do"));
        runJobs();
        browser.get(base + coordinatorPage.substring(1));
        submit(By.id("open-comment-period"));
        signOut();

        String member = world.user("lab-member", ids[1]);
        signIn(member, "/my-rounds/" + round);
        Browser.submit(browser, By.id("scores-link"));
        assertThat(browser.getCurrentUrl()).endsWith("/my-rounds/" + round + "/scores");
        assertThat(browser.findElement(By.id("participant-code")).getText()).isEqualTo(own);
        assertThat(browser.findElement(By.id("my-scores")).getText()).contains("Cr").contains("%");
        java.util.List<org.openqa.selenium.WebElement> charts = browser.findElements(By.cssSelector("figure.chart img"));
        assertThat(charts).hasSize(3);
        for (org.openqa.selenium.WebElement chart : charts) {
            ((org.openqa.selenium.JavascriptExecutor) browser).executeScript("arguments[0].scrollIntoView(true);", chart);
            new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20)).until(d ->
                    Boolean.TRUE.equals(((org.openqa.selenium.JavascriptExecutor) d).executeScript(
                            "return arguments[0].complete && arguments[0].naturalWidth > 0;", chart)));
        }
        // the table of figures with the charts below it
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById('my-scores').scrollIntoView(true); window.scrollBy(0, -90);");
        assertThat(browser.findElement(By.id("round-report-pdf")).getAttribute("href")).contains("/documents/");
        assertThat(browser.findElement(By.id("lab-report-html")).getAttribute("href")).endsWith("/html");
        Browser.screenshot(browser, "laboratory/10-scores");

        browser.findElement(By.id("comment-link")).click();
        Browser.waitFor(browser, By.id("comment-body")).sendKeys("Our Cr value was read at the wrong line; please check.");
        browser.findElement(By.id("send-comment")).click();
        assertThat(Browser.waitFor(browser, By.cssSelector(".my-comment")).getText()).contains("wrong line");
        assertThat(browser.findElement(By.id("my-documents")).getText()).contains(code + "-R-P1");
    }

    @Test
    void anAuditorFindsAReportByLaboratoryDownloadsItAndLearnsItWasSuperseded() throws Exception {
        browser = Browser.start();
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        String own = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, ids[1]);
        String labName = world.text("SELECT name FROM laboratory WHERE id = ?", ids[1]);
        lifecycle.publishWithoutJobs(round, 1, "", new ReportLifecycle.Signer(
                new org.roundtable.audit.Actor("browser-test", "coordinator", null), "Dr. Test Coordinator"));
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.json().body("{\"version\":1}").post("/api/v1/rounds/" + round + "/reports/sign-offs")
                .then().statusCode(org.hamcrest.Matchers.lessThan(300));
        coordinator.json().body("{\"version\":1,\"reason\":\"Participant codes of two results exchanged\"}")
                .post("/api/v1/rounds/" + round + "/reports/amendments").then().statusCode(org.hamcrest.Matchers.lessThan(300));
        runJobs();
        String auditor = world.user("auditor", null);
        world.grant(ids[1], auditor);

        signIn(auditor, "/auditor/reports");
        new org.openqa.selenium.support.ui.Select(browser.findElement(By.id("f-laboratory"))).selectByVisibleText(labName);
        Browser.submit(browser, By.cssSelector("#library-filters button"));
        String library = browser.findElement(By.id("library")).getText();
        assertThat(library).contains(labName).contains(own).contains("Final").contains("Amended").contains("replaced by");
        Browser.screenshot(browser, "auditor/01-library");

        // the final laboratory report, downloaded before the amendment was noticed
        org.openqa.selenium.WebElement finalRow = browser.findElements(By.cssSelector("#library tbody tr")).stream()
                .filter(r -> r.getText().contains("replaced by")).findFirst().orElseThrow();
        String href = finalRow.findElement(By.cssSelector("a.download-lab-report")).getAttribute("href");
        byte[] pdf = io.restassured.RestAssured.given().cookie("rt_session", browser.manage().getCookieNamed("rt_session").getValue())
                .get(href).then().statusCode(200).extract().asByteArray();
        java.nio.file.Path file = java.nio.file.Files.createTempFile("final-report", ".pdf");
        java.nio.file.Files.write(file, pdf);

        browser.get(base + "verify");
        browser.findElement(By.id("file")).sendKeys(file.toAbsolutePath().toString());
        Browser.submit(browser, By.cssSelector("form[enctype] button"));
        assertThat(Browser.waitFor(browser, By.id("superseded")).getText()).contains("no longer the current version")
                .contains("amended report");
        assertThat(browser.findElement(By.id("verify-newer")).getAttribute("href")).contains("/verify?sha256=");
        Browser.screenshot(browser, "auditor/02-verify-superseded");
        java.nio.file.Files.deleteIfExists(file);
    }

    @Test
    void theIssuedDocumentsArePagedNewestFirstAndThePageLinksReachTheOlderOnes() {
        browser = Browser.start();
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        lifecycle.publishWithoutJobs(round, 1, "", new ReportLifecycle.Signer(
                new org.roundtable.audit.Actor("browser-test", "coordinator", null), "Dr. Test Coordinator"));
        long total = Long.parseLong(world.text("SELECT count(*)::text FROM issued_document WHERE round_id = ?", round));
        assertThat(total).as("a preliminary and a final report for each of 10 laboratories and for the round")
                .isEqualTo(22);
        String page = "/rounds/" + round + "/reports";
        signIn(world.user("coordinator", null), page);

        java.util.List<String> first = documentRows();
        assertThat(first).hasSize(5); // the tests' page-size budget
        assertThat(first.get(0)).as("the newest document first").contains(code + "-R-F");
        assertThat(browser.findElement(By.cssSelector(".pager")).getText()).contains("Rows 1–5 of 22.")
                .contains("Page 1 of 5");

        Browser.submit(browser, By.cssSelector(".pager a[rel=next]"));
        assertThat(browser.getCurrentUrl()).endsWith(page + "?page=2");
        java.util.List<String> second = documentRows();
        assertThat(second).hasSize(5).doesNotContainAnyElementsOf(first)
                .allSatisfy(row -> assertThat(row).contains("Final"));
        assertThat(browser.findElement(By.cssSelector(".pager")).getText()).contains("Rows 6–10 of 22.")
                .contains("Page 2 of 5");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById('documents').scrollIntoView(true); window.scrollBy(0, -90);");
        Browser.screenshot(browser, "foundation/20-report-documents-page-2");

        browser.get(base + page.substring(1) + "?page=5");
        assertThat(documentRows()).hasSize(2).allSatisfy(row -> assertThat(row).contains("-P1").contains("Preliminary"));
        assertThat(browser.findElements(By.cssSelector(".pager a[rel=next]"))).isEmpty();
    }

    private java.util.List<String> documentRows() {
        return browser.findElements(By.cssSelector("#documents tbody tr")).stream()
                .map(org.openqa.selenium.WebElement::getText).toList();
    }

    /** Submits a form by its button, waits for the answering page, then for its success notice. */
    private void submit(By button) {
        Browser.submit(browser, button);
        Browser.waitFor(browser, By.cssSelector(".notice-ok"));
    }
}
