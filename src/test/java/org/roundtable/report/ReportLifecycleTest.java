package org.roundtable.report;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.job.JobRunner;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.List;
import java.util.Map;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * The report lifecycle on PostgreSQL through the JSON API: preliminary issue, comment period, comments and answers,
 * sign-off, final issue, amendment; who sees which document; verification of the issued bytes.
 */
@QuarkusTest
class ReportLifecycleTest {

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    JobRunner runner;

    private long round;
    private long[] labs;

    private void evaluatedRound() {
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        round = ids[0];
        labs = new long[ids.length - 1];
        System.arraycopy(ids, 1, labs, 0, labs.length);
    }

    private void runJobs() {
        while (runner.runNext()) {
            // run every queued job, the report issue among them
        }
    }

    private List<Map<String, Object>> documents(World.Browser who, String api) {
        return who.request().get(api + round + "/documents").then().statusCode(200).extract().jsonPath().getList("$");
    }

    private static List<String> reportIds(List<Map<String, Object>> docs) {
        return docs.stream().map(d -> (String) d.get("reportId")).toList();
    }

    private void issue(World.Browser coordinator, String what, String body) {
        coordinator.json().body(body).post("/api/v1/rounds/" + round + "/reports/" + what).then().statusCode(202);
        runJobs();
    }

    @Test
    void theLifecycleFromPreliminaryToAmendmentShowsEachReaderOnlyWhatIsTheirs() {
        evaluatedRound();
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        String codeA = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, labs[0]);
        String codeB = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, labs[1]);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        World.Browser labA = world.signIn(world.user("lab-member", labs[0]));
        World.Browser labB = world.signIn(world.user("lab-manager", labs[1]));
        String grantedName = world.user("auditor", null);
        world.grant(labs[0], grantedName);
        World.Browser granted = world.signIn(grantedName);
        World.Browser otherAuditor = world.signIn(world.user("auditor", null));

        // nothing before the preliminary issue
        assertThat(documents(labA, "/api/v1/my-rounds/")).isEmpty();
        assertThat(documents(granted, "/api/v1/rounds/")).isEmpty();

        // a preview run is never reported; the stored run is
        issue(coordinator, "preliminary", "{\"version\": 1, \"comments\": \"Preliminary figures.\"}");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("PRELIMINARY_ISSUED");
        List<Map<String, Object>> all = documents(coordinator, "/api/v1/rounds/");
        assertThat(all).hasSize(labs.length + 1);
        assertThat(reportIds(all)).contains(code + "-R-P1", code + "-" + codeA + "-P1");

        List<Map<String, Object>> seenByA = documents(labA, "/api/v1/my-rounds/");
        assertThat(reportIds(seenByA)).containsExactlyInAnyOrder(code + "-" + codeA + "-P1", code + "-R-P1");
        assertThat(documents(granted, "/api/v1/rounds/")).isEmpty();

        // the laboratory downloads its own report: the exact bytes, which the verification accepts
        Map<String, Object> ownDoc = seenByA.stream().filter(d -> "LABORATORY".equals(d.get("kind"))).findFirst().orElseThrow();
        Response download = labA.request().get("/api/v1/my-rounds/" + round + "/documents/" + ownDoc.get("id"));
        assertThat(download.statusCode()).isEqualTo(200);
        assertThat(download.contentType()).startsWith("application/pdf");
        assertThat(download.header("Content-Disposition")).startsWith("attachment").contains(code + "-" + codeA + "-P1.pdf");
        byte[] bytes = download.asByteArray();
        assertThat(Secrets.sha256Hex(bytes)).isEqualTo(ownDoc.get("sha256"));
        given().contentType("application/pdf").body(bytes).post("/api/v1/reports/verify").then().statusCode(200)
                .extract().jsonPath().getBoolean("issued");
        assertThat(given().contentType("application/pdf").body(bytes).post("/api/v1/reports/verify")
                .jsonPath().getString("reportId")).isEqualTo(code + "-" + codeA + "-P1");

        // its PDF names its own code as the participant and no laboratory
        String text = ReportAssemblerTest.text(bytes);
        assertThat(text).contains("Participant code " + codeA).doesNotContain("Participant code " + codeB);
        // its own shape: its results and scores, the round report named for everyone's results
        assertThat(text).contains("Your results at a glance").contains("Round report " + code + "-R-P1")
                .contains("End of report " + code + "-" + codeA + "-P1").doesNotContain("Results and scores");
        for (long lab : labs) {
            assertThat(text).doesNotContain(world.text("SELECT name FROM laboratory WHERE id = ?", lab));
        }

        // another laboratory's report answers exactly like a missing one
        Object docOfA = ownDoc.get("id");
        Response foreign = labB.request().get("/api/v1/my-rounds/" + round + "/documents/" + docOfA);
        Response missing = labB.request().get("/api/v1/my-rounds/" + round + "/documents/987654321");
        assertThat(foreign.statusCode()).isEqualTo(404);
        assertThat(foreign.jsonPath().getString("detail")).isEqualTo(missing.jsonPath().getString("detail"));
        assertThat(reportIds(documents(labB, "/api/v1/my-rounds/"))).doesNotContain(code + "-" + codeA + "-P1");

        // comments: only during the comment period; kept and answered; a laboratory sees only its own
        labA.json().body("{\"body\": \"Our Cr result was reported in the wrong unit?\"}")
                .post("/api/v1/my-rounds/" + round + "/comments").then().statusCode(409);
        coordinator.json().body("{}").post("/api/v1/rounds/" + round + "/reports/comment-period").then().statusCode(200);
        int commentId = labA.json().body("{\"body\": \"Please check our Cr result.\"}")
                .post("/api/v1/my-rounds/" + round + "/comments").then().statusCode(201).extract().path("id");
        assertThat(labB.request().get("/api/v1/my-rounds/" + round + "/comments").jsonPath().getList("$")).isEmpty();
        coordinator.json().body("{\"body\": \"Checked: the result stands as reported.\"}")
                .post("/api/v1/rounds/" + round + "/reports/comments/" + commentId + "/answers").then().statusCode(201);
        Map<String, Object> comment = labA.request().get("/api/v1/my-rounds/" + round + "/comments").jsonPath().getMap("[0]");
        assertThat(comment.get("body")).isEqualTo("Please check our Cr result.");
        assertThat(comment.get("participantCode")).isEqualTo(codeA);
        assertThat(comment.toString()).contains("Checked: the result stands as reported.");

        // final only after sign-off
        coordinator.json().body("{}").post("/api/v1/rounds/" + round + "/reports/final").then().statusCode(409);
        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs")
                .then().statusCode(201);
        issue(coordinator, "final", "{\"comments\": \"Final figures; no changes after the comment period.\"}");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("FINAL_ISSUED");

        assertThat(reportIds(documents(granted, "/api/v1/rounds/")))
                .containsExactlyInAnyOrder(code + "-R-F", code + "-" + codeA + "-F");
        assertThat(reportIds(documents(otherAuditor, "/api/v1/rounds/"))).containsExactly(code + "-R-F");
        Map<String, Object> labBFinal = documents(coordinator, "/api/v1/rounds/").stream()
                .filter(d -> (code + "-" + codeB + "-F").equals(d.get("reportId"))).findFirst().orElseThrow();
        granted.request().get("/api/v1/rounds/" + round + "/documents/" + labBFinal.get("id")).then().statusCode(404);
        // a grant whose data window ends before the round's final report does not reach the laboratory's report,
        // not even by its id (the library's rule, applied to every download)
        Map<String, Object> labAFinal = documents(coordinator, "/api/v1/rounds/").stream()
                .filter(d -> (code + "-" + codeA + "-F").equals(d.get("reportId"))).findFirst().orElseThrow();
        world.sql("UPDATE auditor_grant SET data_until = current_date - 1 WHERE auditor_id = (SELECT id FROM app_user "
                + "WHERE username = ?)", grantedName);
        granted.request().get("/api/v1/rounds/" + round + "/documents/" + labAFinal.get("id")).then().statusCode(404);
        assertThat(reportIds(documents(granted, "/api/v1/rounds/"))).containsExactly(code + "-R-F");
        world.sql("UPDATE auditor_grant SET data_until = NULL WHERE auditor_id = (SELECT id FROM app_user WHERE username = ?)",
                grantedName);

        // an amendment: new sign-off, a reason, new documents linked to the ones they replace
        coordinator.json().body("{\"reason\": \"Typo\"}").post("/api/v1/rounds/" + round + "/reports/amendments")
                .then().statusCode(409);
        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs")
                .then().statusCode(201);
        issue(coordinator, "amendments", "{\"version\": 1, \"reason\": \"Scheme name corrected on page 1.\"}");
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("AMENDED");
        List<Map<String, Object>> afterAmendment = documents(coordinator, "/api/v1/rounds/");
        Map<String, Object> amended = afterAmendment.stream().filter(d -> (code + "-R-A1").equals(d.get("reportId")))
                .findFirst().orElseThrow();
        assertThat(amended.get("status")).isEqualTo("AMENDED");
        assertThat(amended.get("replacesReportId")).isEqualTo(code + "-R-F");
        assertThat(amended.get("amendmentReason")).isEqualTo("Scheme name corrected on page 1.");
        Map<String, Object> finalRound = afterAmendment.stream().filter(d -> (code + "-R-F").equals(d.get("reportId")))
                .findFirst().orElseThrow();
        assertThat(finalRound.get("supersededBy")).isEqualTo(code + "-R-A1");
        assertThat(afterAmendment.stream().filter(d -> (code + "-" + codeA + "-A1").equals(d.get("reportId")))
                .findFirst().orElseThrow().get("replacesReportId")).isEqualTo(code + "-" + codeA + "-F");
        assertThat(given().contentType("application/json").body("{\"sha256\": \"" + finalRound.get("sha256") + "\"}")
                .post("/api/v1/reports/verify").jsonPath().getString("supersededBy")).isEqualTo(code + "-R-A1");
        assertThat(reportIds(documents(labA, "/api/v1/my-rounds/"))).contains(code + "-R-A1", code + "-" + codeA + "-A1")
                .doesNotContain(code + "-" + codeB + "-A1");
    }

    @Test
    void everyIssuedDocumentHasAnHtmlViewWithTheSameAccessAsItsPdfAndNamesTheSchemesProvider() {
        evaluatedRound();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        long scheme = Long.parseLong(world.text("SELECT scheme_id::text FROM round WHERE id = ?", round));
        coordinator.form().formParam("providerName", "Northfield Metals Proficiency Office")
                .formParam("providerAddress", "4 Foundry Lane, Northfield")
                .formParam("providerAccreditation", "PTP-0417")
                .post("/schemes/" + scheme + "/provider").then().statusCode(200);
        issue(coordinator, "preliminary", "{\"version\": 1}");
        World.Browser labA = world.signIn(world.user("lab-member", labs[0]));
        World.Browser labB = world.signIn(world.user("lab-member", labs[1]));
        Map<String, Object> ownDoc = documents(labA, "/api/v1/my-rounds/").stream()
                .filter(d -> "LABORATORY".equals(d.get("kind"))).findFirst().orElseThrow();
        Response html = labA.request().get("/api/v1/my-rounds/" + round + "/documents/" + ownDoc.get("id") + "/html");
        assertThat(html.statusCode()).isEqualTo(200);
        assertThat(html.contentType()).startsWith("text/html");
        assertThat(html.header("Content-Security-Policy")).contains("default-src 'none'").doesNotContain("script-src");
        assertThat(html.asString()).contains((String) ownDoc.get("reportId"))
                .contains("Northfield Metals Proficiency Office").contains("4 Foundry Lane, Northfield").contains("PTP-0417")
                .doesNotContain("by the coordinator: null").doesNotContain("(given)");
        // another laboratory's report is "not found" for its HTML view too
        labB.request().get("/api/v1/my-rounds/" + round + "/documents/" + ownDoc.get("id") + "/html").then().statusCode(404);
        coordinator.request().get("/api/v1/rounds/" + round + "/documents/" + ownDoc.get("id") + "/html").then().statusCode(200);
    }

    @Test
    void aSchemeWithASecondReviewerRefusesTheFinalReportUntilAnotherCoordinatorSigns() {
        evaluatedRound();
        world.sql("UPDATE scheme SET second_reviewer_required = true WHERE id = (SELECT scheme_id FROM round WHERE id = ?)", round);
        World.Browser first = world.signIn(world.user("coordinator", null));
        World.Browser second = world.signIn(world.user("coordinator", null));
        issue(first, "preliminary", "{\"version\": 1}");
        first.json().body("{}").post("/api/v1/rounds/" + round + "/reports/comment-period").then().statusCode(200);
        first.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs").then().statusCode(201);
        first.json().body("{}").post("/api/v1/rounds/" + round + "/reports/final").then().statusCode(409);
        first.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs").then().statusCode(409);
        second.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs").then().statusCode(201)
                .extract().path("role").equals("SECOND_REVIEWER");
        issue(first, "final", "{}");
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        Map<String, Object> fin = documents(first, "/api/v1/rounds/").stream()
                .filter(d -> (code + "-R-F").equals(d.get("reportId"))).findFirst().orElseThrow();
        String text = ReportAssemblerTest.text(first.request().get("/api/v1/rounds/" + round + "/documents/" + fin.get("id"))
                .then().statusCode(200).extract().asByteArray());
        assertThat(text).contains("Test " + first.username()).contains("Test " + second.username())
                .contains("Second reviewer");
    }

    @Test
    void commentsAnswersSignOffsAndIssueRequestsCannotBeChanged() {
        evaluatedRound();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        World.Browser lab = world.signIn(world.user("lab-member", labs[0]));
        issue(coordinator, "preliminary", "{\"version\": 1}");
        coordinator.json().body("{}").post("/api/v1/rounds/" + round + "/reports/comment-period").then().statusCode(200);
        int comment = lab.json().body("{\"body\": \"A comment.\"}").post("/api/v1/my-rounds/" + round + "/comments")
                .then().statusCode(201).extract().path("id");
        coordinator.json().body("{\"body\": \"An answer.\"}")
                .post("/api/v1/rounds/" + round + "/reports/comments/" + comment + "/answers").then().statusCode(201);
        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/sign-offs").then().statusCode(201);
        for (String sql : List.of("UPDATE report_comment SET body = 'changed' WHERE round_id = ?",
                "DELETE FROM report_comment_answer WHERE comment_id IN (SELECT id FROM report_comment WHERE round_id = ?)",
                "UPDATE report_sign_off SET username = 'someone' WHERE round_id = ?",
                "DELETE FROM report_issue WHERE round_id = ?")) {
            org.assertj.core.api.Assertions.assertThatThrownBy(() -> world.sql(sql, round)).as(sql)
                    .isInstanceOf(IllegalStateException.class);
        }
        assertThat(world.text("SELECT body FROM report_comment WHERE round_id = ?", round)).isEqualTo("A comment.");
    }

    @Test
    void aRoundStillOpenForResultsCannotBeReported() {
        long lab = world.laboratory();
        round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.json().body("{\"version\": 1}").post("/api/v1/rounds/" + round + "/reports/preliminary")
                .then().statusCode(409);
    }
}
