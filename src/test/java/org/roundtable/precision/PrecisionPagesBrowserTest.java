package org.roundtable.precision;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import java.net.URL;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

/**
 * In Chromium: a laboratory enters its replicates on its study page; the coordinator evaluates, sees the planted
 * straggler and outlier flagged at their levels, excludes the outlier with a reason, evaluates again, issues the
 * draft report behind its second step (the confirm tag) and reads it; the laboratory reads the draft. Screenshots under
 * target/screenshots/precision/.
 */
@QuarkusTest
class PrecisionPagesBrowserTest {

    @TestHTTPResource("/")
    URL home;

    @Inject
    World world;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    private void signIn(String username) {
        Browser.signIn(browser, home, username);
    }

    private void scrollTo(String id) {
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById(arguments[0]).scrollIntoView()", id);
    }

    private void signOut() {
        browser.manage().deleteAllCookies();
    }

    @Test
    void aStudyIsEvaluatedDecidedAndReportedThroughThePages() throws Exception {
        Files.createDirectories(Path.of("target", "screenshots", "precision"));
        PrecisionStudies studies = new PrecisionStudies(world);
        PrecisionStudies.Study study = studies.openForResults();
        long id = study.roundId();
        for (Map.Entry<String, Long> lab : study.labs().entrySet()) {
            if (!lab.getKey().equals("L12")) {
                assertThat(studies.submitCsv(id, lab.getValue(), PrecisionStudies.csvOf(lab.getKey())).statusCode()).isEqualTo(201);
            }
        }
        browser = Browser.start();
        String member = world.user("lab-member", study.labs().get("L12"));
        signIn(member);
        browser.get(home + "my-precision-experiments/" + id);
        assertThat(browser.findElement(By.id("my-results")).getText()).contains("Nothing submitted yet");
        for (String[] r : PrecisionStudies.rows()) {
            if (r[0].equals("L12")) {
                browser.findElement(By.name("v-C-" + r[1] + "-" + r[3])).sendKeys(r[4]);
            }
        }
        Browser.submit(browser, By.cssSelector("#entry-form button[type=submit]"));
        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        assertThat(browser.findElement(By.id("my-results")).getText()).contains("0.8").doesNotContain(study.codes().get("L01"));
        Browser.screenshot(browser, "precision/laboratory-entered-results");
        signOut();
        PrecisionStudies.close(study);

        signIn(world.user("coordinator", null));
        browser.get(home + "precision-experiments/" + id);
        Browser.submit(browser, By.id("evaluate"));
        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        String level2 = browser.findElement(By.id("level-C-2")).getText();
        assertThat(level2).contains(study.codes().get("L07")).contains("Cochran: straggler");
        String level3 = browser.findElement(By.id("level-C-3")).getText();
        assertThat(level3).contains("Grubbs single: outlier").contains("12 of 12 laboratories retained");
        scrollTo("level-C-3");
        Browser.screenshot(browser, "precision/coordinator-first-evaluation");

        new Select(browser.findElement(By.id("participantCode"))).selectByValue(study.codes().get("L10"));
        new Select(browser.findElement(By.id("cell"))).selectByValue("C|3");
        browser.findElement(By.id("reason")).sendKeys("Wrong calibration standard, confirmed by the laboratory");
        Browser.submit(browser, By.cssSelector("#exclude-form button[type=submit]"));
        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        assertThat(browser.findElement(By.id("decisions")).getText()).contains("Wrong calibration standard");
        assertThat(browser.getPageSource()).contains("evaluate again");
        Browser.submit(browser, By.id("evaluate"));
        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        assertThat(browser.findElement(By.id("level-C-3")).getText()).contains("11 of 12 laboratories retained")
                .contains("excluded: Wrong calibration standard");
        scrollTo("decisions");
        Browser.screenshot(browser, "precision/coordinator-after-decision");

        // issuing is irreversible: with htmx the first button opens the second step in a dialog that names the
        // consequence; keeping things as they are issues nothing
        browser.findElement(By.cssSelector("button[data-action=report-draft]")).click();
        Browser.waitFor(browser, By.cssSelector("#confirm-dialog[open] #confirm-consequence"));
        assertThat(browser.findElement(By.cssSelector("#confirm-dialog #confirm-consequence")).getText())
                .contains("every laboratory of the experiment can read it");
        Browser.screenshot(browser, "foundation/30-precision-draft-dialog");
        browser.findElement(By.cssSelector("#confirm-dialog #confirm-back")).click();
        assertThat(browser.findElements(By.cssSelector("#confirm-dialog[open]"))).isEmpty();
        assertThat(world.text("SELECT count(*)::text FROM issued_document WHERE round_id = ?", id)).isEqualTo("0");
        // without JavaScript the first post answers the second step as a page of its own; its button issues
        org.openqa.selenium.WebElement before = browser.findElement(By.tagName("html"));
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.querySelector('button[data-action=report-draft]').form.submit();");
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20))
                .until(org.openqa.selenium.support.ui.ExpectedConditions.stalenessOf(before));
        assertThat(browser.findElement(By.id("confirm-title")).getText()).startsWith("Issue the draft report of");
        Browser.screenshot(browser, "foundation/31-precision-draft-second-step");
        Browser.submit(browser, By.id("confirm-do"));
        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        assertThat(browser.findElement(By.cssSelector("p.notice-ok")).getText()).contains("Draft report");
        browser.get(home + "precision-experiments/" + id + "/report");
        String report = browser.findElement(By.cssSelector("article.precision-report")).getText();
        assertThat(report).contains("Statement of precision").contains("Draft for comment")
                .contains("excluded: Wrong calibration standard").contains("Mandel's h by laboratory");
        assertThat(browser.findElements(By.cssSelector("article.precision-report svg")).size()).isGreaterThanOrEqualTo(7);
        Browser.screenshot(browser, "precision/draft-report");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.querySelectorAll('article.precision-report svg')[4].scrollIntoView()");
        Thread.sleep(1500); // let Chromium paint the scrolled-to tiles before the picture (not a timing assertion)
        Browser.screenshot(browser, "precision/draft-report-charts");
        signOut();

        signIn(member);
        browser.get(home + "my-precision-experiments/" + id);
        browser.findElement(By.linkText("Read the report")).click();
        Browser.waitFor(browser, By.cssSelector("article.precision-report"));
        assertThat(browser.getPageSource()).contains("Statement of precision");
        Browser.screenshot(browser, "precision/laboratory-reads-draft");
    }
}
