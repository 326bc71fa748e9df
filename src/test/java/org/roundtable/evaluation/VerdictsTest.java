package org.roundtable.evaluation;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

/**
 * Verdicts an assessor can re-check by hand, on PostgreSQL through the server and again through {@code evaluate} on
 * the run's export: scores classified as printed, the exact z/z′ choice, small rounds not scored (or scored for
 * information only, without a classification anywhere), and printed decimals in the exports.
 *
 * <p>Check values: results exactly on ±2σpt and ±3σpt in decimal (hand arithmetic; in binary (0.760 − 0.750)/0.005
 * = 2.0000000000000018 and (0.735 − 0.750)/0.005 = −3.0000000000000027, python3); bands ISO/IEC 17043:2010 Annex B;
 * u(x_pt) ≤ 0.3σpt ISO 13528:2015 9.2.1. Results invented for these tests.
 */
@QuarkusTest
class VerdictsTest {

    private static final Actor COORDINATOR = new Actor("verdicts-test", "coordinator", null);

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    private long[] labs(int n) {
        long[] labs = new long[n];
        for (int i = 0; i < n; i++) {
            labs[i] = world.laboratory();
        }
        return labs;
    }

    private static EvaluationPlan.MeasurandPlan reference(String value, String expandedU, String k, String sigmaPt,
                                                          String scoreDecimals) {
        return new EvaluationPlan.MeasurandPlan("Mn", "CERTIFIED_REFERENCE", null, value, expandedU, k, null, "FIXED",
                sigmaPt, null, null, null, null, null, null, null, null, null, null, null, null, scoreDecimals, null,
                null, null);
    }

    private static EvaluationPlan.MeasurandPlan consensus(String sigmaMethod, String sigmaPt, String provisional,
                                                          String belowMinimum) {
        return new EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null, null, null, null, sigmaMethod,
                sigmaPt, null, null, null, null, provisional, null, null, null, null, null, null, null, null, null,
                null, belowMinimum);
    }

    private static EvaluationViews.Score score(EvaluationViews.MeasurandOutcome m, String reported) {
        return m.scores().stream().filter(s -> s.reported().equals(reported)).findFirst().orElseThrow();
    }

    @Test
    void resultsExactlyOnTwoAndThreeSigmaAreClassifiedAsPrintedByTheServerAndByEvaluate() throws IOException {
        long[] labs = labs(4);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                reference("0.750", "0.001", "2", "0.005", null))), Round.LatePolicy.REFUSE, labs);
        String[] values = {"0.760", "0.735", "0.765", "0.740"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, "spark-oes", false);
        }
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.scoreUsed()).isEqualTo("z");
        assertThat(score(mn, "0.760").z()).isGreaterThan(2.0);
        assertThat(score(mn, "0.760").classification()).isEqualTo("satisfactory");
        assertThat(score(mn, "0.735").classification()).isEqualTo("unsatisfactory");
        assertThat(score(mn, "0.765").classification()).isEqualTo("unsatisfactory");
        assertThat(score(mn, "0.740").classification()).isEqualTo("satisfactory");
        assertThat(mn.rules().scoreDecimals()).isEqualTo(2);

        JsonNode offline = roundTrip(round, mn);
        assertThat(offline.path("scoreDecimals").asInt()).isEqualTo(2);
    }

    @Test
    void uOfAReferenceValueExactlyThreeTenthsOfSigmaPtGivesZOnTheServerAndInEvaluate() throws IOException {
        long[] labs = labs(2);
        // U = 0.0108 at k = 2: u = 0.0054 = 0.3 · 0.018 in decimal; 0.0054/0.018 = 0.30000000000000004 in binary
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                reference("0.80", "0.0108", "2", "0.018", "3"))), Round.LatePolicy.REFUSE, labs);
        world.reportResult(round, labs[0], "Mn", "0.836", null, "spark-oes", false);
        world.reportResult(round, labs[1], "Mn", "0.800", null, "spark-oes", false);
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.scoreUsed()).isEqualTo("z");
        assertThat(score(mn, "0.836").classification()).isEqualTo("satisfactory");
        assertThat(mn.rules().scoreDecimals()).isEqualTo(3);
        JsonNode offline = roundTrip(round, mn);
        assertThat(offline.path("scoreUsed").asText()).isEqualTo("z");
        JsonNode high = null;
        for (JsonNode o : offline.path("scores")) {
            if (o.path("reported").asText().equals("0.836")) {
                high = o;
            }
        }
        assertThat(high.path("printed").path("z").asText()).isEqualTo("2.000");
    }

    @Test
    void aRoundOfThreeIsNotScoredAgainstItsOwnConsensusAndTheRunSaysWhy() throws IOException {
        long[] labs = labs(3);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                consensus("ROBUST_SD_OF_ROUND", null, "0.010", null))), Round.LatePolicy.REFUSE, labs);
        String[] values = {"0.742", "0.751", "7.48"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, "spark-oes", false);
        }
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.warnings()).filteredOn(w -> w.code().equals("below-minimum")).singleElement()
                .satisfies(w -> assertThat(w.message()).contains("reference or certified value", "fixed σpt",
                        "information only"));
        assertThat(mn.scores()).allSatisfy(s -> {
            assertThat(s.z()).isNull();
            assertThat(s.classification()).isNull();
        });
        assertThat(world.text("SELECT count(*) FROM participant_score ps JOIN evaluation_run r ON r.id = ps.run_id"
                + " WHERE r.round_id = ? AND ps.classification IS NOT NULL", round)).isEqualTo("0");
        roundTrip(round, mn);
    }

    @Test
    void informationOnlyScoresCarryNoClassificationInTheDatabaseTheJsonOrTheCsv() throws IOException {
        long[] labs = labs(4);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                consensus("FIXED", "0.010", null, "INFORMATION_ONLY"))), Round.LatePolicy.REFUSE, labs);
        String[] values = {"0.742", "0.751", "0.748", "0.790"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, "spark-oes", false);
        }
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.rules().informationOnly()).isTrue();
        assertThat(mn.scores()).allSatisfy(s -> {
            assertThat(s.z()).isNotNull();
            assertThat(s.classification()).isNull();
        });
        assertThat(world.text("SELECT count(*) FROM participant_score ps JOIN evaluation_run r ON r.id = ps.run_id"
                + " WHERE r.round_id = ? AND ps.classification IS NOT NULL", round)).isEqualTo("0");
        assertThat(world.text("SELECT bool_and((me.rules_json::jsonb ->> 'informationOnly')::boolean)"
                + " FROM measurand_evaluation me JOIN evaluation_run r ON r.id = me.run_id WHERE r.round_id = ?", round))
                .isEqualTo("t");

        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        JsonNode json = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.json")
                .then().statusCode(200).extract().as(JsonNode.class);
        JsonNode m = json.path("measurands").get(0);
        assertThat(m.path("informationOnly").asBoolean()).isTrue();
        m.path("scores").forEach(s -> {
            assertThat(s.path("classification").isNull()).isTrue();
            assertThat(s.path("informationOnly").asBoolean()).isTrue();
        });
        assertThat(json.path("evaluateArguments")).extracting(JsonNode::asText).contains("--information-only=Mn");

        String csv = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.csv")
                .then().statusCode(200).extract().asString();
        for (CSVRecord r : csv(csv)) {
            assertThat(r.get("classification")).isEmpty();
            assertThat(r.get("information_only")).isEqualTo("true");
            // printed at the plan's 2 score decimals, statistics at reporting digits (3) + 1, no exponent
            assertThat(r.get("z")).matches("-?\\d+\\.\\d{2}");
            assertThat(r.get("assigned_value")).matches("0\\.\\d{4}");
            assertThat(r.get("value")).matches("0\\.\\d{3}");
        }
        JsonNode offline = roundTrip(round, mn);
        assertThat(offline.path("informationOnly").asBoolean()).isTrue();
    }

    // ---- helpers ----------------------------------------------------------------------------------------------

    private static List<CSVRecord> csv(String text) throws IOException {
        try (CSVParser parser = CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get()
                .parse(new StringReader(text))) {
            return parser.getRecords();
        }
    }

    /**
     * Runs {@code evaluate} on the run's exported input with the exported arguments and checks it gives the stored
     * numbers and verdicts.
     */
    private JsonNode roundTrip(long round, EvaluationViews.MeasurandOutcome stored) throws IOException {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String input = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/evaluate-input.csv")
                .then().statusCode(200).extract().asString();
        JsonNode export = coordinator.request().get("/api/v1/rounds/" + round + "/evaluations/1/results.json")
                .then().statusCode(200).extract().as(JsonNode.class);
        List<String> arguments = new ArrayList<>();
        export.path("evaluateArguments").forEach(a -> arguments.add(a.asText()));
        Path file = Files.createTempFile("evaluate-input-", ".csv");
        try {
            Files.writeString(file, input, StandardCharsets.UTF_8);
            arguments.add(file.toString());
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int exit = EvaluateCommand.run(arguments.toArray(String[]::new),
                    new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
            assertThat(exit).as(err.toString(StandardCharsets.UTF_8)).isZero();
            JsonNode offline = org.roundtable.testing.EvaluateOutput.read(out.toString(StandardCharsets.UTF_8)).path("measurands").get(0);
            Map<String, JsonNode> byParticipant = new HashMap<>();
            offline.path("scores").forEach(s -> byParticipant.put(s.path("participant").asText(), s));
            for (EvaluationViews.Score s : stored.scores()) {
                JsonNode o = byParticipant.get(s.participantCode());
                assertThat(o.path("classification").isNull() ? null : o.path("classification").asText())
                        .as(s.participantCode()).isEqualTo(s.classification());
                if (s.z() == null) {
                    assertThat(o.path("z").isNull()).isTrue();
                } else {
                    assertThat(o.path("z").asDouble()).isEqualTo(s.z());
                }
            }
            return offline;
        } finally {
            Files.deleteIfExists(file);
        }
    }
}
