package org.roundtable.precision;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.platform.Secrets;
import org.roundtable.testing.World;

/**
 * A precision experiment of 3 levels × 12 laboratories × 2 replicates end to end through the API, on PostgreSQL:
 * creation with its plan, the shared lifecycle, enrolment and CSV submissions, refusal of a wrong number of
 * replicates, evaluation with the planted straggler and outlier flagged at their levels, exclusion only by
 * decision, the draft and final reports (issued, verifiable), and the offline command giving the same numbers.
 */
@QuarkusTest
class PrecisionExperimentApiTest {

    @Inject
    World world;

    private static final ObjectMapper JSON = new ObjectMapper();

    @Test
    void aLaboratoryWithTheWrongNumberOfReplicatesIsRefusedWithTheRowNamed() {
        PrecisionStudies studies = new PrecisionStudies(world);
        PrecisionStudies.Study study = studies.openForResults();
        String csv = "level,measurand,replicate,value\n1,C,1,0.0512\n1,C,2,0.0509\n2,C,1,0.2001\n3,C,1,0.8012\n3,C,2,0.8030\n";
        Response r = studies.submitCsv(study.roundId(), study.labs().get("L01"), csv);
        assertThat(r.statusCode()).as(r.asString()).isEqualTo(422);
        assertThat(r.jsonPath().getList("errors.key", String.class)).containsExactly("replicates.wrong-number");
        assertThat(r.jsonPath().getInt("errors[0].row")).isEqualTo(4);
        assertThat(r.jsonPath().getString("errors[0].message")).contains("Level 2").contains("row 4").contains("exactly 2");
        assertThat(world.text("SELECT count(*)::text FROM submission s JOIN round r ON r.id = s.round_id WHERE r.id = ?",
                study.roundId())).isEqualTo("0");
        Response unknown = studies.submitCsv(study.roundId(), study.labs().get("L01"),
                "level,measurand,replicate,value\n4,C,1,0.1\n");
        assertThat(unknown.statusCode()).isEqualTo(422);
        assertThat(unknown.jsonPath().getList("errors.key", String.class)).contains("level.unknown");
    }

    @Test
    void aStudyRunsFromPlanToFinalReportWithOutliersExcludedOnlyByDecision() throws Exception {
        PrecisionStudies studies = new PrecisionStudies(world);
        PrecisionStudies.Study study = studies.openForResults();
        World.Browser coordinator = study.coordinator();
        long id = study.roundId();
        studies.submitAll(study);
        // a laboratory reads its own replicates back, never another's
        World.Browser member = world.signIn(world.user("lab-member", study.labs().get("L07")));
        List<Map<String, Object>> mine = member.request().accept("application/json").get("/api/v1/precision-experiments/" + id + "/my-results")
                .then().statusCode(200).extract().jsonPath().getList("$");
        assertThat(mine).hasSize(6);
        assertThat(coordinator.request().get("/api/v1/precision-experiments/" + id).then().statusCode(200)
                .extract().jsonPath().getInt("submitted")).isEqualTo(12);
        // no evaluation before the close
        assertThat(coordinator.json().post("/api/v1/precision-experiments/" + id + "/evaluations").statusCode()).isEqualTo(409);
        PrecisionStudies.close(study);

        JsonNode first = JSON.readTree(coordinator.json().post("/api/v1/precision-experiments/" + id + "/evaluations")
                .then().statusCode(201).extract().asString());
        JsonNode levels = first.path("study").path("measurands").get(0).path("levels");
        String l07 = study.codes().get("L07");
        String l10 = study.codes().get("L10");
        JsonNode cochran2 = test(levels.get(1), "Cochran C (largest variance)");
        assertThat(cochran2.path("verdict").asText()).isEqualTo("straggler");
        assertThat(cochran2.path("laboratories").get(0).asText()).isEqualTo(l07);
        // CALC: check_values.py beside the data (NumPy), level 2, C = 0.5670300384
        assertThat(cochran2.path("statistic").asDouble()).isCloseTo(0.5670300384, within(1e-9));
        JsonNode grubbs3 = test(levels.get(2), "Grubbs single, highest mean");
        assertThat(grubbs3.path("verdict").asText()).isEqualTo("outlier");
        assertThat(grubbs3.path("laboratories").get(0).asText()).isEqualTo(l10);
        assertThat(cell(levels.get(2), l10).path("verdict").asText()).isEqualTo("outlier");
        assertThat(cell(levels.get(2), l10).path("excluded").asBoolean()).isFalse();
        assertThat(levels.get(2).path("retainedLaboratories").asInt()).isEqualTo(12);
        assertThat(test(levels.get(0), "Cochran C (largest variance)").path("verdict").asText()).isEqualTo("accepted");
        // CALC: check_values.py, level 3 with all laboratories
        assertThat(levels.get(2).path("repeatabilitySd").asDouble()).isCloseTo(0.00784402639, within(1e-12));

        // the coordinator decides: L10 at level 3 is excluded, with a reason; refused without one
        Response noReason = coordinator.json().body(Map.of("participantCode", l10, "measurand", "C", "level", "3", "reason", " "))
                .post("/api/v1/precision-experiments/" + id + "/exclusions");
        assertThat(noReason.statusCode()).isEqualTo(400);
        Response excluded = coordinator.json().body(Map.of("participantCode", l10, "measurand", "C", "level", "3",
                "reason", "Calibration with the wrong reference material, confirmed by the laboratory"))
                .post("/api/v1/precision-experiments/" + id + "/exclusions");
        assertThat(excluded.statusCode()).as(excluded.asString()).isEqualTo(201);
        // a report from a run older than the decision is refused
        assertThat(coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/draft").statusCode()).isEqualTo(409);

        JsonNode second = JSON.readTree(coordinator.json().post("/api/v1/precision-experiments/" + id + "/evaluations")
                .then().statusCode(201).extract().asString());
        assertThat(second.path("runNumber").asInt()).isEqualTo(2);
        JsonNode level3 = second.path("study").path("measurands").get(0).path("levels").get(2);
        assertThat(level3.path("retainedLaboratories").asInt()).isEqualTo(11);
        assertThat(cell(level3, l10).path("excluded").asBoolean()).isTrue();
        // CALC: check_values.py, level 3 without L10
        assertThat(level3.path("reproducibilitySd").asDouble()).isCloseTo(0.01237928622, within(1e-11));
        // the straggler at level 2 stays in: only a decision excludes
        assertThat(second.path("study").path("measurands").get(0).path("levels").get(1).path("retainedLaboratories").asInt())
                .isEqualTo(12);

        // the offline command gives the same numbers from the same data and decision
        Path csv = Files.createTempFile("precision", ".csv");
        Files.writeString(csv, PrecisionStudies.csvWithCodes(study.codes()));
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int code = EvaluateCommand.run(new String[] {"--precision", "--exclude", l10 + ":3:C", csv.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), System.err);
        assertThat(code).isZero();
        JsonNode offline = JSON.readTree(out.toString(StandardCharsets.UTF_8));
        JsonNode serverLevels = second.path("study").path("measurands").get(0).path("levels");
        JsonNode offlineLevels = offline.path("measurands").get(0).path("levels");
        for (int j = 0; j < 3; j++) {
            for (String q : List.of("generalMean", "repeatabilitySd", "betweenLaboratorySd", "reproducibilitySd",
                    "repeatabilityLimit", "reproducibilityLimit", "retainedLaboratories")) {
                assertThat(offlineLevels.get(j).path(q).asDouble()).as("level " + (j + 1) + " " + q)
                        .isEqualTo(serverLevels.get(j).path(q).asDouble());
            }
            assertThat(offlineLevels.get(j).path("tests")).isEqualTo(serverLevels.get(j).path("tests"));
            for (int i = 0; i < 12; i++) {
                assertThat(offlineLevels.get(j).path("cells").get(i).path("h"))
                        .isEqualTo(serverLevels.get(j).path("cells").get(i).path("h"));
            }
        }
        assertThat(offline.path("measurands").get(0).path("reproducibilityFits"))
                .isEqualTo(second.path("study").path("measurands").get(0).path("reproducibilityFits"));

        // draft report, comment period, final report: issued documents, verifiable by their hash
        Response draft = coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/draft");
        assertThat(draft.statusCode()).as(draft.asString()).isEqualTo(201);
        assertThat(draft.jsonPath().getString("status")).isEqualTo("preliminary");
        byte[] draftPdf = member.request().get("/api/v1/precision-experiments/" + id + "/report.pdf")
                .then().statusCode(200).extract().asByteArray();
        assertThat(new String(draftPdf, 0, 5, StandardCharsets.US_ASCII)).isEqualTo("%PDF-");
        assertThat(Secrets.sha256Hex(draftPdf)).isEqualTo(draft.jsonPath().getString("sha256"));
        // exclusions are settled before the draft
        assertThat(coordinator.json().body(Map.of("participantCode", l07, "measurand", "C", "level", "2", "reason", "late idea"))
                .post("/api/v1/precision-experiments/" + id + "/exclusions").statusCode()).isEqualTo(409);
        assertThat(coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/final").statusCode()).isEqualTo(409);
        coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/comment-period").then().statusCode(204);
        Response fin = coordinator.json().post("/api/v1/precision-experiments/" + id + "/report/final");
        assertThat(fin.statusCode()).as(fin.asString()).isEqualTo(201);
        assertThat(world.text("SELECT state FROM round WHERE id = ?", id)).isEqualTo("FINAL_ISSUED");
        Response verified = given().contentType("application/json").body(Map.of("sha256", fin.jsonPath().getString("sha256")))
                .post("/api/v1/reports/verify");
        assertThat(verified.statusCode()).as(verified.asString()).isEqualTo(200);
        assertThat(verified.asString()).contains(fin.jsonPath().getString("reportId"));
        // the published s_R and s_r feed a proficiency round's σpt method "precision data"
        Response data = coordinator.request().queryParam("measurand", "C").queryParam("level", "3")
                .get("/api/v1/precision-experiments/" + id + "/precision-data");
        assertThat(data.statusCode()).as(data.asString()).isEqualTo(200);
        assertThat(data.jsonPath().getString("sigmaPtMethod")).isEqualTo("PRECISION_DATA");
        // CALC: check_values.py, level 3 without L10, at reporting digits + 2
        assertThat(Double.parseDouble(data.jsonPath().getString("reproducibilitySd"))).isCloseTo(0.01237928622, within(6e-7));
        Response fitted = coordinator.request().queryParam("measurand", "C").queryParam("m", "0.5")
                .get("/api/v1/precision-experiments/" + id + "/precision-data");
        assertThat(fitted.statusCode()).as(fitted.asString()).isEqualTo(200);
        assertThat(coordinator.request().queryParam("measurand", "C").queryParam("m", "5")
                .get("/api/v1/precision-experiments/" + id + "/precision-data").statusCode()).isEqualTo(400);
        // a laboratory not in the study gets nothing, as for a missing one
        World.Browser outsider = world.signIn(world.user("lab-member", world.laboratory()));
        assertThat(outsider.request().get("/api/v1/precision-experiments/" + id + "/report.pdf").statusCode()).isEqualTo(404);
        // the decision and the runs are in the audit trail
        assertThat(world.text("SELECT count(*)::text FROM audit_event WHERE action IN ('precision.cell-excluded', 'precision.evaluated')"
                + " AND detail LIKE ?", "round=" + id + " %")).isEqualTo("3");
    }

    private static JsonNode test(JsonNode level, String name) {
        for (JsonNode t : level.path("tests")) {
            if (t.path("test").asText().equals(name)) {
                return t;
            }
        }
        throw new AssertionError("no test " + name + " in " + level);
    }

    private static JsonNode cell(JsonNode level, String code) {
        for (JsonNode c : level.path("cells")) {
            if (c.path("laboratory").asText().equals(code)) {
                return c;
            }
        }
        throw new AssertionError("no cell " + code);
    }
}
