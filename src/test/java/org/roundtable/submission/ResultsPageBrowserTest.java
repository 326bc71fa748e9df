package org.roundtable.submission;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.assertj.core.api.Assertions.assertThat;

/** A laboratory member's results journey in Chromium: a form entry, a warning to confirm, a CSV with a bad row. */
@QuarkusTest
class ResultsPageBrowserTest {

    @TestHTTPResource("/")
    URL base;

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
        Browser.signIn(browser, base, username);
    }

    @Test
    void memberEntersResultsConfirmsAWarningAndSeesAWholeFileRejectedForOneBadRow() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        browser = Browser.start();
        signIn(world.user("lab-member", lab));
        browser.get(base + "my-rounds/" + round + "/results");
        assertThat(browser.getPageSource()).contains("Nothing submitted yet");

        // a value outside the expected range: the page asks for confirmation and saves nothing
        browser.findElement(By.name("value.Cr.A")).sendKeys("1.81");
        browser.findElement(By.name("u.Cr.A")).sendKeys("0.05");
        browser.findElement(By.cssSelector("form[action$='/results/form'] button")).click();
        assertThat(Browser.waitFor(browser, By.id("problems")).getText()).contains("outside the expected range");
        assertThat(browser.getPageSource()).contains("Nothing submitted yet");

        assertThat(browser.findElement(By.name("value.Cr.A")).getAttribute("value")).as("the entry is kept").isEqualTo("1.81");
        assertThat(browser.findElement(By.name("u.Cr.A")).getAttribute("value")).isEqualTo("0.05");
        browser.findElement(By.name("value.Cr.A")).clear();
        browser.findElement(By.name("value.Cr.A")).sendKeys("18.12");
        browser.findElement(By.cssSelector("form[action$='/results/form'] button")).click();
        assertThat(Browser.waitFor(browser, By.id("receipt")).getText()).contains("revision 1").contains("SHA-256");
        assertThat(browser.findElement(By.id("current-results")).getText()).contains("18.12");
        Browser.screenshot(browser, "results-receipt");

        // a CSV with one bad row: rejected whole, with row, column and reason
        Path csv = Files.createTempFile("results", ".csv");
        Files.writeString(csv, "measurand,value,unit,method,replicates\nCr,18.20,%,spark-oes,2\nCr,18.30,%,laser,2\n",
                StandardCharsets.UTF_8);
        browser.findElement(By.id("file")).sendKeys(csv.toString());
        browser.findElement(By.cssSelector("#upload-form button")).click();
        String problems = Browser.waitFor(browser, By.id("problems")).getText();
        assertThat(problems).contains("3").contains("method");
        assertThat(browser.findElement(By.id("current-results")).getText()).as("revision 1 is still the one in force")
                .contains("18.12").doesNotContain("18.20");
        Browser.screenshot(browser, "results-upload-rejected");
    }
}
