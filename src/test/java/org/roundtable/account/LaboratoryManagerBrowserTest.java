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
}
