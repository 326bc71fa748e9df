package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.Secrets;
import org.roundtable.testing.World;

import java.util.List;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The evaluation plan: canonical JSON and hash (stable under key order, whitespace and entry order; numbers
 * kept as entered), freezing, new versions with a reason in the audit trail, and the refusal of any change
 * once results are visible beyond their own laboratory.
 */
@QuarkusTest
class EvaluationPlanFreezeTest {

    @Inject
    World world;

    private World.Browser coordinator;
    private long schemeId;
    private String roundCode;
    private long roundId;

    @BeforeEach
    void aDraftRoundOfASchemeWithCrAndMn() {
        coordinator = world.signIn(world.user("coordinator", null));
        schemeId = coordinator.json().body(Map.of("name", World.unique("Plan scheme"), "materialFamily", "STAINLESS_STEEL"))
                .post("/api/v1/schemes").then().statusCode(200).extract().jsonPath().getLong("id");
        coordinator.json().body(Map.of("element", "Cr", "unit", "%", "reportingDigits", 2, "expectedMin", "17",
                "expectedMax", "20", "methodGroups", List.of("SPARK_OES", "XRF"))).post("/api/v1/schemes/" + schemeId + "/measurands")
                .then().statusCode(200);
        coordinator.json().body(Map.of("element", "Mn", "unit", "%", "reportingDigits", 3,
                "methodGroups", List.of("SPARK_OES", "ICP_OES"))).post("/api/v1/schemes/" + schemeId + "/measurands")
                .then().statusCode(200);
        roundCode = World.unique("SS").toUpperCase();
        roundId = coordinator.json().body(Map.of("schemeId", schemeId, "code", roundCode, "itemDescription",
                        "Austenitic stainless steel disc, 40 mm", "itemsPerLaboratory", 1, "dispatchDate", "2027-03-01",
                        "resultDeadline", "2027-03-29T17:00", "timeZone", "Europe/Berlin", "instructions", "Routine analysis.",
                        "latePolicy", "ACCEPT_FLAGGED_UNSCORED"))
                .post("/api/v1/rounds").then().statusCode(200).extract().jsonPath().getLong("id");
    }

    private static final String PLAN_ONE_ORDER = """
            {"measurands": [
              {"element": "Mn", "assignedValueMethod": "CERTIFIED_REFERENCE", "referenceValue": "1.520",
               "referenceExpandedUncertainty": "0.020", "sigmaPtMethod": "FIXED", "sigmaPt": "0.040",
               "scores": ["EN", "Z_OR_Z_PRIME"]},
              {"element": "Cr", "sigmaPtMethod": "ROBUST_SD_OF_ROUND", "assignedValueMethod": "CONSENSUS_ALL",
               "provisionalSigmaPt": "0.10", "exclusionRules": "Results reported as < are not used."}
            ]}""";

    private static final String PLAN_OTHER_ORDER = "{\"measurands\":[{\"provisionalSigmaPt\":\"0.10\",\"exclusionRules\":"
            + "\"Results reported as < are not used.\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"element\":\"Cr\","
            + "\"sigmaPtMethod\":\"ROBUST_SD_OF_ROUND\"},{\"scores\":[\"Z_OR_Z_PRIME\",\"EN\"],\"sigmaPt\":\"0.040\","
            + "\"sigmaPtMethod\":\"FIXED\",\"referenceExpandedUncertainty\":\"0.020\",\"referenceValue\":\"1.520\","
            + "\"assignedValueMethod\":\"CERTIFIED_REFERENCE\",\"element\":\"Mn\"}]}";

    @Test
    void theCanonicalPlanIsTheSameWhateverTheKeyOrderWhitespaceOrEntryOrderAndStatesEveryDefault() {
        String first = savePlan(PLAN_ONE_ORDER).then().statusCode(200).extract().jsonPath().getString("draftPlan");
        String second = savePlan(PLAN_OTHER_ORDER).then().statusCode(200).extract().jsonPath().getString("draftPlan");
        assertThat(second).isEqualTo(first);
        // written out by hand from the documented canonical form (sorted keys, no whitespace, defaults stated,
        // numbers as entered, measurands by atomic number: Cr 24 before Mn 25)
        String expected = "{\"earlyWarnings\":{\"bias\":\"true\",\"drift\":\"true\",\"driftLimit\":\"2\","
                + "\"driftRounds\":\"3\",\"questionable\":\"true\",\"questionableInARow\":\"2\",\"sameSignRun\":\"6\","
                + "\"unsatisfactory\":\"true\"},\"format\":\"roundtable-evaluation-plan-1\",\"latePolicy\":\"ACCEPT_FLAGGED_UNSCORED\","
                + "\"measurands\":[{\"assignedValueMethod\":\"CONSENSUS_ALL\",\"belowMinimum\":\"NOT_SCORED\","
                + "\"boundaryRule\":\"SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3\","
                + "\"element\":\"Cr\",\"exclusionRules\":\"Results reported as < are not used.\","
                + "\"minimumForDataDerivedSigmaPt\":\"10\",\"minimumParticipants\":\"10\","
                + "\"provisionalSigmaPt\":\"0.10\",\"quartileRule\":\"HYNDMAN_FAN_7\",\"reportingDigits\":\"2\","
                + "\"scoreCoverageFactor\":\"2\",\"scoreDecimals\":\"2\","
                + "\"scores\":[\"Z_OR_Z_PRIME\"],\"sigmaPtDataDerived\":\"true\",\"sigmaPtMethod\":\"ROBUST_SD_OF_ROUND\","
                + "\"stoppingRule\":\"FULL_CONVERGENCE\",\"unit\":\"%\"},"
                + "{\"assignedValueMethod\":\"CERTIFIED_REFERENCE\",\"belowMinimum\":\"NOT_SCORED\","
                + "\"boundaryRule\":\"SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3\","
                + "\"coverageFactor\":\"2\",\"element\":\"Mn\",\"minimumForDataDerivedSigmaPt\":\"10\","
                + "\"minimumParticipants\":\"10\",\"quartileRule\":\"HYNDMAN_FAN_7\","
                + "\"referenceExpandedUncertainty\":\"0.020\",\"referenceValue\":\"1.520\",\"reportingDigits\":\"3\","
                + "\"scoreCoverageFactor\":\"2\",\"scoreDecimals\":\"2\","
                + "\"scores\":[\"Z_OR_Z_PRIME\",\"EN\"],\"sigmaPt\":\"0.040\",\"sigmaPtMethod\":\"FIXED\","
                + "\"stoppingRule\":\"FULL_CONVERGENCE\",\"unit\":\"%\"}],"
                + "\"participantCodeScope\":\"ROUND\",\"roundCode\":\"" + roundCode + "\"}";
        assertThat(first).isEqualTo(expected);
    }

    @Test
    void freezingStoresVersionOneWithTheSha256OfTheCanonicalTextAndAuditsIt() {
        String draft = savePlan(PLAN_ONE_ORDER).then().statusCode(200).extract().jsonPath().getString("draftPlan");
        transition("FREEZE_PLAN").then().statusCode(200);
        List<Map<String, Object>> versions = coordinator.request().get("/api/v1/rounds/" + roundId + "/plan/versions")
                .then().statusCode(200).extract().jsonPath().getList("$");
        assertThat(versions).hasSize(1);
        assertThat(versions.get(0).get("version")).isEqualTo(1);
        assertThat(versions.get(0).get("canonicalJson")).isEqualTo(draft);
        assertThat(versions.get(0).get("sha256")).isEqualTo(Secrets.sha256Hex(draft));
        assertThat(world.text("SELECT detail FROM audit_event WHERE object_type = 'round' AND object_id = ? "
                + "AND action = 'round.freeze-plan'", Long.toString(roundId))).contains("planSha256=" + Secrets.sha256Hex(draft));
        // the draft can no longer be edited
        Response again = savePlan(PLAN_OTHER_ORDER);
        assertThat(again.statusCode()).isEqualTo(409);
        assertThat(again.jsonPath().getString("detail")).contains("plan frozen");
    }

    @Test
    void aFrozenPlanChangesOnlyAsANewVersionWithAReasonAndTheChangeIsAudited() {
        savePlan(PLAN_ONE_ORDER).then().statusCode(200);
        transition("FREEZE_PLAN").then().statusCode(200);
        String v1 = world.text("SELECT sha256 FROM evaluation_plan WHERE round_id = ? AND plan_version = 1", roundId);
        String changed = PLAN_ONE_ORDER.replace("\"0.040\"", "\"0.050\"");

        Response withoutReason = newVersion(changed, null);
        assertThat(withoutReason.statusCode()).isEqualTo(400);
        assertThat(withoutReason.jsonPath().getString("detail")).contains("reason");

        Response unchanged = newVersion(PLAN_OTHER_ORDER, "Same plan again");
        assertThat(unchanged.statusCode()).isEqualTo(409);
        assertThat(unchanged.jsonPath().getString("detail")).contains("unchanged");

        Response v2 = newVersion(changed, "Mn sigma_pt widened after the advisory group's review");
        assertThat(v2.statusCode()).as(v2.asString()).isEqualTo(200);
        assertThat(v2.jsonPath().getInt("version")).isEqualTo(2);
        String v2Hash = v2.jsonPath().getString("sha256");
        assertThat(v2Hash).isNotEqualTo(v1).isEqualTo(Secrets.sha256Hex(v2.jsonPath().getString("canonicalJson")));
        assertThat(v2.jsonPath().getString("canonicalJson")).contains("\"sigmaPt\":\"0.050\"");
        assertThat(world.text("SELECT before_hash || ' ' || after_hash || ' ' || detail FROM audit_event "
                + "WHERE action = 'round.plan-version' AND object_id = ?", roundId + "/2"))
                .isEqualTo(v1 + " " + v2Hash + " version=2 reason=Mn sigma_pt widened after the advisory group's review");
        // version 1 is kept as it was
        assertThat(world.text("SELECT sha256 FROM evaluation_plan WHERE round_id = ? AND plan_version = 1", roundId)).isEqualTo(v1);
    }

    @Test
    void thePlanCannotChangeOnceResultsAreVisibleBeyondTheirOwnLaboratory() {
        savePlan(PLAN_ONE_ORDER).then().statusCode(200);
        transition("FREEZE_PLAN").then().statusCode(200);
        for (RoundState visible : List.of(RoundState.PRELIMINARY_ISSUED, RoundState.COMMENT_PERIOD, RoundState.FINAL_ISSUED,
                RoundState.AMENDED, RoundState.ARCHIVED)) {
            world.sql("UPDATE round SET state = ? WHERE id = ?", visible.name(), roundId);
            Response refused = newVersion(PLAN_ONE_ORDER.replace("\"0.040\"", "\"0.060\""), "Late change");
            assertThat(refused.statusCode()).as(visible.name()).isEqualTo(409);
            assertThat(refused.jsonPath().getString("detail")).contains("New plan version is not possible now");
        }
        assertThat(world.insert("SELECT count(*) FROM evaluation_plan WHERE round_id = ?", roundId)).isEqualTo(1);
    }

    @Test
    void aPlanThatDoesNotFitTheCatalogueOrLacksAChoiceIsRefusedWithTheReason() {
        assertRefused("{\"measurands\":[{\"element\":\"Ni\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"0.1\"}]}",
                "Ni is not in the scheme's measurand catalogue");
        assertRefused("{\"measurands\":[{\"element\":\"Xx\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"0.1\"}]}",
                "not an element symbol");
        assertRefused("{\"measurands\":[{\"element\":\"Cr\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"ROBUST_SD_OF_ROUND\"}]}",
                "provisional σpt");
        assertRefused("{\"measurands\":[{\"element\":\"Cr\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"0.1\",\"scores\":[\"EN\"]}]}",
                "En needs a reference value");
        assertRefused("{\"measurands\":[{\"element\":\"Cr\",\"assignedValueMethod\":\"CONSENSUS_METHOD_GROUP\",\"methodGroup\":\"COMBUSTION\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"0.1\"}]}",
                "method group COMBUSTION is not allowed");
        assertRefused("{\"measurands\":[{\"element\":\"Cr\",\"assignedValueMethod\":\"CONSENSUS_ALL\",\"sigmaPtMethod\":\"FIXED\",\"sigmaPt\":\"-0.1\"}]}",
                "positive decimal number");
        assertThat(world.text("SELECT draft_plan FROM round WHERE id = ?", roundId)).isNull();
    }

    @Test
    void freezingWithoutAPlanIsRefusedAndAnUnknownActionIsABadRequest() {
        Response noPlan = transition("FREEZE_PLAN");
        assertThat(noPlan.statusCode()).isEqualTo(409);
        assertThat(noPlan.jsonPath().getString("detail")).contains("Write and save the evaluation plan");
        assertThat(transition("JUMP_TO_THE_END").statusCode()).isEqualTo(400);
    }

    @Test
    void anElementSymbolMustBeFromTheTableHydrogenToUranium() {
        Response plutonium = coordinator.json().body(Map.of("element", "Pu", "unit", "%", "reportingDigits", 2,
                "methodGroups", List.of("OTHER"))).post("/api/v1/schemes/" + schemeId + "/measurands");
        assertThat(plutonium.statusCode()).isEqualTo(400);
        Response shouting = coordinator.json().body(Map.of("element", "MN", "unit", "%", "reportingDigits", 2,
                "methodGroups", List.of("OTHER"))).post("/api/v1/schemes/" + schemeId + "/measurands");
        assertThat(shouting.statusCode()).isEqualTo(400);
        Response uranium = coordinator.json().body(Map.of("element", "U", "unit", "mg/kg", "reportingDigits", 1,
                "methodGroups", List.of("ICP_OES"))).post("/api/v1/schemes/" + schemeId + "/measurands");
        assertThat(uranium.statusCode()).isEqualTo(200);
        Response badUnit = coordinator.json().body(Map.of("element", "N", "unit", "ppm", "reportingDigits", 0,
                "methodGroups", List.of("INERT_GAS_FUSION"))).post("/api/v1/schemes/" + schemeId + "/measurands");
        assertThat(badUnit.statusCode()).isEqualTo(400);
    }

    private void assertRefused(String plan, String reason) {
        Response response = savePlan(plan);
        assertThat(response.statusCode()).as(plan).isEqualTo(400);
        assertThat(response.jsonPath().getString("detail")).as(plan).contains(reason);
    }

    private Response savePlan(String json) {
        return coordinator.json().body(json).put("/api/v1/rounds/" + roundId + "/plan");
    }

    private Response newVersion(String planJson, String reason) {
        String body = "{\"plan\":" + planJson + (reason == null ? "" : ",\"reason\":\"" + reason + "\"") + "}";
        return coordinator.json().body(body).post("/api/v1/rounds/" + roundId + "/plan/versions");
    }

    private Response transition(String action) {
        return coordinator.json().body(Map.of("action", action)).post("/api/v1/rounds/" + roundId + "/transitions");
    }
}
