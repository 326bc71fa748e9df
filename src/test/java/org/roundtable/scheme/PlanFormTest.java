package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The evaluation plan as a form and the new-round form: a refused save answers 400 with the problem beside its
 * field and everything typed kept; the form and the JSON go through the same checks; copying a plan takes only
 * rounds of the same scheme; a frozen plan changes only as a new version with a reason; a finished round shows the
 * plan without a form.
 */
@QuarkusTest
class PlanFormTest {

    @Inject
    World world;

    @Test
    void eachExpertListOffersTheChosenExpertsAndAFewLaboratoriesNeverEveryLaboratory() {
        long first = world.laboratory();
        long second = world.laboratory();
        for (int i = 0; i < PlanPages.EXPERT_CHOICES + 5; i++) {
            world.laboratory();
        }
        long round = world.round(RoundState.DRAFT, World.simplePlan("0.10"), Round.LatePolicy.REFUSE);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        Response saved = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "EXPERT_CONSENSUS")
                .formParam("Cr.expertLaboratories", Long.toString(first))
                .formParam("Cr.expertLaboratories", Long.toString(second))
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.12")
                .formParam("Cr.scores", "Z_OR_Z_PRIME")
                .post("/rounds/" + round + "/plan/form");
        assertThat(saved.statusCode()).as(saved.asString()).isEqualTo(200);

        String page = coordinator.request().get("/rounds/" + round + "/plan").then().statusCode(200).extract().asString();
        String crExperts = page.substring(page.indexOf("id=\"Cr-expertLaboratories\""));
        crExperts = crExperts.substring(0, crExperts.indexOf("</select>"));
        assertThat(crExperts.split("<option ", -1).length - 1).as("chosen experts and the laboratories added last")
                .isEqualTo(PlanPages.EXPERT_CHOICES + 2);
        assertThat(crExperts).contains("value=\"" + first + "\" selected").contains("value=\"" + second + "\" selected");

        String name = world.text("SELECT name FROM laboratory WHERE id = ?", second);
        String found = coordinator.request().queryParam("experts", name).get("/rounds/" + round + "/plan").then()
                .statusCode(200).extract().asString();
        String foundExperts = found.substring(found.indexOf("id=\"Mn-expertLaboratories\""));
        foundExperts = foundExperts.substring(0, foundExperts.indexOf("</select>"));
        assertThat(foundExperts.split("<option ", -1).length - 1).as("the two chosen, one of them found").isEqualTo(2);
        assertThat(found).contains("1 found.");
    }

    @Test
    void aRefusedPlanFormShowsTheProblemBesideItsFieldAndKeepsWhatWasTyped() {
        long round = world.round(RoundState.DRAFT, World.simplePlan("0.10"), Round.LatePolicy.REFUSE);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        Response refused = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "REFERENCE_LABORATORY")
                .formParam("Cr.referenceValue", "18.31").formParam("Cr.referenceExpandedUncertainty", "")
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.12")
                .formParam("Cr.scores", "Z_OR_Z_PRIME").formParam("Cr.scores", "EN")
                .formParam("Mn.assignedValueMethod", "CONSENSUS_ALL").formParam("Mn.sigmaPtMethod", "FIXED")
                .post("/rounds/" + round + "/plan/form");
        assertThat(refused.statusCode()).isEqualTo(400);
        String page = refused.asString();
        assertThat(page).contains("id=\"Cr-referenceExpandedUncertainty-problem\"")
                .contains("The expanded uncertainty U of the reference value is required, as a positive decimal number.")
                .contains("value=\"18.31\"").contains("value=\"0.12\"")
                .contains("name=\"Cr.scores\" value=\"EN\" checked");
        // Mn was not ticked and stays unticked
        assertThat(page).contains("name=\"Mn.include\" id=\"Mn-include\" value=\"yes\">");
        // the draft saved before is untouched
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", round)).contains("\"sigmaPt\":\"0.10\"");

        Response saved = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "REFERENCE_LABORATORY")
                .formParam("Cr.referenceValue", "18.31").formParam("Cr.referenceExpandedUncertainty", "0.04")
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.12")
                .formParam("Cr.scores", "Z_OR_Z_PRIME").formParam("Cr.scores", "EN")
                .formParam("Cr.scoreDecimals", "1").formParam("Cr.boundaryRule", "SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3")
                .post("/rounds/" + round + "/plan/form");
        assertThat(saved.statusCode()).as(saved.asString()).isEqualTo(200);
        assertThat(saved.asString()).contains("Draft plan saved.");
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", round))
                .contains("\"referenceExpandedUncertainty\":\"0.04\"").contains("\"scores\":[\"Z_OR_Z_PRIME\",\"EN\"]")
                .contains("\"scoreDecimals\":\"1\"").contains("SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3")
                .doesNotContain("\"Mn\"");

        // the JSON path, for advanced users: a mistake keeps the JSON as typed
        String typed = "{\"measurands\":[{\"element\":\"Cr\",\"assignedValueMethod\":\"CONSENSUS_ALL\"";
        Response badJson = coordinator.form().accept("text/html").formParam("plan", typed).post("/rounds/" + round + "/plan");
        assertThat(badJson.statusCode()).isEqualTo(400);
        assertThat(badJson.asString()).contains("The plan is not valid JSON").contains("id=\"plan-json-error\"")
                .contains(typed.replace("\"", "&quot;"));
    }

    @Test
    void theEarlyWarningsOfThePlanAreSwitchedAndNumberedInTheFormWithTheirProblemBesideTheField() {
        long round = world.round(RoundState.DRAFT, World.simplePlan("0.10"), Round.LatePolicy.REFUSE);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String page = coordinator.form().accept("text/html").get("/rounds/" + round + "/plan").asString();
        // the usual warnings: all on, 2, 6, 3 rounds, last |z| 2
        assertThat(page).contains("name=\"earlyWarnings.questionable\" id=\"warnings-questionable\" value=\"true\" checked")
                .contains("name=\"earlyWarnings.sameSignRun\" type=\"text\" value=\"6\"")
                .contains("Questionable results in a row that warn (usually 2)");

        Response refused = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "CONSENSUS_ALL")
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.10")
                .formParam("earlyWarnings.shown", "yes").formParam("earlyWarnings.unsatisfactory", "true")
                .formParam("earlyWarnings.questionableInARow", "1").formParam("earlyWarnings.sameSignRun", "4")
                .formParam("earlyWarnings.drift", "true").formParam("earlyWarnings.driftRounds", "4")
                .formParam("earlyWarnings.driftLimit", "2.5")
                .post("/rounds/" + round + "/plan/form");
        assertThat(refused.statusCode()).isEqualTo(400);
        assertThat(refused.asString()).contains("id=\"warnings-questionableInARow-problem\"")
                .contains("The number of questionable results in a row is a whole number from 2 to 20.")
                .contains("value=\"1\"").contains("value=\"4\"").contains("value=\"2.5\"")
                // unticked boxes stay unticked
                .contains("name=\"earlyWarnings.bias\" id=\"warnings-bias\" value=\"true\">");

        Response saved = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "CONSENSUS_ALL")
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.10")
                .formParam("earlyWarnings.shown", "yes").formParam("earlyWarnings.unsatisfactory", "true")
                .formParam("earlyWarnings.questionableInARow", "3").formParam("earlyWarnings.sameSignRun", "4")
                .formParam("earlyWarnings.drift", "true").formParam("earlyWarnings.driftRounds", "4")
                .formParam("earlyWarnings.driftLimit", "2.5")
                .post("/rounds/" + round + "/plan/form");
        assertThat(saved.statusCode()).as(saved.asString()).isEqualTo(200);
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", round)).contains("\"earlyWarnings\":{"
                + "\"bias\":\"false\",\"drift\":\"true\",\"driftLimit\":\"2.5\",\"driftRounds\":\"4\","
                + "\"questionable\":\"false\",\"questionableInARow\":\"3\",\"sameSignRun\":\"4\","
                + "\"unsatisfactory\":\"true\"}");
        // the saved plan fills the form again
        assertThat(saved.asString()).contains("name=\"earlyWarnings.driftLimit\" type=\"text\" value=\"2.5\"")
                .contains("name=\"earlyWarnings.drift\" id=\"warnings-drift\" value=\"true\" checked");
    }

    @Test
    void acceptingNegativeResultsIsATickPerMeasurandSavedOnlyWhenTickedAndShownTickedAgain() {
        long round = world.round(RoundState.DRAFT, World.simplePlan("0.10"), Round.LatePolicy.REFUSE);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String form = coordinator.request().accept("text/html").get("/rounds/" + round + "/plan").asString();
        assertThat(form).contains("Accept negative results for Cr").contains("name=\"Cr.negativeAllowed\"")
                .doesNotContain("name=\"Cr.negativeAllowed\" id=\"Cr-negativeAllowed\" value=\"yes\" checked");

        Response saved = coordinator.form().accept("text/html")
                .formParam("Cr.include", "yes").formParam("Cr.assignedValueMethod", "CONSENSUS_ALL")
                .formParam("Cr.sigmaPtMethod", "FIXED").formParam("Cr.sigmaPt", "0.12")
                .formParam("Cr.negativeAllowed", "yes")
                .formParam("Mn.include", "yes").formParam("Mn.assignedValueMethod", "CONSENSUS_ALL")
                .formParam("Mn.sigmaPtMethod", "FIXED").formParam("Mn.sigmaPt", "0.01")
                .post("/rounds/" + round + "/plan/form");
        assertThat(saved.statusCode()).as(saved.asString()).isEqualTo(200);
        String draft = world.text("SELECT draft_plan FROM round WHERE id = ?", round);
        // ticked for Cr only: written for Cr, absent (refused, the default) for Mn
        assertThat(draft).containsOnlyOnce("\"negativeAllowed\":\"true\"");
        assertThat(draft.substring(0, draft.indexOf("\"element\":\"Mn\""))).contains("\"negativeAllowed\":\"true\"");
        String again = coordinator.request().accept("text/html").get("/rounds/" + round + "/plan").asString();
        assertThat(again).contains("name=\"Cr.negativeAllowed\" id=\"Cr-negativeAllowed\" value=\"yes\" checked")
                .doesNotContain("name=\"Mn.negativeAllowed\" id=\"Mn-negativeAllowed\" value=\"yes\" checked");
    }

    @Test
    void aPlanIsCopiedOnlyFromARoundOfTheSameSchemeAndAFrozenPlanChangesOnlyWithAReason() {
        long source = world.round(RoundState.PLAN_FROZEN, World.simplePlan("0.25"), Round.LatePolicy.REFUSE);
        long sibling = world.insert("INSERT INTO round (scheme_id, code, item_description, items_per_laboratory, item_labels, "
                + "dispatch_date, result_deadline, deadline_time_zone, instructions, late_policy, state, state_changed_at, "
                + "created_at) SELECT scheme_id, ?, item_description, items_per_laboratory, item_labels, dispatch_date, "
                + "result_deadline, deadline_time_zone, instructions, late_policy, 'DRAFT', now(), now() FROM round "
                + "WHERE id = ? RETURNING id", World.unique("SIB").toUpperCase(), source);
        long stranger = world.round(RoundState.PLAN_FROZEN, World.simplePlan("0.40"), Round.LatePolicy.REFUSE);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        String form = coordinator.request().accept("text/html").get("/rounds/" + sibling + "/plan").asString();
        assertThat(form).contains("Start from an earlier round");
        // the choices of "Copy the plan of" (other selects on the page list laboratories by id)
        String sources = form.substring(form.indexOf("<select id=\"from\""), form.indexOf("</select>", form.indexOf("<select id=\"from\"")));
        assertThat(sources).contains("<option value=\"" + source + "\"").doesNotContain("<option value=\"" + stranger + "\"");
        Response copied = coordinator.request().accept("text/html").queryParam("from", source).get("/rounds/" + sibling + "/plan");
        assertThat(copied.statusCode()).isEqualTo(200);
        assertThat(copied.asString()).contains("is copied into the form below").contains("value=\"0.25\"");
        assertThat(coordinator.request().accept("text/html").queryParam("from", stranger).get("/rounds/" + sibling + "/plan")
                .statusCode()).isEqualTo(404);

        Response noReason = coordinator.form().accept("text/html").formParam("Cr.include", "yes")
                .formParam("Cr.assignedValueMethod", "CONSENSUS_ALL").formParam("Cr.sigmaPtMethod", "FIXED")
                .formParam("Cr.sigmaPt", "0.30").formParam("Cr.minimumParticipants", "2")
                .post("/rounds/" + source + "/plan/form");
        assertThat(noReason.statusCode()).isEqualTo(400);
        assertThat(noReason.asString()).contains("needs a reason").contains("value=\"0.30\"");
        Response version = coordinator.form().accept("text/html").formParam("Cr.include", "yes")
                .formParam("Cr.assignedValueMethod", "CONSENSUS_ALL").formParam("Cr.sigmaPtMethod", "FIXED")
                .formParam("Cr.sigmaPt", "0.30").formParam("Cr.minimumParticipants", "2")
                .formParam("reason", "σpt from the scheme's fitness-for-purpose review")
                .post("/rounds/" + source + "/plan/form");
        assertThat(version.statusCode()).as(version.asString()).isEqualTo(200);
        assertThat(version.asString()).contains("Plan version 2 stored.");

        long finished = world.round(RoundState.FINAL_ISSUED);
        String readOnly = coordinator.request().accept("text/html").get("/rounds/" + finished + "/plan").asString();
        assertThat(readOnly).contains("The plan can no longer change in this state.")
                .doesNotContain("action=\"/rounds/" + finished + "/plan/form\"")
                .doesNotContain("action=\"/rounds/" + finished + "/plan\"");
    }

    @Test
    void aRefusedNewRoundFormKeepsWhatWasTypedAndShowsTheProblemBesideTheField() {
        long scheme = world.scheme();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        Response refused = coordinator.form().accept("text/html").formParam("schemeId", Long.toString(scheme))
                .formParam("code", "X").formParam("itemDescription", "Low-alloy steel chips, 50 g")
                .formParam("itemsPerLaboratory", "2").formParam("itemLabels", "A,B")
                .formParam("dispatchDate", "2027-05-03").formParam("resultDeadline", "2027-05-31T12:00")
                .formParam("timeZone", "Europe/Warsaw").formParam("instructions", "Dissolve 0.5 g in aqua regia.")
                .formParam("latePolicy", "ACCEPT_FLAGGED_UNSCORED").formParam("codeScope", "SCHEME").post("/rounds");
        assertThat(refused.statusCode()).isEqualTo(400);
        String page = refused.asString();
        assertThat(page).contains("id=\"code-problem\"").contains("The round code has 2 to 40 letters")
                .contains("value=\"X\"").contains("value=\"Low-alloy steel chips, 50 g\"").contains("value=\"A,B\"")
                .contains("value=\"2027-05-03\"").contains("value=\"2027-05-31T12:00\"")
                .contains("Dissolve 0.5 g in aqua regia.</textarea>")
                .contains("<option value=\"Europe/Warsaw\" selected>")
                .contains("<option value=\"ACCEPT_FLAGGED_UNSCORED\" selected>")
                .contains("<option value=\"SCHEME\" selected>")
                .contains("<option value=\"2\" selected>")
                .contains("<option value=\"" + scheme + "\" selected>");
    }
}
