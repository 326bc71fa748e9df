package org.roundtable.scheme;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator in Chromium: signs in, qualifies a round's items by pasting the homogeneity data, confirms
 * qualification and dispatches — the state and the figures show on the page.
 */
@QuarkusTest
class RoundPageBrowserTest {

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
    void aCoordinatorChecksHomogeneityConfirmsQualificationAndDispatchesInTheBrowser() {
        long lab = world.laboratory();
        long round = world.round(RoundState.ENROLLING, lab);
        String coordinator = world.user("coordinator", null);
        browser = Browser.start();
        browser.get(home + "login");
        browser.findElement(By.id("username")).sendKeys(coordinator);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form button[type=submit]")).click();

        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(10))
                .until(d -> !d.getCurrentUrl().contains("/login") || d.getPageSource().contains("notice-error")
                        || d.getPageSource().contains("panel-error"));
        assertThat(browser.getCurrentUrl()).as(browser.getPageSource()).doesNotContain("/login");
        browser.get(home + "rounds/" + round);
        assertThat(browser.getTitle()).as(browser.getPageSource()).contains("Round");
        assertThat(browser.findElement(By.id("round-state")).getText()).isEqualTo("Enrolling");
        browser.findElement(By.id("qualification-link")).click();
        Browser.waitFor(browser, By.id("homogeneity-csv")).sendKeys(HomogeneityWorkedExampleTest.csv());
        Browser.submit(browser, By.id("check-homogeneity"));
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20))
                .until(d -> d.findElement(By.id("checks-Cr")).getText().contains("sufficient"));
        String table = browser.findElement(By.id("checks-Cr")).getText();
        // statistics reference §14.8 (CALC): s_w 0.0167332, s_s 0.0116905, √c 0.0444382 — at Cr's 2 digits + 1
        assertThat(table).contains("0.017").contains("0.012").contains("0.044").contains("sufficient");
        // the decision select offers every decision, the one adding u_hom and u_stab among them
        assertThat(browser.findElements(By.cssSelector("#decision-choice-Cr option")).stream()
                .map(o -> o.getAttribute("value")).toList())
                .contains("ADD_HOMOGENEITY_UNCERTAINTY", "ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY");
        browser.findElement(By.id("round-link")).click();
        Browser.waitFor(browser, By.id("round-state"));

        browser.findElement(By.cssSelector("button[data-action=CONFIRM_QUALIFICATION]")).click();
        waitForState("Items qualified");
        browser.findElement(By.cssSelector("button[data-action=DISPATCH_ITEMS]")).click();
        waitForState("Dispatched");
        assertThat(browser.findElement(By.id("items")).getText()).contains("Dispatched");
        Browser.screenshot(browser, "round-dispatched");
    }

    /** A click on a form button can return before the next page is there (busy machine): wait for the new state. */
    private void waitForState(String expected) {
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20))
                .ignoring(org.openqa.selenium.StaleElementReferenceException.class)
                .until(d -> expected.equals(d.findElement(By.id("round-state")).getText()));
    }
}
