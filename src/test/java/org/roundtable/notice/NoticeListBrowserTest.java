package org.roundtable.notice;

import io.quarkus.narayana.jta.QuarkusTransaction;
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
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;

/** A laboratory member's notice list in Chromium: the unread count in the header, the list, marking read and opening. */
@QuarkusTest
class NoticeListBrowserTest {

    @TestHTTPResource("/")
    URL base;

    @Inject
    World world;

    @Inject
    NoticeService notices;

    private WebDriver browser;

    @AfterEach
    void quit() {
        if (browser != null) {
            browser.quit();
        }
    }

    @Test
    void aMemberSeesTheUnreadCountReadsANoticeAndOpensItsPage() throws Exception {
        long lab = world.laboratory();
        String member = world.user("lab-member", lab);
        world.sql("UPDATE app_user SET time_zone = 'Europe/Berlin' WHERE username = ?", member);
        long user = world.userId(member);
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        Instant deadline = Instant.parse("2027-03-15T16:00:00Z");
        QuarkusTransaction.requiringNew().run(() -> {
            notices.notify(NoticeKind.ROUND_OPENED, "round:" + round, user,
                    Map.of("round", code, "roundId", round, "deadline", deadline));
            notices.notify(NoticeKind.REMINDER, "reminder:browser-" + round, user, Map.of("round", code, "roundId", round,
                    "deadline", deadline, "message", "Please send the Cr result of item A before Friday."));
        });
        browser = Browser.start();

        browser.get(base + "notices");
        browser.findElement(By.id("username")).sendKeys(member);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/notices"));

        assertThat(browser.findElement(By.cssSelector(".notice-count .badge-unread")).getText()).isEqualTo("2");
        assertThat(browser.findElement(By.id("notice-summary")).getText()).contains("2 unread of 2").contains("Europe/Berlin");
        String page = browser.findElement(By.cssSelector(".notice-list")).getText();
        assertThat(page).contains("Round " + code + " is open for results")
                .contains("2027-03-15 17:00 Europe/Berlin")
                .contains("Please send the Cr result of item A before Friday.")
                .doesNotContain("round-opened").doesNotContain("REMINDER");
        Files.createDirectories(Path.of("target", "screenshots", "notices"));
        Browser.screenshot(browser, "notices/notice-list");

        Browser.submit(browser, By.cssSelector("li[data-kind='round-opened'] form button"));
        Browser.waitForUrl(browser, url -> url.endsWith("/my-rounds/" + round + "/results"));
        browser.get(base + "notices");
        assertThat(browser.findElement(By.cssSelector(".notice-count .badge-unread")).getText()).isEqualTo("1");
        assertThat(browser.findElement(By.cssSelector("li[data-kind='round-opened']")).getAttribute("class"))
                .isEqualTo("notice-read");
    }
}
