package org.roundtable.web;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.roundtable.testing.Browser;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

@QuarkusTest
class HomePageBrowserTest {

    @TestHTTPResource("/")
    URL home;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    @Test
    void startPageRendersWithItsStylesheetInChromium() {
        browser = Browser.start();
        browser.get(home.toString());
        assertThat(browser.getTitle()).contains("Roundtable");
        assertThat(browser.findElement(By.tagName("h1")).getText())
                .isEqualTo("Proficiency testing for metals-analysis laboratories");
        String background = browser.findElement(By.cssSelector(".masthead")).getCssValue("background-color");
        assertThat(background).as("the local stylesheet is applied (no CDN)").isEqualTo("rgba(45, 74, 87, 1)");
        Browser.screenshot(browser, "home");
    }
}
