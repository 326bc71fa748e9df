package org.roundtable.evaluation;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Publications;
import org.roundtable.testing.World;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.data.Offset.offset;

/**
 * Exports of evaluation runs on real rounds in PostgreSQL: who may read the published run and when, formula-safe
 * CSV, the JSON shape, and the {@code evaluate} input of a past run giving the stored numbers again offline.
 */
@QuarkusTest
class EvaluationExportsTest {

    private static final Actor COORDINATOR = new Actor("exports-test", "coordinator", null);

    /** Constructed Mn data, % m/m (invented for these tests, no source). */
    private static final String[] MN = {"0.742", "0.751", "0.748", "0.739", "0.755", "0.746", "0.744", "0.750",
        "0.747", "0.741", "0.753", "0.745"};

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    Publications publications;

    @Inject
    ExclusionService exclusions;

    private static EvaluationPlan.MeasurandPlan plan(String element, String assignedMethod, String reference,
                                                     String referenceU, String sigmaPt) {
        return new EvaluationPlan.MeasurandPlan(element, assignedMethod, null, reference, referenceU,
                reference == null ? null : "2", null, "FIXED", sigmaPt, null, null, null, null, null, null, "3",
                null, null, null, null, null);
    }

    private long[] labs(int n) {
        long[] labs = new long[n];
        for (int i = 0; i < n; i++) {
            labs[i] = world.laboratory();
        }
        return labs;
    }

    private static List<CSVRecord> csv(String text) throws IOException {
        try (CSVParser parser = CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
                .parse(new StringReader(text))) {
            return parser.getRecords();
        }
    }

    // ---- visibility -----------------------------------------------------------------------------------------

    @Test
    void laboratoriesSeeThePublishedRunFromThePreliminaryReportOnAndAuditorsFromTheFinalOne() throws IOException {
        long[] labs = labs(3);
        long outsider = world.laboratory();
        long round = world.round(RoundState.CLOSED, World.simplePlan("0.10"), Round.LatePolicy.REFUSE, labs);
        String[] values = {"18.12", "18.20", "17.95"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", values[i], null, "spark-oes", false);
        }
        evaluations.run(round, false, COORDINATOR);
        World.Browser member = world.signIn(world.user("lab-member", labs[0]));
        World.Browser manager = world.signIn(world.user("lab-manager", labs[1]));
        World.Browser stranger = world.signIn(world.user("lab-manager", outsider));
        World.Browser auditor = world.signIn(world.user("auditor", null));
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String token = world.apiToken(labs[0], "READ_SCORES");
        String published = "/api/v1/rounds/" + round + "/published/results.json";
        String scores = "/api/v1/my-rounds/" + round + "/scores";

        // nothing issued: everyone but the coordinator's run exports gets "not found", even the coordinator here
        for (World.Browser b : List.of(member, manager, stranger, auditor, coordinator)) {
            b.request().get(published).then().statusCode(404);
        }
        member.request().get(scores).then().statusCode(404);
        given().header("Authorization", "Bearer " + token).get(scores).then().statusCode(404);
        String before = member.request().get(scores).asString();
        String missing = member.request().get("/api/v1/my-rounds/987654321/scores").asString();
        assertThat(before.replaceAll("[0-9a-f]{24}", "")).isEqualTo(missing.replaceAll("[0-9a-f]{24}", ""));

        String preliminary = publications.issueRoundReport(round, 1, ReportStatus.PRELIMINARY);

        JsonNode seen = member.request().get(published).then().statusCode(200).extract().as(JsonNode.class);
        assertThat(seen.path("publication").path("reportId").asText()).isEqualTo(preliminary);
        assertThat(seen.path("publication").path("status").asText()).isEqualTo("PRELIMINARY");
        assertThat(seen.path("measurands").get(0).path("scores")).hasSize(3);
        manager.request().get(published).then().statusCode(200);
        coordinator.request().get(published).then().statusCode(200);
        given().header("Authorization", "Bearer " + token).get(published).then().statusCode(200);
        stranger.request().get(published).then().statusCode(404);
        stranger.request().get(scores).then().statusCode(404);
        auditor.request().get(published).then().statusCode(404);
        auditor.request().get("/api/v1/rounds/" + round + "/published/evaluate-input.csv").then().statusCode(404);

        // the laboratory's own scores, by API token for its LIMS: its own row only
        JsonNode own = given().header("Authorization", "Bearer " + token).get(scores)
                .then().statusCode(200).extract().as(JsonNode.class);
        String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, labs[0]);
        assertThat(own.path("participantCode").asText()).isEqualTo(code);
        assertThat(own.path("evaluationVersion").asInt()).isEqualTo(1);
        assertThat(own.path("reportId").asText()).isEqualTo(preliminary);
        assertThat(own.path("reportStatus").asText()).isEqualTo("PRELIMINARY");
        assertThat(own.path("scores")).singleElement().satisfies(s -> {
            assertThat(s.path("reported").asText()).isEqualTo("18.12");
            assertThat(s.path("element").asText()).isEqualTo("Cr");
            assertThat(s.path("assignedValue").isNumber()).isTrue();
            assertThat(s.path("sigmaPt").asDouble()).isEqualTo(0.10);
            assertThat(s.path("z").isNumber()).isTrue();
        });
        List<CSVRecord> ownCsv = csv(given().header("Authorization", "Bearer " + token).get(scores + ".csv")
                .then().statusCode(200).contentType(org.hamcrest.Matchers.startsWith("text/csv")).extract().asString());
        assertThat(ownCsv).singleElement().satisfies(r -> {
            assertThat(r.get("participant_code")).isEqualTo(code);
            assertThat(r.get("report_id")).isEqualTo(preliminary);
            assertThat(r.get("reported")).isEqualTo("18.12");
        });

        // the final report: auditors too
        String fin = publications.issueRoundReport(round, 1, ReportStatus.FINAL);
        JsonNode audited = auditor.request().get(published).then().statusCode(200).extract().as(JsonNode.class);
        assertThat(audited.path("publication").path("reportId").asText()).isEqualTo(fin);
        auditor.request().get("/api/v1/rounds/" + round + "/published/evaluate-input.csv").then().statusCode(200);
        auditor.request().get(scores).then().statusCode(403);
        stranger.request().get(published).then().statusCode(404);

        // an amendment reporting a re-run: everyone now reads version 2
        world.reportResult(round, labs[2], "Cr", "18.05", null, "spark-oes", false);
        evaluations.run(round, false, COORDINATOR);
        publications.issueRoundReport(round, 2, ReportStatus.AMENDED, fin);
        assertThat(member.request().get(published).then().statusCode(200).extract().path("evaluationVersion")
                .toString()).isEqualTo("2");
        assertThat(auditor.request().get(published).then().statusCode(200).extract().path("evaluationVersion")
                .toString()).isEqualTo("2");
    }

    @Test
    void publishedResultsNameParticipantsByCodeAndNeverALaboratory() {
        long[] labs = labs(3);
        long round = world.round(RoundState.CLOSED, World.simplePlan("0.10"), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", "18.1" + i, "0.2", "xrf", false);
        }
        evaluations.run(round, false, COORDINATOR);
        publications.issueRoundReport(round, 1, ReportStatus.PRELIMINARY);
        World.Browser member = world.signIn(world.user("lab-member", labs[0]));

        String json = member.request().get("/api/v1/rounds/" + round + "/published/results.json")
                .then().statusCode(200).extract().asString();
        String csv = member.request().get("/api/v1/rounds/" + round + "/published/results.csv")
                .then().statusCode(200).extract().asString();
        String input = member.request().get("/api/v1/rounds/" + round + "/published/evaluate-input.csv")
                .then().statusCode(200).extract().asString();

        for (long lab : labs) {
            String name = world.text("SELECT name FROM laboratory WHERE id = ?", lab);
            String organisation = world.text("SELECT organisation FROM laboratory WHERE id = ?", lab);
            for (String body : List.of(json, csv, input)) {
                assertThat(body).doesNotContain(name).doesNotContain(organisation);
            }
        }
        assertThat(json).doesNotContain("laboratoryId").doesNotContain("exports-test");
    }

    // ---- shape and formula safety ----------------------------------------------------------------------------

    @Test
    void theResultsJsonCarriesEveryMeasurandsFiguresAndEveryParticipantsScores() {
        long[] labs = labs(MN.length);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Mn", "CONSENSUS_ALL", null, null, "0.010"))), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], "0.006", "spark-oes", false);
        }
        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        JsonNode export = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.json")
                .then().statusCode(200).extract().as(JsonNode.class);

        assertThat(export.path("roundId").asLong()).isEqualTo(round);
        assertThat(export.path("evaluationVersion").asInt()).isEqualTo(1);
        assertThat(export.path("preview").asBoolean()).isFalse();
        assertThat(export.path("inputsSha256").asText()).isEqualTo(run.run().inputsSha256());
        assertThat(export.path("outputsSha256").asText()).isEqualTo(run.run().outputsSha256());
        assertThat(export.path("publication").isNull()).isTrue();
        assertThat(export.path("evaluateArguments")).extracting(JsonNode::asText).containsExactly("--sigma-pt=Mn=0.01",
                "--minimum-participants=Mn=3");
        JsonNode mn = export.path("measurands").get(0);
        EvaluationViews.MeasurandOutcome stored = run.measurands().get(0);
        for (String field : List.of("element", "itemLabel", "unit", "n", "censored", "excluded", "assignedValueMethod",
                "assignedValue", "assignedValueUncertainty", "sigmaPt", "sigmaPtMethod", "sigmaPtSource", "scoreUsed",
                "scoreUsedReason", "median", "madE", "nIqr", "robustMean", "robustSd", "iterations", "converged",
                "warnings", "methodGroups", "scores")) {
            assertThat(mn.has(field)).as(field).isTrue();
        }
        // doubles exactly as stored (Double.toString reads back to the identical double)
        assertThat(mn.path("assignedValue").asDouble()).isEqualTo(stored.assignedValue());
        assertThat(mn.path("robustSd").asDouble()).isEqualTo(stored.robustSd());
        assertThat(mn.path("scores")).hasSize(MN.length);
        JsonNode score = mn.path("scores").get(0);
        assertThat(score.fieldNames()).toIterable().containsExactly("participantCode", "reported", "methodGroup",
                "value", "z", "zPrime", "zeta", "en", "classification", "excludedReason", "informationOnly", "printed");
        assertThat(score.path("zeta").isNumber()).isTrue();
        // beside the full-precision number, the printed string: scores at the plan's 2 decimals, results at the
        // measurand's 3 reporting digits, statistics at 4
        EvaluationViews.Score first = stored.scores().get(0);
        assertThat(score.path("printed").path("z").asText())
                .isEqualTo(org.roundtable.platform.NumberFormats.plainScore(first.z(), 2));
        assertThat(score.path("printed").path("value").asText()).isEqualTo(score.path("reported").asText());
        assertThat(mn.path("printed").path("robustSd").asText()).matches("0\\.\\d{4}");
        assertThat(mn.path("scoreDecimals").asInt()).isEqualTo(2);
        assertThat(mn.path("informationOnly").asBoolean()).isFalse();
    }

    @Test
    void csvCellsThatASpreadsheetWouldReadAsAFormulaAreNeutralisedAndNegativeScoresStayNumbers() throws IOException {
        long[] labs = labs(4);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Mn", "CONSENSUS_ALL", null, null, "0.010"))), Round.LatePolicy.REFUSE, labs);
        world.reportResult(round, labs[0], "Mn", "0.700", null, "=HYPERLINK(\"x\")", false);
        world.reportResult(round, labs[1], "Mn", "0.750", null, "@SUM(1)", false);
        world.reportResult(round, labs[2], "Mn", "0.752", null, "+spark", false);
        world.reportResult(round, labs[3], "Mn", "0.748", null, "-xrf,\"quoted\"", false);
        evaluations.run(round, false, COORDINATOR);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        Response response = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.csv");
        response.then().statusCode(200).contentType(org.hamcrest.Matchers.startsWith("text/csv"))
                .header("Content-Disposition", org.hamcrest.Matchers.containsString("-v1-results.csv"));
        String body = response.asString();
        assertThat(body).startsWith(String.join(",", EvaluationExports.RESULTS_COLUMNS) + "\r\n");
        List<CSVRecord> rows = csv(body);
        assertThat(rows).hasSize(4);
        Map<String, CSVRecord> byMethod = new HashMap<>();
        rows.forEach(r -> byMethod.put(r.get("method_group"), r));
        assertThat(byMethod).containsOnlyKeys("'=HYPERLINK(\"x\")", "'@SUM(1)", "'+spark", "'-xrf,\"quoted\"");
        // the low result has a negative z: written as a plain number, no apostrophe
        String z = byMethod.get("'=HYPERLINK(\"x\")").get("z");
        assertThat(z).startsWith("-");
        assertThat(Double.parseDouble(z)).isNegative();
        for (CSVRecord r : rows) {
            assertThat(r.size()).isEqualTo(EvaluationExports.RESULTS_COLUMNS.size());
            for (String column : List.of("z", "value", "assigned_value", "sigma_pt", "robust_sd", "n")) {
                Double.parseDouble(r.get(column)); // numbers parse as numbers
            }
        }

        // the evaluate input neutralises the same cells and still runs offline
        String input = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv")
                .then().statusCode(200).extract().asString();
        assertThat(input).contains("'=HYPERLINK(\"\"x\"\")").contains("'@SUM(1)").doesNotContain(",=").doesNotContain(",@");
        assertThat(offline(input, List.of("--sigma-pt=Mn=0.01")).path("measurands").get(0).path("n").asInt()).isEqualTo(4);
    }

    // ---- the evaluate input of a past run ----------------------------------------------------------------------

    @Test
    void theEvaluateInputOfAPastRunGivesItsNumbersOfflineEvenAfterACorrection() throws IOException {
        // World.reportResult gives a laboratory one result per revision: Mn and Cr come from different laboratories
        long[] labs = labs(2 * MN.length + 2);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Cr", "CERTIFIED_REFERENCE", "18.10", "0.08", "0.10"),
                plan("Mn", "CONSENSUS_ALL", null, null, "0.010"))), Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED, labs);
        for (int i = 0; i < MN.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], i % 3 == 0 ? "0.006" : null, i % 2 == 0 ? "spark-oes" : "xrf",
                    false);
            world.reportResult(round, labs[MN.length + i], "Cr", "18.0" + i % 10, i % 4 == 0 ? "0.15" : null,
                    "spark-oes", false);
        }
        world.reportResult(round, labs[2 * MN.length], "Mn", "<0.5", null, "spark-oes", false);
        world.reportResult(round, labs[2 * MN.length + 1], "Mn", "0.790", null, "spark-oes", true); // late, not scored
        EvaluationViews.Run first = evaluations.run(round, false, COORDINATOR);
        EvaluationViews.MeasurandOutcome mn = first.measurands().get(1);
        assertThat(mn.n()).isEqualTo(MN.length);
        assertThat(mn.censored()).isEqualTo(1);
        assertThat(mn.excluded()).isEqualTo(1);
        assertThat(mn.scoreUsed()).isEqualTo("z");
        assertThat(first.measurands().get(0).scoreUsed()).isEqualTo("zPrime");

        // a correction after the run: the current results change, the run's inputs do not
        world.reportResult(round, labs[0], "Mn", "0.760", "0.006", "spark-oes", false);
        evaluations.run(round, false, COORDINATOR);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        Response response = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv");
        response.then().statusCode(200);
        String input = response.asString();
        List<String> arguments = Arrays.asList(response.header("Evaluate-Arguments").split(" "));
        assertThat(input).startsWith(EvaluationExports.EVALUATE_HEADER + "\r\n").doesNotContain("0.790")
                .doesNotContain("0.760");
        assertThat(arguments).containsExactly("--sigma-pt=Cr=0.1", "--assigned=Cr=18.1:0.08", "--minimum-participants=Cr=3",
                "--sigma-pt=Mn=0.01", "--minimum-participants=Mn=3");
        assertSameNumbers(offline(input, arguments), first);

        // the second run's input has the correction and gives the second run's numbers
        Response second = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/2/evaluate-input.csv");
        assertThat(second.asString()).contains("0.760");
        assertSameNumbers(offline(second.asString(), Arrays.asList(second.header("Evaluate-Arguments").split(" "))),
                evaluations.run(round, 2));

        // the same for a laboratory once the second run is published
        publications.issueRoundReport(round, 2, ReportStatus.PRELIMINARY);
        String token = world.apiToken(labs[1], "READ_SCORES");
        assertThat(given().header("Authorization", "Bearer " + token)
                .get("/api/v1/rounds/" + round + "/published/evaluate-input.csv").then().statusCode(200).extract()
                .asString()).isEqualTo(second.asString());
    }

    @Test
    void theEvaluateInputOfARunWithABlunderLeavesItOutAndGivesTheRunsNumbersEvenAfterTheMarkIsWithdrawn()
            throws IOException {
        long[] labs = labs(MN.length + 1);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Mn", "CONSENSUS_ALL", null, null, "0.010"))), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < MN.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }
        long blunder = labs[MN.length];
        world.reportResult(round, blunder, "Mn", "7.47", null, "spark-oes", false);
        String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, blunder);
        ExclusionService.Exclusion mark = exclusions.mark(round, new ExclusionService.MarkRequest(code, "Mn", "A",
                "reported in mg/g instead of %"), COORDINATOR);
        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);
        assertThat(run.measurands().get(0).n()).isEqualTo(MN.length);
        // the mark is withdrawn after the run: the run's recorded marks still rebuild its inputs
        exclusions.withdraw(round, mark.id(), new ExclusionService.WithdrawalRequest("checked with the laboratory"), COORDINATOR);

        Response response = world.signIn(world.user("coordinator", null)).request()
                .get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv");
        response.then().statusCode(200);
        assertThat(response.asString()).as("the blunder is not an input of the consensus").doesNotContain("7.47");
        assertSameNumbers(offline(response.asString(), Arrays.asList(response.header("Evaluate-Arguments").split(" "))),
                run, MN.length);
    }

    @Test
    void aRunWhoseInputsCannotBeRebuiltIsRefusedRatherThanExportedWrong() {
        long[] labs = labs(3);
        long round = world.round(RoundState.CLOSED, World.simplePlan("0.10"), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", "18.1" + i, null, "xrf", false);
        }
        evaluations.run(round, false, COORDINATOR);
        // the round's late-result policy is part of the inputs; changing it afterwards breaks the proof
        world.sql("UPDATE round SET late_policy = 'ACCEPT_FLAGGED_SCORED' WHERE id = ?", round);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        JsonNode problem = coordinator.request().accept("text/csv")
                .get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv")
                .then().statusCode(409).extract().as(JsonNode.class);
        assertThat(problem.path("detail").asText()).contains("inputs hash differs");
        coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.csv").then().statusCode(200);
    }

    @Test
    void coordinatorsExportPreviewsAndOthersCannot() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        world.submitCr(round, lab, "18.12");
        evaluations.run(round, true, COORDINATOR);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        World.Browser member = world.signIn(world.user("lab-member", lab));

        JsonNode preview = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.json")
                .then().statusCode(200).extract().as(JsonNode.class);
        assertThat(preview.path("preview").asBoolean()).isTrue();
        assertThat(coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv")
                .then().statusCode(200).extract().asString()).contains(",Cr,%,18.12");
        coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/2/results.json").then().statusCode(404);
        member.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.csv").then().statusCode(403);
        member.request().get("/api/v1/rounds/" + round + "/published/results.csv").then().statusCode(404);
    }

    // ---- helpers ----------------------------------------------------------------------------------------------

    private static JsonNode offline(String csv, List<String> arguments) throws IOException {
        Path file = Files.createTempFile("evaluate-input-", ".csv");
        try {
            Files.writeString(file, csv, StandardCharsets.UTF_8);
            List<String> args = new ArrayList<>(arguments);
            args.add(file.toString());
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int exit = EvaluateCommand.run(args.toArray(String[]::new), new PrintStream(out, true, StandardCharsets.UTF_8),
                    new PrintStream(err, true, StandardCharsets.UTF_8));
            assertThat(exit).as(err.toString(StandardCharsets.UTF_8)).isZero();
            return org.roundtable.testing.EvaluateOutput.read(out.toString(StandardCharsets.UTF_8));
        } finally {
            Files.deleteIfExists(file);
        }
    }

    /** Every figure and score of the stored run equals the offline command's, to 1e-12 relative. */
    private static void assertSameNumbers(JsonNode offline, EvaluationViews.Run run) {
        assertSameNumbers(offline, run, 2 * MN.length);
    }

    private static void assertSameNumbers(JsonNode offline, EvaluationViews.Run run, int fewestCompared) {
        Map<String, JsonNode> measurands = new HashMap<>();
        offline.path("measurands").forEach(m -> measurands.put(m.path("measurand").asText(), m));
        assertThat(measurands).hasSameSizeAs(run.measurands());
        int compared = 0;
        for (EvaluationViews.MeasurandOutcome stored : run.measurands()) {
            JsonNode o = measurands.get(stored.element());
            assertThat(o).as(stored.element()).isNotNull();
            assertThat(o.path("n").asInt()).isEqualTo(stored.n());
            assertThat(o.path("censored").asInt()).isEqualTo(stored.censored());
            assertThat(text(o, "scoreUsed")).as(stored.element()).isEqualTo(stored.scoreUsed());
            assertRelative(o, "assignedValue", stored.assignedValue());
            assertRelative(o, "assignedValueUncertainty", stored.assignedValueUncertainty());
            assertRelative(o, "sigmaPt", stored.sigmaPt());
            assertRelative(o, "median", stored.median());
            assertRelative(o, "madE", stored.madE());
            assertRelative(o, "nIqr", stored.nIqr());
            assertRelative(o, "robustMean", stored.robustMean());
            assertRelative(o, "robustSd", stored.robustSd());
            Map<String, JsonNode> scores = new HashMap<>();
            o.path("scores").forEach(s -> scores.put(s.path("participant").asText(), s));
            for (EvaluationViews.Score s : stored.scores()) {
                if (s.excludedReason() != null) {
                    assertThat(scores).doesNotContainKey(s.participantCode());
                    continue;
                }
                JsonNode os = scores.get(s.participantCode());
                assertThat(os).as(s.participantCode()).isNotNull();
                assertRelative(os, "z", s.z());
                assertRelative(os, "zPrime", s.zPrime());
                assertRelative(os, "zeta", s.zeta());
                assertRelative(os, "en", s.en());
                assertThat(text(os, "classification")).isEqualTo(s.classification());
                compared++;
            }
        }
        assertThat(compared).isGreaterThanOrEqualTo(fewestCompared);
    }

    private static String text(JsonNode node, String field) {
        JsonNode value = node.path(field);
        return value.isNull() || value.isMissingNode() ? null : value.asText();
    }

    private static void assertRelative(JsonNode node, String field, Double expected) {
        JsonNode actual = node.path(field);
        if (expected == null) {
            assertThat(actual.isNull() || actual.isMissingNode()).as(field).isTrue();
            return;
        }
        assertThat(actual.isNumber()).as(field).isTrue();
        assertThat(actual.asDouble()).as(field).isCloseTo(expected, offset(Math.abs(expected) * 1e-12));
    }
}
