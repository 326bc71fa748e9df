package org.roundtable.web;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * The shared page pieces in Chromium: cancelling a round that holds results goes through a second step that names
 * the consequence and asks a reason; a viewer's own time zone shows beside the round's on a deadline. The
 * browser's page checks (no constant names, no serious accessibility violation) run on every page visited.
 */
@QuarkusTest
class ConfirmationBrowserTest {

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

    @Test
    void cancellingARoundIsRefusedWithoutTheSecondStepAndDoneWithIt() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        world.submitCr(round, lab, "18.12");
        String coordinator = world.user("coordinator", null);
        browser = Browser.start();
        signIn(coordinator);

        browser.get(home + "rounds/" + round);
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Open for results");
        Browser.screenshot(browser, "foundation/round-open");
        // with htmx the second step opens in a dialog on the same page; nothing is cancelled by the first click
        browser.findElement(By.cssSelector("button[data-action=CANCEL]")).click();
        Browser.waitFor(browser, By.cssSelector("#confirm-dialog[open] #confirm-consequence"));
        assertThat(browser.findElement(By.cssSelector("#confirm-dialog #confirm-consequence")).getText())
                .contains("ends for good").contains("1 laboratory has reported results");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("OPEN_FOR_RESULTS");
        Browser.screenshot(browser, "foundation/cancel-dialog");
        browser.findElement(By.cssSelector("#confirm-dialog #confirm-back")).click();
        assertThat(browser.findElements(By.cssSelector("#confirm-dialog[open]"))).isEmpty();

        // without JavaScript the first post answers the second step as a page of its own
        org.openqa.selenium.WebElement page = browser.findElement(By.tagName("html"));
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.querySelector('button[data-action=CANCEL]').form.submit();");
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20))
                .until(org.openqa.selenium.support.ui.ExpectedConditions.stalenessOf(page));
        assertThat(browser.findElement(By.id("confirm-title")).getText()).startsWith("Cancel round");
        assertThat(browser.findElement(By.id("confirm-consequence")).getText())
                .contains("ends for good").contains("1 laboratory has reported results");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("OPEN_FOR_RESULTS");
        Browser.screenshot(browser, "foundation/cancel-second-step");

        // the reason is required for a round that holds results: the server refuses a confirmation without one
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript(
                "document.getElementById('confirm-reason').removeAttribute('required');");
        Browser.submit(browser, By.id("confirm-do"));
        assertThat(browser.findElement(By.cssSelector(".notice-error")).getText()).contains("give a reason");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("OPEN_FOR_RESULTS");

        browser.findElement(By.id("confirm-reason")).sendKeys("The items were found to be from the wrong melt.");
        Browser.submit(browser, By.id("confirm-do"));
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Cancelled");
        assertThat(world.text("SELECT detail FROM audit_event WHERE action = 'round.cancel' AND object_id = ?",
                Long.toString(round))).contains("reason=The items were found to be from the wrong melt.");
        Browser.screenshot(browser, "foundation/round-cancelled");
    }

    @Test
    void aDeadlineShowsTheRoundsZoneAndTheViewersChosenZone() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab); // deadline zone Europe/Berlin
        String coordinator = world.user("coordinator", null);
        browser = Browser.start();
        signIn(coordinator);
        browser.get(home + "account");
        new Select(browser.findElement(By.id("timeZone"))).selectByValue("Asia/Tokyo");
        Browser.submit(browser, By.cssSelector("#time-zone-form button[type=submit]"));
        assertThat(browser.findElement(By.cssSelector(".notice-ok")).getText()).contains("Asia/Tokyo");
        Browser.screenshot(browser, "foundation/account-time-zone");

        browser.get(home + "rounds/" + round);
        String deadline = browser.findElement(By.cssSelector("time.deadline")).getText();
        assertThat(deadline).matches("\\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d Europe/Berlin \\((\\d{4}-\\d\\d-\\d\\d )?\\d\\d:\\d\\d Asia/Tokyo\\)");
        Browser.screenshot(browser, "foundation/round-deadline-two-zones");
    }

    @Test
    void cancellingThroughTheApiNeedsAReasonWhenTheRoundHoldsResults() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        world.submitCr(round, lab, "18.12");
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.json().body(java.util.Map.of("action", "CANCEL")).post("/api/v1/rounds/" + round + "/transitions")
                .then().statusCode(400);
        coordinator.json().body(java.util.Map.of("action", "CANCEL", "reason", "Wrong melt."))
                .post("/api/v1/rounds/" + round + "/transitions").then().statusCode(200);
        long empty = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        coordinator.json().body(java.util.Map.of("action", "CANCEL")).post("/api/v1/rounds/" + empty + "/transitions")
                .then().statusCode(200);
    }

    private void signIn(String username) {
        Browser.signIn(browser, home, username);
    }
}
