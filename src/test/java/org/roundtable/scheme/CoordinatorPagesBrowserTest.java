package org.roundtable.scheme;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.support.ui.WebDriverWait;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator and an administrator in Chromium at 1,366 × 900: sample qualification from a file and from pasted
 * lines (and a bad file refused beside its field), the submissions of a round, and the users page with the
 * laboratory search. Screenshots under target/screenshots/coordinator/.
 */
@QuarkusTest
class CoordinatorPagesBrowserTest {

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
    void aCoordinatorQualifiesFromAFileFollowsTheSubmissionsAndAnAdministratorChoosesALaboratoryFromTheSearch() {
        long lab = world.laboratory();
        long round = world.round(RoundState.ENROLLING, lab);
        browser = Browser.start();
        signIn(world.user("coordinator", null));

        // sample qualification: homogeneity from a CSV file, stability pasted
        browser.get(home + "rounds/" + round + "/qualification");
        browser.findElement(By.id("homogeneity-file")).sendKeys(file("homogeneity", ".csv",
                HomogeneityWorkedExampleTest.csv()).toString());
        Browser.submit(browser, By.id("check-homogeneity"));
        wait(d -> d.findElement(By.id("checks-Cr")).getText().contains("sufficient"));
        browser.findElement(By.id("stability-csv")).sendKeys(
                HomogeneityWorkedExampleTest.resource("/scheme/stability-cr-stainless.csv"));
        Browser.submit(browser, By.id("check-stability"));
        wait(d -> d.findElement(By.id("checks-Cr")).getText().contains("stable"));
        String checks = browser.findElement(By.id("checks-Cr")).getText();
        // statistics reference §14.8 (CALC): s_s 0.0116905 ≤ 0.3 σpt = 0.030, at Cr's 2 digits + 1
        assertThat(checks).contains("0.012").contains("0.030").contains("sufficient");
        assertThat(browser.findElement(By.id("decision-Cr")).getText()).contains("Accept the items");
        scrollTo("measurand-Cr");
        Browser.screenshot(browser, "coordinator/20-qualification");

        // a file with the wrong header: the reason beside the field, nothing stored
        browser.get(home + "rounds/" + round + "/qualification");
        browser.findElement(By.id("homogeneity-file")).sendKeys(file("homogeneity-wrong", ".csv",
                HomogeneityWorkedExampleTest.csv().replace("item,replicate", "sample,replicate")).toString());
        Browser.submit(browser, By.id("check-homogeneity"));
        String problem = Browser.waitFor(browser, By.id("homogeneity-problem")).getText();
        assertThat(problem).contains("Line 1: the header must be item,replicate,measurand,value");
        Browser.screenshot(browser, "coordinator/21-qualification-upload-error");

        // the submissions of an open round: on time, late and missing, by laboratory name
        long onTime = world.laboratory();
        long late = world.laboratory();
        long missing = world.laboratory();
        long open = world.round(RoundState.OPEN_FOR_RESULTS, World.simplePlan("0.10"),
                Round.LatePolicy.ACCEPT_FLAGGED_SCORED, onTime, late, missing);
        world.reportResult(open, onTime, "Cr", "18.12", "0.05", "SPARK_OES", false);
        world.reportResult(open, late, "Cr", "18.30", null, "XRF", true);
        browser.get(home + "rounds/" + open + "/submissions");
        String table = Browser.waitFor(browser, By.id("submissions")).getText();
        assertThat(table).contains("Missing").contains("Submitted late").contains("Submitted");
        assertThat(browser.findElement(By.id("remind-missing")).isDisplayed()).isTrue();
        Browser.screenshot(browser, "coordinator/22-submissions");
        browser.findElement(By.linkText(world.text("SELECT name FROM laboratory WHERE id = ?", late))).click();
        assertThat(Browser.waitFor(browser, By.id("values-1")).getText()).contains("18.30");

        // the administrator chooses the laboratory of a new user from the search
        browser.manage().deleteAllCookies();
        signIn(world.user("admin", null));
        browser.get(home + "admin/users");
        String labName = world.text("SELECT name FROM laboratory WHERE id = ?", missing);
        browser.findElement(By.id("username")).sendKeys(World.unique("analyst").toLowerCase());
        browser.findElement(By.id("displayName")).sendKeys("A. Analyst");
        browser.findElement(By.id("laboratoryQuery")).sendKeys(labName);
        Browser.submit(browser, By.id("find-laboratory"));
        assertThat(Browser.waitFor(browser, By.id("laboratory-choice")).getText()).contains(labName);
        assertThat(browser.findElement(By.id("displayName")).getAttribute("value")).isEqualTo("A. Analyst");
        Browser.screenshot(browser, "coordinator/23-admin-users");
    }

    private void signIn(String username) {
        Browser.signIn(browser, home, username);
    }

    private void wait(java.util.function.Function<WebDriver, Boolean> condition) {
        new WebDriverWait(browser, Duration.ofSeconds(20))
                .ignoring(org.openqa.selenium.StaleElementReferenceException.class)
                .ignoring(org.openqa.selenium.NoSuchElementException.class)
                .until(condition::apply);
    }

    private void scrollTo(String id) {
        ((JavascriptExecutor) browser).executeScript("document.getElementById(arguments[0]).scrollIntoView()", id);
    }

    private static Path file(String stem, String suffix, String content) {
        try {
            Path file = Files.createTempFile(stem, suffix);
            Files.writeString(file, content, StandardCharsets.UTF_8);
            file.toFile().deleteOnExit();
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
