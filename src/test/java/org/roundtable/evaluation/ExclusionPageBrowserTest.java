package org.roundtable.evaluation;

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

import static org.assertj.core.api.Assertions.assertThat;

/** A coordinator in Chromium marks a result as a blunder on the round's blunders page and sees it listed. */
@QuarkusTest
class ExclusionPageBrowserTest {

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
    void aCoordinatorMarksABlunderWithItsReasonAndSeesItListed() {
        long lab = world.laboratory();
        long round = world.round(RoundState.CLOSED, lab);
        world.reportResult(round, lab, "Cr", "1.812", null, "spark-oes", false);
        String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ?", round);
        String coordinator = world.user("coordinator", null);
        browser = Browser.start();
        browser.get(home + "login");
        browser.findElement(By.id("username")).sendKeys(coordinator);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form button[type=submit]")).click();
        Browser.waitForUrl(browser, url -> !url.contains("/login"));

        browser.get(home + "rounds/" + round + "/exclusions");
        assertThat(browser.findElement(By.id("current-exclusions")).getText()).contains("No result is marked");
        new Select(browser.findElement(By.id("participantCode"))).selectByValue(code);
        new Select(browser.findElement(By.id("element"))).selectByValue("Cr");
        browser.findElement(By.id("reason")).sendKeys("decimal point slipped (1.812 for 18.12)");
        browser.findElement(By.xpath("//button[text()='Mark as blunder']")).click();

        Browser.waitFor(browser, By.cssSelector("p.notice-ok"));
        String current = browser.findElement(By.id("current-exclusions")).getText();
        assertThat(current).contains(code).contains("Cr").contains("1.812").contains("decimal point slipped");
        Browser.screenshot(browser, "blunder-marked");
    }
}
