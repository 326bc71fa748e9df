package org.roundtable.account;

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

/** A laboratory manager's journey in Chromium: sign in, create a LIMS token, grant an auditor access, sign out. */
@QuarkusTest
class LaboratoryManagerBrowserTest {

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

    @Test
    void managerSignsInCreatesATokenGrantsAnAuditorAndSignsOut() {
        long lab = world.laboratory();
        String manager = world.user("lab-manager", lab);
        String auditor = world.user("auditor", null);
        browser = Browser.start();

        browser.get(base + "my-laboratory");
        assertThat(browser.getCurrentUrl()).contains("/login?next=");
        browser.findElement(By.id("username")).sendKeys(manager);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/my-laboratory"));
        assertThat(browser.findElement(By.tagName("h1")).getText()).startsWith("Lab-");

        browser.findElement(By.id("tokenName")).sendKeys("LIMS export");
        browser.findElement(By.cssSelector("form[action='/my-laboratory/tokens'] button")).click();
        String secret = Browser.waitFor(browser, By.id("new-token")).getText();
        assertThat(secret).startsWith("rt_");
        Browser.screenshot(browser, "my-laboratory-token-created");

        browser.findElement(By.id("auditorUsername")).sendKeys(auditor);
        browser.findElement(By.id("validUntil")).sendKeys(java.time.LocalDate.now().plusDays(90)
                .format(java.time.format.DateTimeFormatter.ofPattern("MM/dd/yyyy")));
        browser.findElement(By.cssSelector("form[action='/my-laboratory/auditor-grants'] button")).click();
        new org.openqa.selenium.support.ui.WebDriverWait(browser, java.time.Duration.ofSeconds(20))
                .until(d -> d.getPageSource().contains(auditor));
        assertThat(browser.getPageSource()).contains(auditor).contains("active");
        browser.navigate().refresh();
        assertThat(browser.getPageSource()).as("the token secret is shown only once").doesNotContain(secret);

        browser.findElement(By.cssSelector("form[action='/logout'] button")).click();
        Browser.waitForUrl(browser, url -> url.contains("/login"));
        browser.get(base + "my-laboratory");
        assertThat(browser.getCurrentUrl()).contains("/login");
    }

    @Test
    void managerCreatesAScoresTokenWithAnExpiryAndRevokesItAfterBeingToldWhatStopsWorking() {
        long lab = world.laboratory();
        String manager = world.user("lab-manager", lab);
        world.grant(lab, world.user("auditor", null));
        long ended = world.grant(lab, world.user("auditor", null));
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '40 days', valid_until = now() - interval '2 days' "
                + "WHERE id = ?", ended);
        browser = Browser.start();
        browser.get(base + "login?next=/my-laboratory");
        browser.findElement(By.id("username")).sendKeys(manager);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/my-laboratory"));

        browser.findElement(By.id("tokenName")).sendKeys("LIMS scores import");
        new org.openqa.selenium.support.ui.Select(browser.findElement(By.id("tokenScope"))).selectByVisibleText("Read scores");
        browser.findElement(By.id("tokenExpiry")).sendKeys(java.time.LocalDate.now().plusDays(180)
                .format(java.time.format.DateTimeFormatter.ofPattern("MM/dd/yyyy")));
        Browser.submit(browser, By.cssSelector("form[action='/my-laboratory/tokens'] button"));
        assertThat(Browser.waitFor(browser, By.id("new-token")).getText()).startsWith("rt_");
        String tokens = browser.findElement(By.id("tokens")).getText();
        assertThat(tokens).contains("LIMS scores import").contains("Read scores").contains("active");
        assertThat(browser.getPageSource()).contains("status-bad\">expired</span>");
        ((org.openqa.selenium.JavascriptExecutor) browser).executeScript("arguments[0].scrollIntoView(true);",
                browser.findElement(By.id("tokens-heading")));
        Browser.screenshot(browser, "laboratory/11-my-laboratory");

        browser.findElement(By.cssSelector("button[data-action='revoke-token']")).click();
        org.openqa.selenium.WebElement consequence = new org.openqa.selenium.support.ui.WebDriverWait(browser,
                java.time.Duration.ofSeconds(20)).until(org.openqa.selenium.support.ui.ExpectedConditions
                .visibilityOfElementLocated(By.id("confirm-consequence")));
        assertThat(consequence.getText()).contains("can no longer read your laboratory's scores");
        Browser.screenshot(browser, "laboratory/12-revoke-confirm");
        Browser.submit(browser, By.id("confirm-do"));
        assertThat(Browser.waitFor(browser, By.id("tokens")).getText()).contains("revoked");
    }
}
