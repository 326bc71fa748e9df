package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.path.json.JsonPath;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.qualification.QualificationService;
import org.roundtable.testing.World;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.assertj.core.api.Assertions.withinPercentage;

/**
 * Sample qualification end to end through the API: scheme, round, plan with σpt = 0.10 % for Cr, freeze,
 * enrolment, homogeneity and stability uploads, the figures, and the coordinator's decision for a measurand
 * that fails.
 *
 * <p>Check values: the project's statistics reference, §14.8 (homogeneity, constructed Cr in stainless
 * steel, g = 10 duplicates, σpt = 0.10; CALC — computed independently, no published source; F1/F2 at g = 10
 * agree with the published table of Fearn &amp; Thompson 2001 / IUPAC Harmonized Protocol 2006 / ISO 13528
 * Annex B, 1.88 and 1.01) and §14.9 (stability, CALC). Data: src/test/resources/scheme/ (SOURCE.md).
 */
@QuarkusTest
class HomogeneityWorkedExampleTest {

    /** rel 1e-6 as in §14.8, written as a percentage for AssertJ. */
    private static final org.assertj.core.data.Percentage REL_1E6 = withinPercentage(1e-4);

    @Inject
    World world;

    @Inject
    QualificationService qualification;

    private World.Browser coordinator;
    private long roundId;

    @BeforeEach
    void aRoundOpenForEnrolmentWithCrAtFixedSigmaAndNiWithProvisionalSigma() {
        coordinator = world.signIn(world.user("coordinator", null));
        long scheme = coordinator.json().body(Map.of("name", World.unique("Stainless scheme"), "materialFamily", "STAINLESS_STEEL"))
                .post("/api/v1/schemes").then().statusCode(200).extract().jsonPath().getLong("id");
        for (String element : List.of("Cr", "Ni")) {
            coordinator.json().body(Map.of("element", element, "unit", "%", "reportingDigits", 2,
                    "methodGroups", List.of("SPARK_OES"))).post("/api/v1/schemes/" + scheme + "/measurands").then().statusCode(200);
        }
        roundId = coordinator.json().body(Map.of("schemeId", scheme, "code", World.unique("HOM").toUpperCase(),
                        "itemDescription", "Stainless steel disc", "dispatchDate", "2027-03-01", "resultDeadline", "2027-03-29T17:00",
                        "timeZone", "UTC", "instructions", "Routine analysis."))
                .post("/api/v1/rounds").then().statusCode(200).extract().jsonPath().getLong("id");
        coordinator.json().body("""
                {"measurands":[
                  {"element":"Cr","assignedValueMethod":"CONSENSUS_ALL","sigmaPtMethod":"FIXED","sigmaPt":"0.10"},
                  {"element":"Ni","assignedValueMethod":"CONSENSUS_ALL","sigmaPtMethod":"ROBUST_SD_OF_ROUND","provisionalSigmaPt":"0.01"}
                ]}""").put("/api/v1/rounds/" + roundId + "/plan").then().statusCode(200);
        transition("FREEZE_PLAN").then().statusCode(200);
        transition("OPEN_ENROLMENT").then().statusCode(200);
    }

    @Test
    void theWorkedHomogeneityAndStabilityExampleIsReproducedThroughTheApi() {
        Response upload = coordinator.json().body(Map.of("csv", csv())).post(base() + "/qualification/homogeneity");
        assertThat(upload.statusCode()).as(upload.asString()).isEqualTo(200);
        JsonPath cr = cr(upload);
        assertThat(cr.getString("homogeneity.sigmaPtSource")).isEqualTo("planned");
        assertThat(cr.getDouble("homogeneity.sigmaPt")).isEqualTo(0.10);
        assertThat(cr.getInt("homogeneity.items")).isEqualTo(10);
        assertThat(cr.getInt("homogeneity.replicates")).isEqualTo(2);
        assertThat(cr.getDouble("homogeneity.grandMean")).isCloseTo(18.121, within(1e-10));
        assertThat(cr.getDouble("homogeneity.itemMeansSd")).isCloseTo(0.01663330, REL_1E6);
        assertThat(cr.getDouble("homogeneity.withinItemSd")).isCloseTo(0.01673320, REL_1E6);
        assertThat(cr.getDouble("homogeneity.betweenItemVariance")).isCloseTo(0.000136666667, REL_1E6);
        assertThat(cr.getDouble("homogeneity.betweenItemSd")).isCloseTo(0.01169045, REL_1E6);
        assertThat(cr.getDouble("homogeneity.simpleLimit")).isCloseTo(0.030, within(1e-12));
        assertThat(cr.getBoolean("homogeneity.passesSimpleCriterion")).isTrue();
        assertThat(cr.getDouble("homogeneity.f1")).isCloseTo(1.879886, withinPercentage(1e-3));
        assertThat(cr.getDouble("homogeneity.f2")).isCloseTo(1.010191, withinPercentage(1e-3));
        assertThat(cr.getDouble("homogeneity.allowance")).isCloseTo(0.0019747514, REL_1E6);
        assertThat(cr.getDouble("homogeneity.allowanceSd")).isCloseTo(0.04443817, REL_1E6);
        assertThat(cr.getBoolean("homogeneity.sufficientlyHomogeneous")).isTrue();
        assertThat(cr.getDouble("homogeneity.withinToSigmaRatio")).isCloseTo(0.167, within(1e-3));
        assertThat(cr.getString("homogeneity.cochranVerdict")).isNotNull();

        Response stability = coordinator.json().body(Map.of("csv", resource("/scheme/stability-cr-stainless.csv")))
                .post(base() + "/qualification/stability");
        assertThat(stability.statusCode()).as(stability.asString()).isEqualTo(200);
        cr = cr(stability);
        assertThat(cr.getDouble("stability.startMean")).isCloseTo(18.121, within(1e-10));
        assertThat(cr.getDouble("stability.startUncertainty")).isCloseTo(0.00525991, REL_1E6);
        assertThat(cr.getDouble("stability.endMean")).isCloseTo(18.110, within(1e-10));
        assertThat(cr.getDouble("stability.endUncertainty")).isCloseTo(0.00577350, REL_1E6);
        assertThat(cr.getDouble("stability.difference")).isCloseTo(0.011, within(1e-10));
        assertThat(cr.getDouble("stability.expandedLimit")).isCloseTo(0.04562050, REL_1E6);
        assertThat(cr.getBoolean("stability.stable")).isTrue();
        assertThat(cr.getBoolean("stability.stableExpanded")).isTrue();
        assertThat(cr.getBoolean("passed")).isTrue();
        assertThat(cr.getBoolean("cleared")).isTrue();
        assertThat(world.insert("SELECT count(*) FROM audit_event WHERE object_id = ? AND action LIKE 'qualification.%'",
                Long.toString(roundId))).isEqualTo(2);
    }

    @Test
    void aFailingMeasurandBlocksQualificationUntilADecisionWithAReasonIsRecorded() {
        String ni = """
                item,replicate,measurand,value
                N01,1,Ni,9.50
                N01,2,Ni,9.51
                N02,1,Ni,9.60
                N02,2,Ni,9.61
                N03,1,Ni,9.45
                N03,2,Ni,9.46
                N04,1,Ni,9.55
                N04,2,Ni,9.56
                N05,1,Ni,9.52
                N05,2,Ni,9.53
                N06,1,Ni,9.58
                N06,2,Ni,9.57
                N07,1,Ni,9.48
                N07,2,Ni,9.47
                N08,1,Ni,9.62
                N08,2,Ni,9.61
                N09,1,Ni,9.44
                N09,2,Ni,9.45
                N10,1,Ni,9.54
                N10,2,Ni,9.55
                """;
        Response upload = coordinator.json().body(Map.of("csv", csv() + ni.lines().skip(1).map(l -> l + "\n")
                .reduce("", String::concat))).post(base() + "/qualification/homogeneity");
        assertThat(upload.statusCode()).as(upload.asString()).isEqualTo(200);
        JsonPath nickel = element(upload, "Ni");
        // items differ by about 0.06 % against an allowance of 0.3 x 0.01 %: clearly not homogeneous (CALC)
        assertThat(nickel.getString("homogeneity.sigmaPtSource")).isEqualTo("provisional");
        assertThat(nickel.getBoolean("homogeneity.sufficientlyHomogeneous")).isFalse();
        assertThat(nickel.getBoolean("cleared")).isFalse();

        Response blocked = transition("CONFIRM_QUALIFICATION");
        assertThat(blocked.statusCode()).isEqualTo(409);
        assertThat(blocked.jsonPath().getString("detail")).contains("Ni").doesNotContain("Cr,");

        Response noReason = decide("Ni", "ACCEPT", null);
        assertThat(noReason.statusCode()).isEqualTo(400);
        assertThat(noReason.jsonPath().getString("detail")).contains("have not passed").contains("reason");
        Response uHomForConsensus = decide("Ni", "ADD_HOMOGENEITY_UNCERTAINTY", "Add u_hom");
        assertThat(uHomForConsensus.statusCode()).isEqualTo(409);
        assertThat(qualification.mayBeScored(roundId, "Ni")).isFalse();

        Response widened = decide("Ni", "WIDEN_SIGMA_PT", "Between-disc SD is real; sigma_pt widened by s_s as the plan allows");
        assertThat(widened.statusCode()).as(widened.asString()).isEqualTo(200);
        assertThat(element(widened, "Ni").getBoolean("cleared")).isTrue();
        assertThat(element(widened, "Ni").getString("decision.decision")).isEqualTo("WIDEN_SIGMA_PT");
        assertThat(qualification.mayBeScored(roundId, "Ni")).isTrue();

        decide("Ni", "WITHDRAW_MEASURAND", "Withdrawn after all: lot too inhomogeneous").then().statusCode(200);
        assertThat(qualification.mayBeScored(roundId, "Ni")).isFalse();
        assertThat(qualification.mayBeScored(roundId, "Cr")).isTrue();
        transition("CONFIRM_QUALIFICATION").then().statusCode(200);
    }

    @Test
    void aBadUploadNamesLineColumnAndReasonAndSavesNothing() {
        assertRefused(csv().replace("H02,1,Cr,18.15", "H02,1,Cr,18,15"), "Line 4: 4 columns expected");
        assertRefused(csv().replace("H02,1,Cr,18.15", "H02,1,Cr,eighteen"), "Line 4, column value");
        assertRefused(csv().replace("H02,1,Cr,18.15", "H02,1,Xq,18.15"), "Line 4, column measurand");
        assertRefused(csv().replace("H02,1,Cr,18.15", "H02,0,Cr,18.15"), "Line 4, column replicate");
        assertRefused(csv().replace("item,replicate", "sample,replicate"), "Line 1: the header must be");
        assertRefused(csv().lines().filter(l -> !l.startsWith("H10")).map(l -> l + "\n").reduce("", String::concat),
                "Cr has 9 items");
        assertRefused(csv().replace("H10,2,Cr,18.10\n", ""), "item H10 of Cr has 1 replicate; at least 2 are needed");
        assertRefused(csv() + "H10,3,Cr,18.11\n", "every item needs the same number");
        assertRefused(csv().replace("H02,1,Cr,18.15", "H02,1,Mn,18.15"), "Mn is not in the round's evaluation plan");
        assertThat(world.insert("SELECT count(*) FROM qualification_check WHERE round_id = ?", roundId)).isZero();
        Response stabilityFirst = coordinator.json().body(Map.of("csv", resource("/scheme/stability-cr-stainless.csv")))
                .post(base() + "/qualification/stability");
        assertThat(stabilityFirst.statusCode()).isEqualTo(400);
        assertThat(stabilityFirst.jsonPath().getString("detail")).contains("upload homogeneity data for Cr first");
    }

    private void assertRefused(String csv, String reason) {
        Response response = coordinator.json().body(Map.of("csv", csv)).post(base() + "/qualification/homogeneity");
        assertThat(response.statusCode()).as(reason).isEqualTo(400);
        assertThat(response.jsonPath().getString("detail")).contains(reason);
    }

    private Response decide(String element, String decision, String reason) {
        Map<String, String> body = new java.util.HashMap<>(Map.of("element", element, "decision", decision));
        if (reason != null) {
            body.put("reason", reason);
        }
        return coordinator.json().body(body).post(base() + "/qualification/decisions");
    }

    private static JsonPath cr(Response response) {
        return element(response, "Cr");
    }

    private static JsonPath element(Response response, String element) {
        List<Map<String, Object>> all = response.jsonPath().getList("$");
        Map<String, Object> found = all.stream().filter(m -> element.equals(m.get("element"))).findFirst().orElseThrow();
        return new JsonPath(new com.fasterxml.jackson.databind.ObjectMapper().valueToTree(found).toString());
    }

    private String base() {
        return "/api/v1/rounds/" + roundId;
    }

    private Response transition(String action) {
        return coordinator.json().body(Map.of("action", action)).post(base() + "/transitions");
    }

    /** The §14.8 duplicates as the homogeneity upload (see SOURCE.md beside the file). */
    static String csv() {
        return resource("/scheme/homogeneity-cr-stainless.csv");
    }

    static String resource(String path) {
        try (InputStream in = HomogeneityWorkedExampleTest.class.getResourceAsStream(path)) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
