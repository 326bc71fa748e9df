package org.roundtable.precision;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import java.net.URL;
import java.time.LocalDate;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

/**
 * In Chromium: a coordinator creates a precision experiment from the pages by clicking, from the coordinator's
 * home: chooses the scheme, fills in the study, two levels (the second with the first one's label by mistake) and
 * forgets the measurand; the form comes back with the problems beside their fields and everything typed kept; then
 * corrected, the study is created as a draft and its page shows the design. Screenshots under
 * target/screenshots/precision/.
 */
@QuarkusTest
class PrecisionCreateBrowserTest {

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

    private void type(String id, String text) {
        browser.findElement(By.id(id)).clear();
        browser.findElement(By.id(id)).sendKeys(text);
    }

    private void setValue(String id, String value) {
        ((JavascriptExecutor) browser).executeScript("document.getElementById(arguments[0]).value = arguments[1]", id, value);
    }

    @Test
    void aCoordinatorCreatesAStudyByClickingAndSeesProblemsBesideTheFieldsWithTheTypedInputKept() {
        long scheme = new PrecisionStudies(world).scheme();
        String coordinator = world.user("coordinator", null);
        String code = World.unique("PE").toUpperCase();
        browser = Browser.start();
        Browser.signIn(browser, home, coordinator);
        browser.get(home + "coordinator");
        Browser.submit(browser, By.id("new-precision-experiment"));
        Browser.screenshot(browser, "precision/01-choose-scheme");
        new Select(browser.findElement(By.id("scheme"))).selectByValue(Long.toString(scheme));
        Browser.submit(browser, By.cssSelector("#scheme-form button[type=submit]"));
        Browser.waitFor(browser, By.id("create-form"));
        assertThat(browser.findElement(By.id("measurands")).getText()).contains("C").contains("%");

        type("code", code);
        type("itemDescription", "Steel chips, 20 g per level");
        setValue("dispatchDate", LocalDate.now().toString());
        setValue("resultDeadline", LocalDate.now().plusDays(30) + "T17:00");
        type("instructions", "Analyse each level twice under repeatability conditions.");
        type("level-1-label", "1");
        type("level-1-material", "Low-carbon steel chips");
        type("level-2-label", "1");
        type("level-2-material", "High-carbon steel chips");
        Browser.screenshot(browser, "precision/02-form-filled");
        Browser.submit(browser, By.id("create-study"));
        Browser.waitFor(browser, By.id("create-error"));
        assertThat(browser.findElement(By.id("create-error")).getText()).contains("Another level has the label 1");
        ((JavascriptExecutor) browser).executeScript("document.getElementById('levels').scrollIntoView()");
        Browser.screenshot(browser, "precision/03-problems-beside-fields");
        assertThat(browser.findElement(By.id("level-2-problem")).getText()).contains("Another level has the label 1");
        assertThat(browser.findElement(By.id("measurands-problem")).getText()).contains("Tick at least one measurand");
        // what was typed is still there
        assertThat(browser.findElement(By.id("code")).getAttribute("value")).isEqualTo(code);
        assertThat(browser.findElement(By.id("level-2-material")).getAttribute("value")).isEqualTo("High-carbon steel chips");
        assertThat(browser.findElement(By.id("instructions")).getAttribute("value")).contains("repeatability conditions");
        assertThat(browser.findElement(By.id("replicates")).getAttribute("value")).isEqualTo("2");
        assertThat(world.text("SELECT count(*)::text FROM round WHERE code = ?", code)).isEqualTo("0");

        type("level-2-label", "2");
        browser.findElement(By.id("measurand-C")).click();
        Browser.submit(browser, By.id("create-study"));
        Browser.waitForUrl(browser, url -> url.matches(".*/precision-experiments/\\d+$"));
        Browser.screenshot(browser, "precision/04-study-created");
        assertThat(browser.findElement(By.tagName("h1")).getText()).contains(code).contains("being planned");
        assertThat(browser.findElement(By.tagName("body")).getText()).contains("Level 2: High-carbon steel chips")
                .contains("2 replicates per laboratory and level").contains("straggler level 0.05, outlier level 0.01");
        assertThat(world.text("SELECT kind || ' ' || state || ' ' || items_per_laboratory FROM round WHERE code = ?", code))
                .isEqualTo("PRECISION_EXPERIMENT DRAFT 2");

        browser.get(home + "precision-experiments");
        assertThat(browser.findElement(By.id("studies")).getText()).contains(code).contains("Draft");
        Browser.screenshot(browser, "precision/05-list-with-new-study");
    }
}
