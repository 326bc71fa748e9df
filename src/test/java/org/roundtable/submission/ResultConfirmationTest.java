package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.contains;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.hasItem;

/**
 * Result entry that cannot be fooled: warnings and measurands left out are agreed to only after they were shown
 * (a token bound to them and to the values), the API refuses to drop measurands silently, and identical values
 * make no new revision.
 */
@QuarkusTest
class ResultConfirmationTest {

    private static final Pattern TOKEN = Pattern.compile("name=\"confirmationToken\" value=\"([^\"]+)\"");

    @Inject
    World world;

    private long lab;
    private long round;
    private String token;
    private String member;

    /** A round of Cr (%, 2 decimals, 17–20) and Mn (%, 3 decimals, 0.5–1.0), laboratory enrolled, open for results. */
    static EvaluationPlan crAndMn() {
        EvaluationPlan one = World.simplePlan("0.10");
        EvaluationPlan.MeasurandPlan cr = one.measurands().get(0);
        EvaluationPlan.MeasurandPlan mn = new EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null, null, null,
                null, "FIXED", "0.010", null, null, null, null, null, null, "2", null, null, null, null, null);
        return new EvaluationPlan(List.of(cr, mn));
    }

    @BeforeEach
    void aLaboratoryInARoundOfCrAndMnOpenForResults() {
        lab = world.laboratory();
        round = world.round(RoundState.OPEN_FOR_RESULTS, crAndMn(), Round.LatePolicy.REFUSE, lab);
        token = world.apiToken(lab);
        member = world.user("lab-member", lab);
    }

    private static String result(String element, String value) {
        return "{\"measurand\":\"" + element + "\",\"value\":\"" + value + "\",\"unit\":\"%\",\"expandedUncertainty\":\"0.08\","
                + "\"method\":\"spark-oes\",\"replicates\":2}";
    }

    private static String both() {
        return "{\"results\":[" + result("Cr", "18.12") + "," + result("Mn", "0.812") + "]}";
    }

    private static String crOnly() {
        return "{\"results\":[" + result("Cr", "18.12") + "]}";
    }

    private Response submit(String json, String query) {
        return given().header("Authorization", "Bearer " + token).contentType("application/json").body(json)
                .post("/api/v1/my-rounds/" + round + "/submission" + query);
    }

    private long revisions() {
        return world.insert("SELECT count(*) FROM submission_revision v JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?", round);
    }

    private static String tokenOf(String html) {
        Matcher m = TOKEN.matcher(html);
        assertThat(m.find()).as("the page carries a confirmation token").isTrue();
        return m.group(1);
    }

    // ---- API --------------------------------------------------------------------------------------------------

    @Test
    void throughTheApiASubmitLeavingOutAMeasurandTheCurrentRevisionReportsIsRefusedWith409ListingItUnlessReplaceAll() {
        submit(both(), "").then().statusCode(201).body("revision", equalTo(1));
        // Mn left out: first the warning that it is not reported (422), then, confirmed, the refusal to drop it (409)
        submit(crOnly(), "").then().statusCode(422).body("errors.key", hasItem("warning.measurand.not-reported"));
        submit(crOnly(), "?confirmWarnings=true").then().statusCode(409)
                .body("errors.key", contains(SubmissionService.NOT_REPORTED_KEY))
                .body("errors.value", contains("Mn"))
                .body("detail", containsString("This replaces your 2 results; Mn would no longer be reported"));
        assertThat(revisions()).isEqualTo(1);
        submit(crOnly(), "?confirmWarnings=true&replaceAll=true").then().statusCode(201).body("revision", equalTo(2));
    }

    @Test
    void throughTheApiIdenticalValuesAnswer200WithTheCurrentReceiptMarkedUnchangedAndStoreNothing() {
        String first = submit(both(), "").then().statusCode(201).body("unchanged", equalTo(false))
                .extract().path("receiptId");
        submit(both(), "").then().statusCode(200).body("unchanged", equalTo(true)).body("revision", equalTo(1))
                .body("receiptId", equalTo(first));
        assertThat(revisions()).isEqualTo(1);
        // the same values as a file are no change either
        given().header("Authorization", "Bearer " + token).contentType("text/csv")
                .body("measurand,value,unit,expanded_uncertainty,method,replicates\nCr,18.12,%,0.08,spark-oes,2\nMn,0.812,%,0.08,spark-oes,2\n")
                .post("/api/v1/my-rounds/" + round + "/submission/file").then().statusCode(200).body("unchanged", equalTo(true));
        assertThat(revisions()).isEqualTo(1);
    }

    @Test
    void aRetryWithTheSameIdempotencyKeyStillGetsItsFirstAnswer() {
        String key = "lims-" + World.unique("again");
        String first = given().header("Authorization", "Bearer " + token).header("Idempotency-Key", key)
                .contentType("application/json").body(both()).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(201).extract().path("receiptId");
        given().header("Authorization", "Bearer " + token).header("Idempotency-Key", key)
                .contentType("application/json").body(both()).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(201).body("receiptId", equalTo(first)).body("unchanged", equalTo(false));
        assertThat(revisions()).isEqualTo(1);
    }

    // ---- pages --------------------------------------------------------------------------------------------

    @Test
    void onTheFormABoxTickedInAdvanceConfirmsNothingAndOnlyTheTokenOfTheWarningsShownDoes() {
        World.Browser browser = world.signIn(member);
        String path = "/my-rounds/" + round + "/results/form";
        // 1.81 % Cr is outside the expected 17–20 %: a warning; the box is ticked before any warning was shown
        String refused = browser.form().formParam("value.Cr.A", "1.81").formParam("value.Mn.A", "0.812")
                .formParam("confirmWarnings", "on").formParam("confirm", "0").post(path)
                .then().statusCode(422).extract().asString();
        assertThat(refused).contains("outside the expected range").contains("Nothing was saved");
        assertThat(revisions()).isZero();

        // a token shown for 1.81 does not confirm 1.82
        String shownToken = tokenOf(refused);
        browser.form().formParam("value.Cr.A", "1.82").formParam("value.Mn.A", "0.812")
                .formParam("confirmationToken", shownToken).formParam("confirm", "0").post(path).then().statusCode(422);
        // nor does the token without its box ticked
        browser.form().formParam("value.Cr.A", "1.81").formParam("value.Mn.A", "0.812")
                .formParam("confirmationToken", shownToken).post(path).then().statusCode(422);
        assertThat(revisions()).isZero();

        // the token of the warning shown, with its box ticked, confirms it
        String accepted = browser.form().formParam("value.Cr.A", "1.81").formParam("value.Mn.A", "0.812")
                .formParam("confirmationToken", shownToken).formParam("confirm", "0").post(path)
                .then().statusCode(200).extract().asString();
        assertThat(accepted).contains("Received: revision 1");
        assertThat(revisions()).isEqualTo(1);
    }

    @Test
    void onTheFormABadValueIsMarkedBesideItsFieldInPlainWords() {
        World.Browser browser = world.signIn(member);
        String page = browser.form().formParam("value.Cr.A", "18,1x").formParam("value.Mn.A", "0.812")
                .post("/my-rounds/" + round + "/results/form").then().statusCode(422).extract().asString();
        assertThat(page).contains("field-problem").contains("is not a decimal number").contains("One value needs correcting")
                .contains("value=\"18,1x\"");
        assertThat(page).as("no channel, row numbers or error keys on the page")
                .doesNotContain("Read as").doesNotContain("value.not-a-number").doesNotContain("<th class=\"num\">Row</th>");
        assertThat(revisions()).isZero();
    }

    @Test
    void onTheFormLeavingOutAMeasurandNeedsAnExplicitYesShownWithTheList() {
        World.Browser browser = world.signIn(member);
        String path = "/my-rounds/" + round + "/results/form";
        browser.form().formParam("value.Cr.A", "18.12").formParam("value.Mn.A", "0.812").post(path).then().statusCode(200);
        String asked = browser.form().formParam("value.Cr.A", "18.15").post(path).then().statusCode(422).extract().asString();
        assertThat(asked).contains("This replaces your 2 results; Mn would no longer be reported.");
        String shownToken = tokenOf(asked);
        // the warning ("Mn is not reported") confirmed, but not the replacement: still refused, now 409
        browser.form().formParam("value.Cr.A", "18.15").formParam("confirmationToken", shownToken)
                .formParam("confirm", "0").post(path).then().statusCode(409);
        assertThat(revisions()).isEqualTo(1);
        browser.form().formParam("value.Cr.A", "18.15").formParam("confirmationToken", shownToken)
                .formParam("confirm", "0").formParam("replaceAll", "yes").post(path).then().statusCode(200)
                .body(containsString("Received: revision 2"));
    }

    @Test
    void onTheFormSendingTheSameValuesAgainSaysNoChange() {
        World.Browser browser = world.signIn(member);
        String path = "/my-rounds/" + round + "/results/form";
        browser.form().formParam("value.Cr.A", "18.12").formParam("value.Mn.A", "0.812").post(path).then().statusCode(200);
        browser.form().formParam("value.Cr.A", "18.12").formParam("value.Mn.A", "0.812").post(path).then().statusCode(200)
                .body(containsString("No change"));
        assertThat(revisions()).isEqualTo(1);
    }

    @Test
    void whatWasSubmittedFollowsTheSchemesOrderWithMethodNamesAsTheSchemeShowsThem() {
        // sent Mn first: the page lists Cr (24) before Mn (25), as the scheme's catalogue does
        submit("{\"results\":[" + result("Mn", "0.812") + "," + result("Cr", "18.12") + "]}", "").then().statusCode(201);
        String page = world.signIn(member).request().get("/my-rounds/" + round + "/results").then().statusCode(200)
                .extract().asString();
        String table = page.substring(page.indexOf("id=\"current-results\""));
        assertThat(table.indexOf("<td>Cr</td>")).isPositive().isLessThan(table.indexOf("<td>Mn</td>"));
        assertThat(table).contains("Spark OES").doesNotContain("spark-oes");
    }

    @Test
    void aLaboratorysHomeShowsTheOpenRoundWithItsDeadlineAndWhatIsDue() {
        World.Browser browser = world.signIn(member);
        given().cookie("rt_session", browser.sessionCookie()).redirects().follow(false).get("/home")
                .then().statusCode(303).header("Location", containsString("/laboratory"));
        String home = browser.request().get("/laboratory").then().statusCode(200).extract().asString();
        assertThat(home).contains("Results due").contains("Acknowledge the sample").contains("Europe/Berlin")
                .contains("/my-rounds/" + round + "/results");
    }
}
