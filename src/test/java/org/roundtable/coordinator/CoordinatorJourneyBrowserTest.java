package org.roundtable.coordinator;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.support.ui.Select;
import org.openqa.selenium.support.ui.WebDriverWait;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.net.URL;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.LocalDate;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator takes a round from nothing to its final report in Chromium, by clicking: signs in through the form,
 * creates the round, builds its plan in the form (a mistake shown beside its field, what was typed kept), freezes
 * it (confirmation), enrols laboratories, uploads the homogeneity data as a file and records the decision, dispatches
 * and opens the round; the laboratories submit through the API; the coordinator closes early (confirmation),
 * evaluates and follows the progress, reviews the measurand's page, issues the preliminary report (confirmation),
 * answers a laboratory's comment, signs off, issues the final report (confirmation) and reads it in the browser.
 * Screenshots under target/screenshots/coordinator/journey-NN-step.png.
 */
@QuarkusTest
class CoordinatorJourneyBrowserTest {

    @TestHTTPResource("/")
    URL home;

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
    void aCoordinatorTakesARoundFromCreationToTheFinalReportByClicking() throws Exception {
        long scheme = world.scheme(); // Cr in %, 2 digits
        String schemeName = world.text("SELECT name FROM scheme WHERE id = ?", scheme);
        // invented Cr results around 18.1 %, one far off (σpt 0.10 % in the plan below)
        String[] values = {"18.02", "18.08", "18.10", "18.12", "18.15", "18.60"};
        long[] labs = new long[values.length];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        String code = World.unique("J").toUpperCase();

        browser = Browser.start();

        // 1. sign in through the form: the coordinator lands on what needs them now
        Browser.signIn(browser, home, world.user("coordinator", null));
        assertThat(browser.getCurrentUrl()).endsWith("/coordinator");
        assertThat(browser.findElement(By.tagName("h1")).getText()).isEqualTo("What needs you now");
        Browser.screenshot(browser, "coordinator/journey-01-home");

        // 2. a new round from the form on the rounds page
        Browser.submit(browser, By.cssSelector("header a[href='/rounds'], nav a[href='/rounds']"));
        new Select(browser.findElement(By.id("schemeId"))).selectByVisibleText(schemeName);
        type("code", code);
        type("itemDescription", "Stainless steel disc, 40 mm, polished face up");
        setValue("dispatchDate", LocalDate.now().toString());
        setValue("resultDeadline", LocalDate.now().plusDays(30) + "T17:00");
        new Select(browser.findElement(By.id("timeZone"))).selectByValue("Europe/Berlin");
        type("instructions", "Treat the disc as a routine sample; report the mean of two sparks.");
        show(browser.findElement(By.id("code")));
        Browser.screenshot(browser, "coordinator/journey-02-new-round");
        Browser.submit(browser, By.cssSelector("form[action='/rounds'] button[type=submit]"));
        assertThat(Browser.waitFor(browser, By.id("round-state")).getText()).isEqualTo("Draft");
        assertThat(browser.findElement(By.cssSelector(".notice-ok")).getText()).contains("Round created as a draft");
        long round = Long.parseLong(world.text("SELECT id FROM round WHERE code = ?", code));
        Browser.screenshot(browser, "coordinator/journey-03-round-created");

        // 3. the plan in the form: σpt forgotten — the mistake beside its field, everything typed kept — then fixed
        Browser.submit(browser, By.id("plan-link"));
        Browser.waitFor(browser, By.id("plan-form"));
        assertThat(browser.findElement(By.cssSelector("input[name='Cr.assignedValueMethod'][value='CONSENSUS_ALL']"))
                .isSelected()).isTrue();
        assertThat(browser.findElement(By.cssSelector("input[name='Cr.sigmaPtMethod'][value='FIXED']")).isSelected()).isTrue();
        type("Cr-minimumParticipants", "5");
        type("Cr-exclusionRules", "Results reported as below the limit of detection.");
        Browser.submit(browser, By.id("save-plan"));
        WebElement sigma = Browser.waitFor(browser, By.id("Cr-sigmaPt"));
        assertThat(sigma.getAttribute("aria-invalid")).isEqualTo("true");
        assertThat(browser.findElement(By.id("Cr-sigmaPt-problem")).getText()).isNotBlank();
        assertThat(browser.findElement(By.id("Cr-minimumParticipants")).getAttribute("value")).isEqualTo("5");
        assertThat(browser.findElement(By.id("Cr-exclusionRules")).getAttribute("value"))
                .isEqualTo("Results reported as below the limit of detection.");
        assertThat(world.text("SELECT coalesce(draft_plan, 'none') FROM round WHERE id = ?", round)).isEqualTo("none");
        show(sigma);
        Browser.screenshot(browser, "coordinator/journey-04-plan-mistake");
        type("Cr-sigmaPt", "0.10");
        Browser.submit(browser, By.id("save-plan"));
        assertThat(Browser.waitFor(browser, By.id("plan-message")).getText()).isEqualTo("Draft plan saved.");
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", round)).contains("\"sigmaPt\":\"0.10\"");
        Browser.screenshot(browser, "coordinator/journey-05-plan-saved");

        // 4. freeze the plan: the second step names the consequence (a dialog on the page)
        browser.get(home + "rounds/" + round);
        confirmInDialog("FREEZE_PLAN", null);
        waitForState("Plan frozen");
        step("OPEN_ENROLMENT", "Enrolling");

        // 5. enrol the laboratories one by one from the list of known laboratories
        for (long lab : labs) {
            new Select(browser.findElement(By.id("laboratoryId"))).selectByValue(Long.toString(lab));
            Browser.submit(browser, By.cssSelector("form[action$='/enrolments'] button[type=submit]"));
            Browser.waitFor(browser, By.id("round-state"));
        }
        // the participants a page at a time (the test profile's page size is 5)
        assertThat(browser.findElements(By.cssSelector("#participants tbody tr"))).hasSize(Math.min(5, labs.length));
        assertThat(world.text("SELECT count(*) FROM round_participant WHERE round_id = ?", round))
                .isEqualTo(Integer.toString(labs.length));
        show(browser.findElement(By.id("participants")));
        Browser.screenshot(browser, "coordinator/journey-07-enrolled");

        // 6. homogeneity data as a file on the qualification page, then the decision with its reason
        Browser.submit(browser, By.id("qualification-link"));
        browser.findElement(By.id("homogeneity-file")).sendKeys(homogeneityFile().toString());
        Browser.submit(browser, By.id("check-homogeneity"));
        waitUntil(d -> d.findElement(By.id("checks-Cr")).getText().contains("sufficient"));
        new Select(browser.findElement(By.id("decision-choice-Cr"))).selectByValue("ACCEPT");
        type("decision-reason-Cr", "Both homogeneity criteria met; the discs are used as they are.");
        Browser.submit(browser, By.id("record-decision-Cr"));
        waitUntil(d -> d.findElement(By.id("decision-Cr")).getText().contains("Both homogeneity criteria met"));
        assertThat(browser.findElement(By.id("decision-Cr")).getText()).contains("Accept the items");
        show(browser.findElement(By.id("measurand-Cr")));
        Browser.screenshot(browser, "coordinator/journey-08-qualification");

        // 7. back on the round page: qualified, dispatched, open for results
        Browser.submit(browser, By.id("round-link"));
        step("CONFIRM_QUALIFICATION", "Items qualified");
        step("DISPATCH_ITEMS", "Dispatched");
        assertThat(browser.findElement(By.id("items")).getText()).contains("Dispatched");
        step("OPEN_FOR_RESULTS", "Open for results");
        Browser.screenshot(browser, "coordinator/journey-09-open-for-results");

        // 8. the laboratories submit through the API; the submissions page shows who has
        for (int i = 0; i < labs.length; i++) {
            world.submitCr(round, labs[i], values[i]);
        }
        Browser.submit(browser, By.id("submissions-link"));
        String submissions = Browser.waitFor(browser, By.id("submissions")).getText();
        assertThat(submissions).contains(world.text("SELECT name FROM laboratory WHERE id = ?", labs[0])).contains("Submitted");
        Browser.screenshot(browser, "coordinator/journey-10-submissions");

        // 9. close before the deadline: the second step asks why
        browser.get(home + "rounds/" + round);
        confirmInDialog("CLOSE", "Every laboratory has reported.");
        waitForState("Closed");
        assertThat(browser.findElement(By.id("next-step-link")).getAttribute("href")).endsWith("/rounds/" + round + "/evaluation");

        // 10. evaluate: the run waits as a background job with its progress bar, then links its version
        Browser.submit(browser, By.id("next-step-link"));
        Browser.submit(browser, By.id("start-run"));
        Browser.waitForUrl(browser, url -> url.contains("/evaluation?job="));
        assertThat(browser.findElement(By.id("evaluation-job")).getText()).contains("waiting to start");
        assertThat(browser.findElements(By.cssSelector("#evaluation-job progress"))).hasSize(1);
        Browser.screenshot(browser, "coordinator/journey-12-evaluation-progress");
        runJobs(); // the test profile polls no jobs: run the queued evaluation here, as a worker would
        Browser.waitFor(browser, By.id("job-version")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/evaluation/1"));
        assertThat(browser.findElement(By.id("measurands")).getText()).contains("Cr, item A");
        Browser.screenshot(browser, "coordinator/journey-13-evaluation-summary");

        // 11. the measurand's page: statistics, charts, scores
        Browser.submit(browser, By.cssSelector("a.measurand-link"));
        Browser.waitForUrl(browser, url -> url.endsWith("/measurands/Cr-A"));
        assertThat(browser.findElement(By.id("robust")).getText()).contains("Algorithm A x*");
        assertThat(browser.findElement(By.id("score-table")).getText()).contains("Satisfactory");
        Browser.screenshot(browser, "coordinator/journey-14-measurand-review");
        // the far-off result, by the verdict filter
        new Select(browser.findElement(By.id("verdict"))).selectByValue("unsatisfactory");
        Browser.submit(browser, By.cssSelector("form.filters button"));
        assertThat(browser.findElement(By.id("score-table")).getText()).contains("18.60").contains("Unsatisfactory")
                .doesNotContain("18.12");
        show(browser.findElement(By.id("scores")));
        Browser.screenshot(browser, "coordinator/journey-14b-measurand-unsatisfactory");

        // 12. the home lists the reviewed round; from its page to the reports, where the preliminary report is issued
        Browser.submit(browser, By.cssSelector("nav a[href='/coordinator']"));
        WebElement needs = Browser.waitFor(browser, By.cssSelector("#needs-me tr[data-round='" + code + "']"));
        assertThat(needs.getText()).contains("Evaluation ready for review");
        Browser.screenshot(browser, "coordinator/journey-14c-home-review");
        Browser.submit(browser, By.cssSelector("#needs-me tr[data-round='" + code + "'] a[href='/rounds/" + round + "']"));
        Browser.submit(browser, By.id("reports-link"));
        // the second step names who receives it
        Browser.submit(browser, By.id("issue-preliminary"));
        assertThat(browser.findElement(By.id("confirm-consequence")).getText()).contains("Every participant receives");
        Browser.screenshot(browser, "coordinator/journey-15-preliminary-confirm");
        submitForNotice(By.id("confirm-do"));
        runJobs();
        browser.get(home + "rounds/" + round + "/reports");
        assertThat(browser.findElement(By.id("documents")).getText()).contains(code + "-R-P1");
        submitForNotice(By.id("open-comment-period"));
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Comment period");

        // 13. a laboratory comments (API); the coordinator answers on the reports page
        World.Browser member = world.signIn(world.user("lab-member", labs[5]));
        member.json().body("{\"body\": \"Please check our Cr result: we found 18.14 % on re-measurement.\"}")
                .post("/api/v1/my-rounds/" + round + "/comments").then().statusCode(201);
        Browser.submit(browser, By.cssSelector("nav a[href='/coordinator']"));
        WebElement waiting = Browser.waitFor(browser, By.cssSelector("#needs-me tr[data-round='" + code + "']"));
        assertThat(waiting.getText()).contains("1 comment waiting for an answer");
        Browser.submit(browser, By.cssSelector("#needs-me tr[data-round='" + code + "'] a.button"));
        assertThat(browser.getCurrentUrl()).contains("/rounds/" + round + "/reports");
        WebElement comment = browser.findElement(By.cssSelector(".comment"));
        assertThat(comment.getText()).contains("we found 18.14 %");
        show(comment);
        Browser.screenshot(browser, "coordinator/journey-16-comment");
        WebElement answer = comment.findElement(By.cssSelector("textarea"));
        answer.sendKeys("The result stands as reported: the re-measurement came after the deadline.");
        submitForNotice(By.cssSelector(".comment .answer-button"));
        assertThat(browser.findElement(By.cssSelector(".comment .answer")).getText()).contains("The result stands");

        // 14. sign-off and the final report
        submitForNotice(By.id("sign-off"));
        assertThat(browser.findElement(By.id("sign-offs")).getText()).doesNotContain("No sign-off yet");
        Browser.submit(browser, By.id("issue-final"));
        assertThat(browser.findElement(By.id("confirm-title")).getText()).isNotBlank();
        Browser.screenshot(browser, "coordinator/journey-17-final-confirm");
        submitForNotice(By.id("confirm-do"));
        runJobs();
        browser.get(home + "rounds/" + round + "/reports");
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Final report issued");
        WebElement finalRow = browser.findElements(By.cssSelector("#documents tbody tr")).stream()
                .filter(r -> r.findElement(By.tagName("td")).getText().startsWith(code + "-R-F")).findFirst().orElseThrow();
        show(finalRow);
        Browser.screenshot(browser, "coordinator/journey-18-final-issued");

        // 15. the final round report read in the browser
        WebElement read = finalRow.findElement(By.linkText("read in the browser"));
        show(read);
        read.click();
        Browser.waitForUrl(browser, url -> url.endsWith("/html"));
        assertThat(browser.getCurrentUrl()).contains("/documents/");
        assertThat(Browser.waitFor(browser, By.tagName("body")).getText()).contains(code + "-R-F");
        Browser.screenshot(browser, "coordinator/journey-19-final-report-html");

        browser.get(home + "coordinator");
        Browser.screenshot(browser, "coordinator/journey-20-home-after");
    }

    // ---- clicks and waits ----------------------------------------------------------------------------------

    /** A lifecycle step without a second step: its button on the round page, then the new state. */
    private void step(String action, String state) {
        Browser.submit(browser, By.cssSelector("button[data-action=" + action + "]"));
        waitForState(state);
    }

    /** A step that cannot be undone: its button opens the second step in a dialog; that dialog's button does it. */
    private void confirmInDialog(String action, String reason) {
        browser.findElement(By.cssSelector("button[data-action=" + action + "]")).click();
        Browser.waitFor(browser, By.cssSelector("#confirm-dialog[open] #confirm-consequence"));
        if (reason != null) {
            browser.findElement(By.cssSelector("#confirm-dialog #confirm-reason")).sendKeys(reason);
        }
        Browser.screenshot(browser, "coordinator/journey-" + (action.equals("CLOSE") ? "11-close" : "06-freeze") + "-confirm");
        Browser.submit(browser, By.cssSelector("#confirm-dialog #confirm-do"));
    }

    private void waitForState(String expected) {
        waitUntil(d -> expected.equals(d.findElement(By.id("round-state")).getText()));
    }

    private void waitUntil(java.util.function.Function<WebDriver, Boolean> condition) {
        new WebDriverWait(browser, Duration.ofSeconds(20))
                .ignoring(org.openqa.selenium.StaleElementReferenceException.class)
                .ignoring(org.openqa.selenium.NoSuchElementException.class)
                .until(condition::apply);
    }

    /** Submits a form by its button, waits for the answering page, then for its success notice. */
    private void submitForNotice(By button) {
        Browser.submit(browser, button);
        Browser.waitFor(browser, By.cssSelector(".notice-ok"));
    }

    private void runJobs() {
        while (runner.runNext()) {
            // every queued job: the evaluation, the report issues
        }
    }

    private void show(WebElement element) {
        ((JavascriptExecutor) browser).executeScript("arguments[0].scrollIntoView({block: 'center'});", element);
    }

    private void type(String id, String text) {
        WebElement field = browser.findElement(By.id(id));
        show(field);
        field.clear();
        field.sendKeys(text);
    }

    /** Date inputs take their keys in the browser's locale: set the value as the form sends it. */
    private void setValue(String id, String value) {
        ((JavascriptExecutor) browser).executeScript("document.getElementById(arguments[0]).value = arguments[1];", id, value);
    }

    /** The §14.8 duplicates of the qualification tests (src/test/resources/scheme/SOURCE.md) as a file to upload. */
    private static Path homogeneityFile() {
        try (InputStream in = CoordinatorJourneyBrowserTest.class.getResourceAsStream("/scheme/homogeneity-cr-stainless.csv")) {
            Path file = Files.createTempFile("homogeneity", ".csv");
            Files.write(file, in.readAllBytes());
            file.toFile().deleteOnExit();
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
