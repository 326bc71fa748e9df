package org.roundtable.precision;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

/**
 * Homogeneity of a precision experiment's materials on PostgreSQL: a coordinator uploads one level's data with the
 * target SD (the expected s_R) on the homogeneity page; the check of a proficiency round's sample runs with the target
 * in place of σpt, is stored per level and measurand (append-only, audited), and is shown on the study page; refusals
 * keep the typed input and name the problem beside its field. Data and check values: the project's statistics
 * reference §14.8 (constructed Cr in stainless steel, g = 10 duplicates, CALC, no published source), with the target
 * 0.10 in place of σpt = 0.10 (src/test/resources/scheme/SOURCE.md).
 */
@QuarkusTest
class PrecisionMaterialsTest {

    @Inject
    World world;

    private static String homogeneityData() throws IOException {
        try (InputStream in = PrecisionMaterialsTest.class.getResourceAsStream("/scheme/homogeneity-cr-stainless.csv")) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
    }

    /** A study of Cr at levels 1 and 2, frozen and enrolling (when materials are checked). */
    private long enrollingStudy(World.Browser coordinator) {
        long scheme = world.insert("INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'STAINLESS_STEEL', now()) RETURNING id",
                World.unique("Chromium study"));
        world.insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, method_groups) "
                + "VALUES (?, 'Cr', '%', 2, 10, 30, 'SPARK_OES') RETURNING id", scheme);
        Map<String, Object> round = new LinkedHashMap<>();
        round.put("schemeId", scheme);
        round.put("code", World.unique("CR").toUpperCase());
        round.put("itemDescription", "Stainless steel discs");
        round.put("dispatchDate", LocalDate.now().toString());
        round.put("resultDeadline", LocalDate.now().plusDays(30) + "T17:00");
        round.put("timeZone", "Europe/Berlin");
        round.put("instructions", "Analyse each level twice.");
        Map<String, Object> plan = Map.of("levels", List.of(Map.of("label", "1", "material", "Stainless 18 % Cr"),
                Map.of("label", "2", "material", "Stainless 25 % Cr")), "measurands", List.of("Cr"), "replicates", 2);
        Response created = coordinator.json().body(Map.of("round", round, "plan", plan)).post("/api/v1/precision-experiments");
        assertThat(created.statusCode()).as(created.asString()).isEqualTo(201);
        long id = created.jsonPath().getLong("id");
        PrecisionStudies.transition(coordinator, id, "FREEZE_PLAN");
        PrecisionStudies.transition(coordinator, id, "OPEN_ENROLMENT");
        return id;
    }

    private Response upload(World.Browser coordinator, long id, String level, String target, String csv) {
        return upload(coordinator, id, level, "Cr", target, csv);
    }

    private Response upload(World.Browser coordinator, long id, String level, String element, String target, String csv) {
        return coordinator.request().header("X-CSRF-Token", coordinator.csrfToken()).multiPart("_csrf", coordinator.csrfToken())
                .multiPart("level", level).multiPart("target-" + element, target).multiPart("csv", csv)
                .post("/precision-experiments/" + id + "/homogeneity");
    }

    @Test
    void aLevelsMaterialIsCheckedAgainstTheExpectedReproducibilityAndShownOnTheStudyPage() throws IOException {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        long id = enrollingStudy(coordinator);
        assertThat(coordinator.request().get("/precision-experiments/" + id).then().statusCode(200).extract().asString())
                .contains("No homogeneity data yet");

        Response ok = upload(coordinator, id, "1", "0.10", homogeneityData());
        assertThat(ok.statusCode()).as(ok.asString()).isEqualTo(200);
        String page = ok.asString();
        // statistics reference §14.8 (CALC): s_s = 0.01169045, s_w = 0.01673320, 0.3 × 0.10 = 0.030, √c = 0.04443817;
        // printed at the reporting digits + 1 = 3 decimals
        assertThat(page).contains("Homogeneity data of level 1 checked").contains("10 items × 2 replicates")
                .contains("0.012").contains("0.017").contains("limit 0.030").contains("0.044")
                .contains("sufficiently homogeneous").contains("not evaluated yet");
        assertThat(world.text("SELECT level_label || ' ' || element || ' ' || sigma_pt::text || ' ' || sigma_pt_source || ' ' || passed::text"
                + " FROM qualification_check WHERE round_id = ?", id)).isEqualTo("1 Cr 0.1 expected s_R true");
        assertThat(world.text("SELECT count(*)::text FROM audit_event WHERE action = 'qualification.homogeneity-uploaded'"
                + " AND object_id = ? AND detail LIKE '%level=1%'", Long.toString(id))).isEqualTo("1");
        String study = coordinator.request().get("/precision-experiments/" + id).then().statusCode(200).extract().asString();
        assertThat(study).contains("materials-checks").contains("1: Stainless 18 % Cr").contains("limit 0.030");

        // a tighter target: 0.3 × 0.03 = 0.009 < s_s = 0.0117, so the simple criterion is not met (arithmetic)
        Response tight = upload(coordinator, id, "2", "0.03", homogeneityData());
        assertThat(tight.statusCode()).isEqualTo(200);
        assertThat(world.text("SELECT figures_json FROM qualification_check WHERE round_id = ? AND level_label = '2'", id))
                .contains("\"passesSimpleCriterion\":false").contains("\"simpleLimit\":0.009");
        assertThat(tight.asString()).contains("limit 0.009");
    }

    @Test
    void aRefusedUploadKeepsWhatWasTypedAndNamesTheProblemBesideItsField() throws IOException {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        long id = enrollingStudy(coordinator);
        Response noTarget = upload(coordinator, id, "1", "", homogeneityData());
        assertThat(noTarget.statusCode()).isEqualTo(400);
        assertThat(noTarget.asString()).contains("id=\"target-problem\"").contains("Give the target SD of Cr")
                .contains("H02,1,Cr,18.15");
        Response unknownLevel = upload(coordinator, id, "9", "0.10", homogeneityData());
        assertThat(unknownLevel.statusCode()).isEqualTo(400);
        assertThat(unknownLevel.asString()).contains("id=\"level-problem\"").contains("value=\"0.10\"");
        Response tooFew = upload(coordinator, id, "1", "0.10", "item,replicate,measurand,value\nH01,1,Cr,18.1\nH01,2,Cr,18.2\n");
        assertThat(tooFew.statusCode()).isEqualTo(400);
        assertThat(tooFew.asString()).contains("id=\"data-problem\"").contains("at least 10");
        assertThat(world.text("SELECT count(*)::text FROM qualification_check WHERE round_id = ?", id)).isEqualTo("0");
        // another kind of round answers like a missing study
        long round = world.round(org.roundtable.scheme.RoundState.ENROLLING);
        assertThat(upload(coordinator, round, "1", "0.10", homogeneityData()).statusCode()).isEqualTo(404);
        assertThat(coordinator.request().get("/precision-experiments/" + round + "/homogeneity").statusCode()).isEqualTo(404);
    }

    @Test
    void theReportOfAnEvaluatedStudyShowsTheMaterialsCheckBesideTheSrItFound() throws IOException {
        PrecisionStudies studies = new PrecisionStudies(world);
        String code = World.unique("PE").toUpperCase();
        // the §14.8 numbers as carbon values of level 1 (only the numbers matter here), target 0.10
        String data = homogeneityData().replace(",Cr,", ",C,");
        PrecisionStudies.Study study = studies.openForResults(code, PrecisionStudies.createBody(studies.scheme(), code), 12,
                (coordinator, id) -> assertThat(upload(coordinator, id, "1", "C", "0.10", data).statusCode()).isEqualTo(200));
        studies.submitAll(study);
        PrecisionStudies.close(study);
        World.Browser coordinator = study.coordinator();
        long id = study.roundId();
        coordinator.json().post("/api/v1/precision-experiments/" + id + "/evaluations").then().statusCode(201);
        String page = coordinator.request().get("/precision-experiments/" + id).then().statusCode(200).extract().asString();
        assertThat(page).contains("materials-checks").contains("limit 0.030").doesNotContain("not evaluated yet");
        coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/draft").then().statusCode(201);
        String report = coordinator.request().get("/precision-experiments/" + id + "/report").then().statusCode(200)
                .extract().asString();
        assertThat(report).contains("Homogeneity of the materials").contains("10 items × 2 replicates")
                .contains("sufficiently homogeneous").contains("expected s_R");
    }
}
