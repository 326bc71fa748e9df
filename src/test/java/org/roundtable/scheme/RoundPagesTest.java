package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;

/** The coordinator's and the laboratory's pages render, act through forms and keep the code table to coordinators. */
@QuarkusTest
class RoundPagesTest {

    @Inject
    World world;

    @Test
    void aCoordinatorCreatesASchemeAddsAMeasurandAndCreatesARoundThroughTheForms() {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String name = World.unique("Page scheme");
        Response scheme = coordinator.form().accept("text/html").formParam("name", name)
                .formParam("materialFamily", "CAST_IRON").post("/schemes");
        assertThat(scheme.statusCode()).isEqualTo(200);
        assertThat(scheme.asString()).contains(name).contains("Cast iron");
        long schemeId = world.insert("SELECT id FROM scheme WHERE name = ?", name);
        Response measurand = coordinator.form().accept("text/html").formParam("element", "C").formParam("unit", "%")
                .formParam("reportingDigits", "3").formParam("expectedMin", "1.9").formParam("expectedMax", "3.8")
                .formParam("methodGroups", "SPARK_OES").formParam("methodGroups", "COMBUSTION")
                .post("/schemes/" + schemeId + "/measurands");
        assertThat(measurand.statusCode()).isEqualTo(200);
        assertThat(measurand.asString()).contains("C saved.").contains("Combustion");
        Response bad = coordinator.form().accept("text/html").formParam("element", "Qq").formParam("unit", "%")
                .formParam("reportingDigits", "3").formParam("methodGroups", "OTHER").post("/schemes/" + schemeId + "/measurands");
        assertThat(bad.statusCode()).isEqualTo(400);
        assertThat(bad.asString()).contains("not an element symbol");

        String code = World.unique("CI").toUpperCase();
        Response round = coordinator.form().accept("text/html").formParam("schemeId", Long.toString(schemeId))
                .formParam("code", code).formParam("itemDescription", "Chill-cast white iron disc")
                .formParam("itemsPerLaboratory", "2").formParam("itemLabels", "A,B")
                .formParam("dispatchDate", "2027-05-03").formParam("resultDeadline", "2027-05-31T12:00")
                .formParam("timeZone", "Europe/Warsaw").formParam("instructions", "Grind a fresh surface before each burn.")
                .formParam("latePolicy", "ACCEPT_FLAGGED_SCORED").formParam("codeScope", "ROUND").post("/rounds");
        assertThat(round.statusCode()).as(round.asString()).isEqualTo(200);
        assertThat(round.asString()).contains("Round " + code).contains("Draft").contains("Freeze the evaluation plan")
                .contains("2027-05-31 12:00 Europe/Warsaw");
        long roundId = world.insert("SELECT id FROM round WHERE code = ?", code);
        Response plan = coordinator.form().accept("text/html").formParam("plan",
                "{\"measurands\":[{\"element\":\"C\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"0.03\"}]}")
                .post("/rounds/" + roundId + "/plan");
        assertThat(plan.asString()).contains("Draft plan saved.");
        // freezing cannot be undone: the first post answers the second step and freezes nothing
        Response step = coordinator.form().accept("text/html").formParam("action", "FREEZE_PLAN")
                .post("/rounds/" + roundId + "/transitions");
        assertThat(step.asString()).contains("Freeze the evaluation plan of round " + code + "?").contains("This cannot be undone.");
        Response frozen = coordinator.form().accept("text/html").formParam("action", "FREEZE_PLAN")
                .formParam("confirmed", "yes").post("/rounds/" + roundId + "/transitions");
        assertThat(frozen.asString()).contains("Plan frozen").contains("Frozen, version 1");
        Response refused = coordinator.form().accept("text/html").formParam("action", "DISPATCH_ITEMS")
                .post("/rounds/" + roundId + "/transitions");
        assertThat(refused.statusCode()).isEqualTo(409);
        assertThat(refused.asString()).contains("The round is plan frozen: Dispatch items is not possible now.");
    }

    @Test
    void aLaboratoryPageShowsItsCodeCautionsAndAcknowledgesReceiptButNotOtherLaboratories() {
        long labA = world.laboratory();
        long labB = world.laboratory();
        long round = world.round(RoundState.DISPATCHED, labA, labB);
        String codeB = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, labB);
        World.Browser memberA = world.signIn(world.user("lab-member", labA));
        String page = memberA.request().accept("text/html").get("/my-rounds/" + round).asString();
        assertThat(page).contains("Safety cautions").contains("instrument maker&#39;s manual").contains("Acknowledge receipt")
                .doesNotContain(codeB);
        Response ack = memberA.form().accept("text/html").formParam("itemLabel", "A").formParam("condition", "GOOD")
                .post("/my-rounds/" + round + "/receipts");
        assertThat(ack.statusCode()).isEqualTo(200);
        assertThat(ack.asString()).contains("Receipt of item A recorded.").contains("Received");
        assertThat(memberA.request().accept("text/html").get("/rounds/" + round).statusCode()).isEqualTo(403);

        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        Response replaced = coordinator.form().accept("text/html").formParam("reason", "Disc cracked on arrival")
                .post("/rounds/" + round + "/items/" + world.itemOf(round, labA) + "/replacement");
        assertThat(replaced.statusCode()).isEqualTo(200);
        assertThat(replaced.asString()).contains("Replacement of item A").contains("(replacement)");
    }
}
