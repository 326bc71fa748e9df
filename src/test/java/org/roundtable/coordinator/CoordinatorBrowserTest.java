package org.roundtable.coordinator;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Browser;
import org.roundtable.testing.World;

import java.net.URL;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A coordinator in Chromium: starts on the home page of what needs them, builds a round's evaluation plan in the
 * form (a mistake is shown beside its field with everything typed kept), saves it, and copies it into another round
 * of the same scheme. Screenshots under target/screenshots/coordinator/.
 */
@QuarkusTest
class CoordinatorBrowserTest {

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

    private void signIn(String username) {
        Browser.signIn(browser, home, username);
    }

    private void show(WebElement element) {
        ((JavascriptExecutor) browser).executeScript("arguments[0].scrollIntoView({block: 'center'});", element);
    }

    private void type(String id, String text) {
        WebElement field = browser.findElement(By.id(id));
        show(field);
        field.clear();
        field.sendKeys(text);
    }

    private void choose(String element, String field, String value) {
        WebElement radio = browser.findElement(By.cssSelector("input[name='" + element + "." + field + "'][value='" + value + "']"));
        show(radio);
        radio.click();
    }

    @Test
    void aCoordinatorBuildsAPlanInTheFormSeesTheMistakeBesideItsFieldAndCopiesThePlanIntoAnotherRound() {
        long lab = world.laboratory();
        long closed = world.round(RoundState.CLOSED, lab);
        // for the home page: a round whose deadline is near with a result missing, and one evaluated and not reported
        long second = world.laboratory();
        long soon = world.round(RoundState.OPEN_FOR_RESULTS, lab, second);
        world.sql("UPDATE round SET result_deadline = now() + interval '3 days' WHERE id = ?", soon);
        world.insert("INSERT INTO submission (round_id, laboratory_id, current_revision, created_at, updated_at) "
                + "VALUES (?, ?, 1, now(), now()) RETURNING id", soon, lab);
        long evaluated = world.round(RoundState.CLOSED, lab);
        world.insert("INSERT INTO evaluation_run (round_id, version, preview, round_state, plan_version, plan_sha256, "
                + "inputs_sha256, outputs_sha256, code_version, created_by, created_at) VALUES (?, 1, false, 'CLOSED', 1, "
                + "repeat('a', 64), repeat('b', 64), repeat('c', 64), 'test', 'world', now()) RETURNING id", evaluated);
        // a draft round of a scheme with Cr and Mn, without a plan yet, and a second draft round of the same scheme
        long round = world.round(RoundState.DRAFT, World.simplePlan("0.10"), Round.LatePolicy.REFUSE);
        world.sql("UPDATE round SET draft_plan = NULL WHERE id = ?", round);
        String otherCode = World.unique("RC").toUpperCase();
        long other = world.insert("INSERT INTO round (scheme_id, code, item_description, items_per_laboratory, item_labels, "
                + "dispatch_date, result_deadline, deadline_time_zone, instructions, late_policy, state, state_changed_at, "
                + "created_at) SELECT scheme_id, ?, item_description, items_per_laboratory, item_labels, dispatch_date, "
                + "result_deadline, deadline_time_zone, instructions, late_policy, 'DRAFT', now(), now() FROM round "
                + "WHERE id = ? RETURNING id", otherCode, round);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);

        browser = Browser.start();
        signIn(world.user("coordinator", null));
        assertThat(browser.getCurrentUrl()).endsWith("/coordinator");
        assertThat(browser.findElement(By.tagName("h1")).getText()).isEqualTo("What needs you now");
        assertThat(browser.findElement(By.id("needs-me")).getText()).contains("Deadline near, results missing")
                .contains("Closed, not evaluated").contains("Evaluation ready for review").contains("Draft, no plan yet");
        Browser.screenshot(browser, "coordinator/01-home");

        // the round page says where the next step is, whatever page it lives on
        browser.get(home + "rounds/" + closed);
        assertThat(browser.findElement(By.id("next-step-title")).getText()).isEqualTo("Next step: Closed, not evaluated");
        assertThat(browser.findElement(By.id("next-step-link")).getAttribute("href")).endsWith("/rounds/" + closed + "/evaluation");
        assertThat(browser.getPageSource()).doesNotContain("reminder-form");

        browser.get(home + "rounds/" + round);
        browser.findElement(By.id("plan-link")).click();
        Browser.waitFor(browser, By.id("plan-form"));
        assertThat(browser.getTitle()).contains("Evaluation plan " + code);
        Browser.screenshot(browser, "coordinator/02-plan-form");

        // Cr: a certified reference value, σpt as a percentage — the percentage forgotten; Mn left out
        choose("Cr", "assignedValueMethod", "CERTIFIED_REFERENCE");
        type("Cr-referenceValue", "18.20");
        type("Cr-referenceExpandedUncertainty", "0.05");
        choose("Cr", "sigmaPtMethod", "PERCENT_OF_ASSIGNED");
        assertThat(browser.findElement(By.id("Cr-sigmaPt")).isDisplayed()).as("fixed σpt hidden").isFalse();
        type("Cr-scoreDecimals", "1");
        type("Cr-exclusionRules", "Results reported as below the limit of detection.");
        WebElement mn = browser.findElement(By.id("Mn-include"));
        show(mn);
        mn.click();
        Browser.submit(browser, By.id("save-plan"));

        assertThat(browser.findElement(By.id("plan-error")).getText()).contains("Cr").contains("σpt in % of the assigned value");
        WebElement percent = browser.findElement(By.id("Cr-sigmaPtPercent"));
        assertThat(percent.getAttribute("aria-invalid")).isEqualTo("true");
        assertThat(browser.findElement(By.id("Cr-sigmaPtPercent-problem")).getText())
                .isEqualTo("The σpt in % of the assigned value is required, as a positive decimal number.");
        assertThat(browser.findElement(By.id("Cr-referenceValue")).getAttribute("value")).isEqualTo("18.20");
        assertThat(browser.findElement(By.id("Cr-referenceExpandedUncertainty")).getAttribute("value")).isEqualTo("0.05");
        assertThat(browser.findElement(By.id("Cr-scoreDecimals")).getAttribute("value")).isEqualTo("1");
        assertThat(browser.findElement(By.id("Cr-exclusionRules")).getAttribute("value"))
                .isEqualTo("Results reported as below the limit of detection.");
        assertThat(browser.findElement(By.cssSelector("input[name='Cr.assignedValueMethod'][value='CERTIFIED_REFERENCE']"))
                .isSelected()).isTrue();
        assertThat(browser.findElement(By.id("Mn-include")).isSelected()).isFalse();
        show(percent);
        Browser.screenshot(browser, "coordinator/03-plan-error");

        type("Cr-sigmaPtPercent", "1.5");
        Browser.submit(browser, By.id("save-plan"));
        assertThat(browser.findElement(By.id("plan-message")).getText()).isEqualTo("Draft plan saved.");
        assertThat(browser.findElement(By.id("next-step-title")).getText()).isEqualTo("Next step: Draft, plan written");
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", round))
                .contains("\"sigmaPtPercent\":\"1.5\"").contains("\"referenceValue\":\"18.20\"").doesNotContain("\"Mn\"");
        Browser.screenshot(browser, "coordinator/04-plan-saved");

        // the other round of the scheme starts from this plan
        browser.get(home + "rounds/" + other + "/plan");
        new Select(browser.findElement(By.id("from"))).selectByVisibleText(code + " — draft plan");
        Browser.submit(browser, By.cssSelector("#copy-plan button[type=submit]"));
        assertThat(browser.findElement(By.id("plan-message")).getText()).contains("The plan of round " + code + " is copied");
        assertThat(browser.findElement(By.id("Cr-referenceValue")).getAttribute("value")).isEqualTo("18.20");
        assertThat(browser.findElement(By.id("Cr-sigmaPtPercent")).getAttribute("value")).isEqualTo("1.5");
        assertThat(browser.findElement(By.id("Mn-include")).isSelected()).isFalse();
        assertThat(world.text("SELECT coalesce(draft_plan, 'none') FROM round WHERE id = ?", other)).isEqualTo("none");
        Browser.screenshot(browser, "coordinator/05-plan-copied");
        // the plan's early warnings: a number out of range is refused beside its field, what was typed kept
        WebElement questionable = browser.findElement(By.id("warnings-questionableInARow"));
        questionable.clear();
        questionable.sendKeys("1");
        browser.findElement(By.id("warnings-bias")).click(); // switched off
        Browser.submit(browser, By.id("save-plan"));
        assertThat(browser.findElement(By.id("warnings-questionableInARow-problem")).getText())
                .isEqualTo("The number of questionable results in a row is a whole number from 2 to 20.");
        assertThat(browser.findElement(By.id("warnings-questionableInARow")).getAttribute("value")).isEqualTo("1");
        assertThat(browser.findElement(By.id("warnings-bias")).isSelected()).isFalse();
        assertThat(browser.findElement(By.id("Cr-referenceValue")).getAttribute("value")).isEqualTo("18.20");
        Browser.screenshot(browser, "coordinator/05b-plan-warning-refused");
        questionable = browser.findElement(By.id("warnings-questionableInARow"));
        questionable.clear();
        questionable.sendKeys("3");
        Browser.submit(browser, By.id("save-plan"));
        assertThat(browser.findElement(By.id("plan-message")).getText()).isEqualTo("Draft plan saved.");
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", other)).contains("\"sigmaPtPercent\":\"1.5\"")
                .contains("\"bias\":\"false\"").contains("\"questionableInARow\":\"3\"");

        // a finished round shows no form that would be refused
        long finished = world.round(RoundState.FINAL_ISSUED, lab);
        browser.get(home + "rounds/" + finished);
        assertThat(browser.findElement(By.id("next-step-title")).getText()).isEqualTo("Next step: Final report issued");
        assertThat(browser.findElements(By.cssSelector("main form"))).isEmpty();
        Browser.screenshot(browser, "coordinator/06-finished-round");

        browser.get(home + "coordinator");
        Browser.screenshot(browser, "coordinator/07-home-after");
    }
}
