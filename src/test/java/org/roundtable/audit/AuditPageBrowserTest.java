package org.roundtable.audit;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator reads the audit trail in Chromium: how far the chain is verified, the entries in words, filtered
 * by kind of action, and the whole chain checked on demand. The page fits a 1,366 px screen.
 */
@QuarkusTest
class AuditPageBrowserTest {

    @TestHTTPResource("/")
    URL base;

    @Inject
    World world;

    @Inject
    JobRunner runner;

    @Inject
    AuditCheckpointSchedule schedule;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    @Test
    void coordinatorFiltersTheTrailAndChecksTheWholeChain() {
        String manager = world.user("lab-manager", world.laboratory());
        World.Browser session = world.signIn(manager);
        for (int i = 0; i < 2; i++) {
            session.json().body("{\"name\":\"browser " + i + "\"}").post("/api/v1/my-laboratory/tokens")
                    .then().statusCode(200);
        }

        browser = Browser.start();
        Browser.signIn(browser, base, world.user("coordinator", null));

        // the background pass that the test profile does not schedule
        schedule.catchUp(AuditCheckpointSchedule.PASSES_PER_TICK);
        browser.get(base + "audit");
        assertThat(browser.findElement(By.id("chain-status")).getText()).startsWith("Verified up to entry");
        assertThat(browser.findElement(By.id("audit-entries")).getText()).contains("API token created")
                .doesNotContain("api-token.created");
        long overflow = (Long) ((JavascriptExecutor) browser).executeScript(
                "return document.documentElement.scrollWidth - document.documentElement.clientWidth");
        assertThat(overflow).as("the page fits the window's width").isLessThanOrEqualTo(0L);
        Browser.screenshot(browser, "coordinator/32-audit-trail");

        browser.findElement(By.id("actor")).sendKeys(manager);
        new Select(browser.findElement(By.id("action"))).selectByVisibleText("API token created");
        Browser.submit(browser, By.cssSelector("#audit-filters button"));
        assertThat(browser.findElements(By.cssSelector("#audit-entries tbody tr"))).hasSize(2);

        Browser.submit(browser, By.id("verify-all"));
        assertThat(browser.findElement(By.id("full-check")).getText()).contains("Check of the whole chain");
        while (runner.runNext(AuditVerificationJob.KIND)) {
            // the test profile polls no jobs by itself: run the check here, as a worker would
        }
        browser.navigate().refresh();
        assertThat(browser.findElement(By.id("full-check")).getText()).contains("Done");
        assertThat(browser.findElement(By.id("verification")).getText()).contains("the whole chain was last checked");
    }
}
