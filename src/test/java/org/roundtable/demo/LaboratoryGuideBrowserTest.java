package org.roundtable.demo;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import io.quarkus.test.junit.TestProfile;
import jakarta.inject.Inject;
import java.net.URL;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.World;

/**
 * docs/guide-laboratory.md, step by step, on the demo: Kestrel's analyst signs in, sees what is due, acknowledges
 * the disc, uploads rounds-demo/files/kestrel-results.csv, corrects a value before the deadline, reads the scores
 * and the laboratory report of the last past round; Pomorze's manager records a corrective action; Kestrel's
 * manager makes an API token. The guide's images are its screenshots (docs/images/laboratory/ with
 * -Dguides.images=docs/images). Shares its demo with {@link AuditorGuideBrowserTest}, which reads only past
 * rounds.
 */
@QuarkusTest
@TestProfile(DemoProfile.class)
class LaboratoryGuideBrowserTest {

    @TestHTTPResource("/")
    URL home;

    @Inject
    World world;

    @Inject
    JobRunner jobs;

    @Test
    void aLaboratoryFollowsTheGuideFromWhatIsDueToItsScoresACorrectiveActionAndAToken() {
        long open = Long.parseLong(world.text("SELECT id FROM round WHERE state = 'OPEN_FOR_RESULTS'"));
        String openCode = world.text("SELECT code FROM round WHERE id = ?", open);
        long past = Long.parseLong(world.text("SELECT id FROM round WHERE state = 'FINAL_ISSUED' AND code LIKE 'NLS-%' "
                + "ORDER BY result_deadline DESC LIMIT 1"));
        String pastCode = world.text("SELECT code FROM round WHERE id = ?", past);
        try (GuideWalk walk = new GuideWalk(home, "laboratory", jobs)) {
            // task 1: sign in; the laboratory home lists what is due
            walk.signIn("kestrel.analyst");
            assertThat(walk.text(By.tagName("h1"))).isEqualTo("Your rounds and what is due");
            assertThat(walk.text(By.id("home-round-" + open))).contains(openCode);
            walk.image("01-home");

            // task 2: the round's page: acknowledge the disc
            walk.clickLink("Round " + openCode);
            walk.show(By.id("my-items"));
            walk.image("02-receipt");
            walk.clickForNotice(By.cssSelector("form.receipt button[type=submit]"));
            assertThat(walk.text(By.id("my-items"))).contains("Received");

            // task 3: upload the laboratory's file
            walk.click(By.id("results-link"));
            walk.upload(By.id("file"), GuideWalk.demoFile("kestrel-results.csv"));
            walk.show(By.id("upload-form"));
            walk.image("03-upload");
            walk.click(By.cssSelector("#upload-form button[type=submit]"));
            assertThat(walk.text(By.id("receipt"))).contains("Received: revision 1");
            walk.image("04-receipt");

            // task 4: correct one value before the deadline: a new revision, the first kept
            WebElement cr = walk.find(By.cssSelector("input[aria-label='Cr value']"));
            String before = cr.getAttribute("value");
            assertThat(before).isNotBlank();
            String corrected = new java.math.BigDecimal(before).add(new java.math.BigDecimal("0.010")).toPlainString();
            walk.type(By.cssSelector("input[aria-label='Cr value']"), corrected);
            walk.image("05-correct");
            walk.click(By.id("submit-results"));
            assertThat(walk.text(By.id("receipt"))).contains("Received: revision 2");
            assertThat(walk.text(By.id("current-results"))).contains(corrected);
            assertThat(walk.text(By.cssSelector("#current-results + h3 + ul"))).contains("Revision 1").contains("Revision 2");

            // task 5: the scores and the report of the last past round
            walk.clickLink("My rounds");
            walk.clickLink(pastCode);
            walk.click(By.id("scores-link"));
            assertThat(walk.text(By.tagName("h1"))).isEqualTo("Your scores in round " + pastCode);
            assertThat(walk.text(By.id("my-scores"))).contains("Mn");
            walk.image("06-scores");
            walk.click(By.id("lab-report-html"));
            walk.waitUntil(d -> d.getCurrentUrl().endsWith("/html"));
            assertThat(walk.text(By.tagName("body"))).contains(pastCode);
            walk.image("07-report");

            // task 6: a corrective action (Pomorze: Mn questionable in the first rounds)
            walk.signIn("pomorze.manager");
            walk.clickLink("Record over rounds");
            assertThat(walk.text(By.id("early-warnings"))).contains("Mn");
            walk.click(By.id("corrective-actions-link"));
            Select result = new Select(walk.find(By.id("ca-result")));
            String choice = result.getOptions().stream().map(WebElement::getText)
                    .filter(t -> t.contains(", Mn (") && t.endsWith("questionable")).findFirst().orElseThrow();
            result.selectByVisibleText(choice);
            walk.type(By.id("ca-cause"), "The spark stand's Mn line drifted between recalibrations.");
            walk.type(By.id("ca-action"), "Recalibrated; the control sample is now run every shift.");
            walk.type(By.id("ca-evidence"), "Control chart of the setting-up sample, weeks 10 to 14.");
            walk.image("08-corrective-action");
            walk.click(By.cssSelector("#new-corrective-action button[type=submit]"));
            assertThat(walk.text(By.tagName("h1"))).startsWith("Corrective action no.");

            // task 7: an API token for the LIMS (managers only)
            walk.signIn("kestrel.manager");
            walk.clickLink("My laboratory");
            walk.type(By.id("tokenName"), "LIMS upload");
            new Select(walk.find(By.id("tokenScope"))).selectByVisibleText("Submit results");
            walk.clickForNotice(By.cssSelector("form[action='/my-laboratory/tokens'] button[type=submit]"));
            assertThat(walk.text(By.id("new-token"))).isNotBlank();
            walk.top();
            walk.image("09-token");
        }
    }
}
