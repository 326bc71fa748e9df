package org.roundtable.history;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A laboratory member in Chromium: reads the record over rounds (charts, warnings, combined scores), filters it,
 * and records a corrective action for the unsatisfactory result with a PDF as evidence. Screenshots in
 * target/screenshots/history/.
 */
@QuarkusTest
class HistoryPagesBrowserTest {

    @TestHTTPResource("/")
    URL base;

    @Inject
    World world;

    @Inject
    HistoryRounds rounds;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    @Test
    void aMemberReadsTheHistoryAndRecordsACorrectiveActionForTheUnsatisfactoryResult() throws Exception {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        for (String v : new String[]{"18.05", "18.12", "17.94", "18.21", "18.33", "18.08"}) {
            rounds.published(scheme, lab, v, ReportStatus.FINAL); // z = +0.5 +1.2 −0.6 +2.1 +3.3 +0.8
        }
        String member = world.user("lab-member", lab);
        browser = Browser.start();
        browser.manage().window().setSize(new Dimension(1280, 2200));
        Files.createDirectories(Path.of("target", "screenshots", "history"));

        browser.get(base + "login?next=/my-laboratory/history");
        browser.findElement(By.id("username")).sendKeys(member);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/my-laboratory/history"));

        String warnings = Browser.waitFor(browser, By.id("early-warnings")).getText();
        assertThat(warnings).contains("Unsatisfactory result", "Common practice");
        assertThat(browser.findElements(By.cssSelector(".history-measurand svg"))).hasSizeGreaterThanOrEqualTo(2);
        assertThat(browser.findElements(By.cssSelector(".history-measurand svg a"))).hasSizeGreaterThanOrEqualTo(6);
        assertThat(browser.findElement(By.cssSelector(".history-measurand table.combined")).getText()).contains("RSZ");
        Browser.screenshot(browser, "history/record-over-rounds");

        new Select(browser.findElement(By.id("filter-measurand"))).selectByValue("Cr");
        browser.findElement(By.id("filter-rounds")).sendKeys("2");
        Browser.submit(browser, By.cssSelector("#history-filter button"));
        assertThat(browser.getCurrentUrl()).contains("measurand=Cr", "rounds=2");
        assertThat(browser.findElement(By.cssSelector(".history-measurand h3")).getText()).contains("Combined scores, rounds");

        browser.findElement(By.linkText("Record a corrective action")).click();
        Browser.waitFor(browser, By.id("new-corrective-action"));
        Browser.screenshot(browser, "history/new-corrective-action");
        browser.findElement(By.id("ca-cause")).sendKeys("Argon purity dropped after a cylinder change");
        browser.findElement(By.id("ca-action")).sendKeys("Replaced the cylinder and added a purity check to the start-up routine");
        Browser.submit(browser, By.cssSelector("#new-corrective-action button"));
        Browser.waitFor(browser, By.id("edit-corrective-action"));
        assertThat(browser.findElement(By.tagName("h1")).getText()).contains("Corrective action no.");

        Path evidence = Files.createTempFile("evidence", ".pdf");
        Files.write(evidence, "%PDF-1.7\n% purity record\n%%EOF\n".getBytes(StandardCharsets.US_ASCII));
        browser.findElement(By.id("ca-file")).sendKeys(evidence.toString());
        Browser.submit(browser, By.cssSelector("#attach-form button"));
        assertThat(Browser.waitFor(browser, By.id("form-message")).getText()).contains("Attached");
        assertThat(browser.findElement(By.id("attachments")).getText()).contains(".pdf");
        Browser.screenshot(browser, "history/corrective-action");

        // a file that only claims to be a PDF is refused with the reason, the entry unchanged
        Path fake = Files.createTempFile("fake", ".pdf");
        Files.write(fake, "GIF89a not a pdf".getBytes(StandardCharsets.US_ASCII));
        browser.findElement(By.id("ca-file")).sendKeys(fake.toString());
        Browser.submit(browser, By.cssSelector("#attach-form button"));
        assertThat(Browser.waitFor(browser, By.id("form-error")).getText()).contains("PDF, PNG or JPEG");
        Browser.screenshot(browser, "history/attachment-refused");
    }
}
