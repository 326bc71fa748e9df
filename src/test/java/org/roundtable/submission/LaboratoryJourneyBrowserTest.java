package org.roundtable.submission;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A laboratory analyst's journey in Chromium: sign in → the home shows the open round → a bad value marked in
 * place → a warning confirmed after it was shown → a partial file refused until confirmed → the receipt.
 * Screenshots under target/screenshots/laboratory/.
 */
@QuarkusTest
class LaboratoryJourneyBrowserTest {

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
    void anAnalystSeesTheOpenRoundEntersResultsConfirmsWhatWasShownAndGetsAReceipt() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, ResultConfirmationTest.crAndMn(), Round.LatePolicy.REFUSE, lab);
        String roundCode = world.text("SELECT code FROM round WHERE id = ?", round);
        String member = world.user("lab-member", lab);
        browser = Browser.start();

        // sign in: the analyst lands on the laboratory home, which shows the open round and what is due
        browser.get(base + "login");
        browser.findElement(By.id("username")).sendKeys(member);
        browser.findElement(By.id("password")).sendKeys(World.PASSWORD);
        browser.findElement(By.cssSelector("form[action='/login'] button")).click();
        Browser.waitForUrl(browser, url -> url.endsWith("/laboratory"));
        String home = Browser.waitFor(browser, By.id("home-round-" + round)).getText();
        assertThat(home).contains(roundCode).contains("Results due").contains("Europe/Berlin").contains("Not sent yet")
                .contains("Acknowledge the sample");
        Browser.screenshot(browser, "laboratory/01-home");

        // a bad value is marked beside its field, in plain words; what was typed stays
        Browser.submit(browser, By.cssSelector("#home-round-" + round + " a[href$='/results']"));
        browser.findElement(By.name("value.Cr.A")).sendKeys("18.1x");
        browser.findElement(By.name("u.Cr.A")).sendKeys("0.08");
        browser.findElement(By.name("value.Mn.A")).sendKeys("0.812");
        Browser.submit(browser, By.id("submit-results"));
        WebElement crRow = Browser.waitFor(browser, By.id("row-Cr-A"));
        assertThat(crRow.findElement(By.cssSelector(".field-problem")).getText()).contains("is not a decimal number");
        assertThat(browser.findElement(By.id("problems")).getText()).contains("One value needs correcting")
                .doesNotContain("Read as").doesNotContain("Row");
        assertThat(browser.findElement(By.name("value.Mn.A")).getAttribute("value")).isEqualTo("0.812");
        Browser.screenshot(browser, "laboratory/02-bad-value");

        // a value outside the expected range: shown first, confirmed only with the box shown with it
        browser.findElement(By.name("value.Cr.A")).clear();
        browser.findElement(By.name("value.Cr.A")).sendKeys("1.81");
        Browser.submit(browser, By.id("submit-results"));
        String warning = Browser.waitFor(browser, By.id("problems")).getText();
        assertThat(warning).contains("outside the expected range").contains("Nothing was saved");
        assertThat(browser.getPageSource()).contains("Nothing submitted yet");
        Browser.screenshot(browser, "laboratory/03-warning");
        browser.findElement(By.cssSelector("#problems input[name='confirm']")).click();
        Browser.submit(browser, By.id("confirm-submit"));
        assertThat(Browser.waitFor(browser, By.id("receipt")).getText()).contains("revision 1");
        assertThat(browser.findElement(By.id("current-results")).getText()).contains("1.81").contains("0.812");

        // the form now shows revision 1's values; sending them again is "no change", not a new revision
        assertThat(browser.findElement(By.name("value.Cr.A")).getAttribute("value")).isEqualTo("1.81");
        Browser.submit(browser, By.id("submit-results"));
        assertThat(Browser.waitFor(browser, By.id("receipt")).getText()).contains("No change").contains("revision 1");

        // a file with Cr only: refused until the analyst says yes to leaving Mn out
        Path csv = Files.createTempFile("partial", ".csv");
        Files.writeString(csv, "measurand,value,unit,expanded_uncertainty,method,replicates\nCr,18.12,%,0.08,spark-oes,2\n",
                StandardCharsets.UTF_8);
        browser.findElement(By.id("file")).sendKeys(csv.toString());
        Browser.submit(browser, By.cssSelector("#upload-form button"));
        assertThat(Browser.waitFor(browser, By.id("dropped")).getText())
                .isEqualTo("This replaces your 2 results; Mn would no longer be reported.");
        assertThat(browser.findElement(By.id("current-results")).getText()).as("revision 1 is still the one in force")
                .contains("1.81");
        Browser.screenshot(browser, "laboratory/04-partial-file");
        for (WebElement box : browser.findElements(By.cssSelector("#confirm-upload input[type='checkbox']"))) {
            box.click();
        }
        browser.findElement(By.id("confirm-file")).sendKeys(csv.toString());
        Browser.submit(browser, By.cssSelector("#confirm-upload button"));
        String receipt = Browser.waitFor(browser, By.id("receipt")).getText();
        assertThat(receipt).contains("revision 2").contains("SHA-256").contains("CSV");
        assertThat(browser.findElement(By.id("current-results")).getText()).contains("18.12").doesNotContain("0.812");
        Browser.screenshot(browser, "laboratory/05-receipt");
    }
}
