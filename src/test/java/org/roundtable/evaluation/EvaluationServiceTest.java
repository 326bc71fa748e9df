package org.roundtable.evaluation;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;
import static org.assertj.core.data.Offset.offset;

/** Evaluation runs on real rounds in PostgreSQL: the plan applied, stored immutably, and equal to the offline command. */
@QuarkusTest
class EvaluationServiceTest {

    private static final Actor COORDINATOR = new Actor("evaluation-test", "coordinator", null);

    /**
     * Constructed Mn data, low-alloy steel, % m/m, p = 20. Check values below are CALC: computed independently, no
     * published source (Algorithm A per ISO 13528:2015 Annex C.3, iterated to the fixed point, tolerance 1e-10·s*).
     */
    private static final String[] MN = {"0.742", "0.751", "0.748", "0.739", "0.755", "0.746", "0.744", "0.750", "0.747",
        "0.741", "0.753", "0.745", "0.749", "0.738", "0.752", "0.743", "0.746", "0.790", "0.772", "0.748"};

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    EvaluationJobs evaluationJobs;

    @Inject
    org.roundtable.job.JobRunner runner;

    private static EvaluationPlan.MeasurandPlan plan(String element, String assignedMethod, String methodGroup,
                                                     String reference, String referenceU, String sigmaPt,
                                                     String allowedGroupDifference) {
        return new EvaluationPlan.MeasurandPlan(element, assignedMethod, methodGroup, reference, referenceU,
                reference == null ? null : "2", null, "FIXED", sigmaPt, null, null, null, null, null, null, "3",
                allowedGroupDifference, null, null, null, null);
    }

    private static EvaluationPlan consensusMn(String sigmaPt) {
        return new EvaluationPlan(List.of(plan("Mn", "CONSENSUS_ALL", null, null, null, sigmaPt, null)));
    }

    private long[] labs(int n) {
        long[] labs = new long[n];
        for (int i = 0; i < n; i++) {
            labs[i] = world.laboratory();
        }
        return labs;
    }

    private static EvaluationViews.Score scoreOf(EvaluationViews.MeasurandOutcome m, long laboratoryId) {
        return m.scores().stream().filter(s -> s.laboratoryId() == laboratoryId).findFirst().orElseThrow();
    }

    @Test
    void theConstructedMnDataReproduceTheirCheckValues() {
        long[] labs = labs(MN.length);
        long round = world.round(RoundState.CLOSED, consensusMn("0.010"), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }

        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);

        assertThat(run.run().version()).isEqualTo(1);
        assertThat(run.run().preview()).isFalse();
        assertThat(run.measurands()).hasSize(1);
        EvaluationViews.MeasurandOutcome mn = run.measurands().get(0);
        assertThat(mn.n()).isEqualTo(20);
        // CALC (see MN): median 0.7475, MADe 0.005932 (rel 1e-9)
        assertThat(mn.median()).isCloseTo(0.7475, within(0.7475 * 1e-9));
        assertThat(mn.madE()).isCloseTo(0.005932, within(0.005932 * 1e-9));
        // CALC (see MN): x* 0.7475547640, s* 0.0062873256, 28 iterations, u(x_pt) = 1.25·s*/√p 0.0017573609 (rel 1e-8)
        assertThat(mn.assignedValue()).isCloseTo(0.7475547640, within(0.7475547640 * 1e-8));
        assertThat(mn.robustSd()).isCloseTo(0.0062873256, within(0.0062873256 * 1e-8));
        assertThat(mn.iterations()).isEqualTo(28);
        assertThat(mn.converged()).isTrue();
        // the check value has 8 significant figures: rel 1e-7
        assertThat(mn.assignedValueUncertainty()).isCloseTo(0.0017573609, within(0.0017573609 * 1e-7));
        // u(x_pt) 0.00176 ≤ 0.3·0.010: z is used (ISO 13528:2015, 9.2.1)
        assertThat(mn.scoreUsed()).isEqualTo("z");
        // CALC: z = (0.790 − 0.7475547640)/0.010 = 4.24452360
        EvaluationViews.Score high = scoreOf(mn, labs[17]);
        assertThat(high.z()).isCloseTo(4.24452360, within(1e-6));
        assertThat(high.classification()).isEqualTo("unsatisfactory");
        assertThat(scoreOf(mn, labs[0]).classification()).isEqualTo("satisfactory");
        assertThat(mn.methodGroups()).singleElement().satisfies(g -> assertThat(g.n()).isEqualTo(20));

        // stored as one audit event carrying the outputs hash
        assertThat(world.text("SELECT after_hash FROM audit_event WHERE action = 'evaluation.run' AND object_id = ?",
                Long.toString(round))).isEqualTo(run.run().outputsSha256());
    }

    @Test
    void aCertifiedValueGivesZetaAndEn() {
        long[] labs = labs(2);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Mn", "CERTIFIED_REFERENCE", null, "0.750", "0.004", "0.010", null))), Round.LatePolicy.REFUSE, labs);
        world.reportResult(round, labs[0], "Mn", "0.760", "0.006", "spark-oes", false);
        world.reportResult(round, labs[1], "Mn", "0.745", "0.004", "xrf", false);

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.assignedValue()).isEqualTo(0.750);
        assertThat(mn.assignedValueUncertainty()).isCloseTo(0.002, within(1e-15));
        // CALC: ζ = (x − x_pt)/√((U/2)² + u²(x_pt)), En = (x − x_pt)/√(U² + U²(x_pt)) (ISO 13528:2015, 9.5 and 9.6)
        EvaluationViews.Score a = scoreOf(mn, labs[0]);
        assertThat(a.zeta()).isCloseTo(2.7735009811261477, within(1e-12));
        assertThat(a.en()).isCloseTo(1.3867504905630739, within(1e-12));
        assertThat(a.z()).isCloseTo(1.0, within(1e-12));
        EvaluationViews.Score b = scoreOf(mn, labs[1]);
        assertThat(b.zeta()).isCloseTo(-1.7677669529663704, within(1e-12));
        assertThat(b.en()).isCloseTo(-0.8838834764831852, within(1e-12));
        assertThat(mn.warnings()).extracting(EvaluationViews.Warning::code).doesNotContain("zeta-en-biased")
                .contains("few-participants");
    }

    @Test
    void censoredResultsAreLeftOutOfTheStatisticsAndClassified() {
        long[] labs = labs(12);
        long round = world.round(RoundState.CLOSED, consensusMn("0.010"), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < 10; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }
        world.reportResult(round, labs[10], "Mn", "<0.5", null, "spark-oes", false);
        world.reportResult(round, labs[11], "Mn", "<0.9", null, "spark-oes", false);

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        assertThat(mn.n()).isEqualTo(10);
        assertThat(mn.censored()).isEqualTo(2);
        assertThat(mn.warnings()).extracting(EvaluationViews.Warning::code).doesNotContain("censored-share");
        EvaluationViews.Score low = scoreOf(mn, labs[10]);
        assertThat(low.z()).isNull();
        assertThat(low.value()).isNull();
        assertThat(low.reported()).isEqualTo("<0.5");
        // a limit below x_pt contradicts it; one above is consistent with it
        assertThat(low.classification()).isEqualTo("inconsistent");
        assertThat(scoreOf(mn, labs[11]).classification()).isEqualTo("consistent");
    }

    @Test
    void aMethodGroupConsensusScoresEveryoneAgainstThatGroup() {
        long[] labs = labs(5);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Mn", "CONSENSUS_METHOD_GROUP", "SPARK_OES", null, null, "0.5", "0.3"))),
                Round.LatePolicy.REFUSE, labs);
        String[] values = {"10.1", "10.2", "10.6", "11.0", "11.2"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, i < 3 ? "spark-oes" : "xrf", false);
        }

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        // CALC: Algorithm A of 10.1 10.2 10.6 (the spark OES group): x* 10.3, s* 0.3000281987 (rel 1e-8)
        assertThat(mn.assignedValue()).isCloseTo(10.3, within(10.3 * 1e-8));
        // CALC: u(x_pt) = 1.25·0.3000281987/√3 = 0.2165267016
        assertThat(mn.assignedValueUncertainty()).isCloseTo(0.2165267016, within(1e-9));
        // u(x_pt) > 0.3·0.5, so z′ classifies; CALC: z′ of 11.0 = 0.7/√(0.25 + u²) = 1.28470904
        assertThat(mn.scoreUsed()).isEqualTo("zPrime");
        assertThat(scoreOf(mn, labs[3]).zPrime()).isCloseTo(1.28470904, within(1e-7));
        assertThat(mn.methodGroups()).extracting(EvaluationViews.MethodGroupStatistics::methodGroup)
                .containsExactly("spark-oes", "xrf");
        assertThat(mn.warnings()).extracting(EvaluationViews.Warning::code)
                .contains("subset-consensus", "method-groups-differ", "uncertainty-of-assigned-value-large");
    }

    @Test
    void horwitzSigmaPtWithTheThompsonModificationOnACertifiedValue() {
        long[] labs = labs(2);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(new EvaluationPlan.MeasurandPlan("Mn",
                "CERTIFIED_REFERENCE", null, "0.750", "0.004", "2", null, "HORWITZ_THOMPSON", null, null, null, null,
                null, null, null, null, null, null, null, null, null))), Round.LatePolicy.REFUSE, labs);
        world.reportResult(round, labs[0], "Mn", "0.800", null, "spark-oes", false);
        world.reportResult(round, labs[1], "Mn", "0.750", null, "spark-oes", false);

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        // CALC: Horwitz σ = 0.02·c^0.8495 with c = 0.0075 (Thompson 2000: 1.2e-7 ≤ c ≤ 0.138), in %: 0.0313252495
        assertThat(mn.sigmaPt()).isCloseTo(0.031325249511362306, within(1e-15));
        assertThat(mn.sigmaPtMethod()).isEqualTo("HORWITZ_THOMPSON");
        // CALC: z = 0.050/0.0313252495 = 1.59615648
        assertThat(mn.scoreUsed()).isEqualTo("z");
        assertThat(scoreOf(mn, labs[0]).z()).isCloseTo(1.5961564801539418, within(1e-12));
    }

    @Test
    void anExpertConsensusWithSigmaPtAsAPercentageOfIt() {
        long[] labs = labs(4);
        List<String> experts = List.of(Long.toString(labs[0]), Long.toString(labs[1]), Long.toString(labs[2]));
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(new EvaluationPlan.MeasurandPlan("Mn",
                "EXPERT_CONSENSUS", null, null, null, null, experts, "PERCENT_OF_ASSIGNED", null, "5", null, null,
                null, "0.5", null, "3", null, null, null, null, null))), Round.LatePolicy.REFUSE, labs);
        String[] values = {"10.1", "10.2", "10.6", "11.0"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, "spark-oes", false);
        }

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        // CALC: Algorithm A of the experts' 10.1 10.2 10.6: x* 10.3 (rel 1e-8); σpt = 5 % of it = 0.515
        assertThat(mn.assignedValue()).isCloseTo(10.3, within(10.3 * 1e-8));
        assertThat(mn.sigmaPt()).isCloseTo(0.515, within(1e-7));
        // CALC: u(x_pt) = 0.2165267016 > 0.3·σpt, so z′ = 0.7/√(0.515² + u²) = 1.25298255
        assertThat(mn.scoreUsed()).isEqualTo("zPrime");
        assertThat(scoreOf(mn, labs[3]).zPrime()).isCloseTo(1.2529825547, within(1e-6));
    }

    @Test
    void aPlannedMeasurandWithoutResultsIsReportedWithoutScores() {
        long lab = world.laboratory();
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(
                plan("Cr", "CONSENSUS_ALL", null, null, null, "0.10", null),
                plan("Mn", "CONSENSUS_ALL", null, null, null, "0.010", null))), Round.LatePolicy.REFUSE, lab);
        world.reportResult(round, lab, "Mn", "0.745", null, "spark-oes", false);

        List<EvaluationViews.MeasurandOutcome> measurands = evaluations.run(round, false, COORDINATOR).measurands();

        assertThat(measurands).extracting(EvaluationViews.MeasurandOutcome::element).containsExactly("Cr", "Mn");
        EvaluationViews.MeasurandOutcome cr = measurands.get(0);
        assertThat(cr.n()).isZero();
        assertThat(cr.scores()).isEmpty();
        assertThat(cr.assignedValue()).isNull();
        assertThat(cr.warnings()).extracting(EvaluationViews.Warning::code).contains("too-few-values", "no-assigned-value");
    }

    @Test
    void aPreviewIsForCoordinatorsOnlyAndARunNeedsAClosedRound() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        world.submitCr(round, lab, "18.12");
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        coordinator.json().body("{\"preview\":false}").post("/api/v1/rounds/" + round + "/evaluations")
                .then().statusCode(409);
        io.restassured.response.Response queued = coordinator.json().body("{\"preview\":true}")
                .post("/api/v1/rounds/" + round + "/evaluations");
        queued.then().statusCode(202);
        long jobId = queued.jsonPath().getLong("jobId");
        assertThat(queued.header("Location")).endsWith("/api/v1/rounds/" + round + "/evaluation-jobs/" + jobId);
        assertThat(queued.jsonPath().getString("status")).isEqualTo("QUEUED");
        EvaluationJobsTest.runUntilFinished(runner, evaluationJobs, round, jobId);
        JsonNode job = coordinator.json().get("/api/v1/rounds/" + round + "/evaluation-jobs/" + jobId)
                .then().statusCode(200).extract().as(JsonNode.class);
        assertThat(job.path("status").asText()).isEqualTo("SUCCEEDED");
        assertThat(job.path("version").asInt()).isEqualTo(1);
        JsonNode preview = coordinator.json().get("/api/v1/rounds/" + round + "/evaluations/1")
                .then().statusCode(200).extract().as(JsonNode.class);
        assertThat(preview.path("run").path("preview").asBoolean()).isTrue();
        assertThat(preview.path("measurands").get(0).path("scores").get(0).path("reported").asText()).isEqualTo("18.12");
        coordinator.json().get("/api/v1/rounds/" + round + "/evaluations").then().statusCode(200);
        coordinator.json().get("/api/v1/rounds/" + round + "/evaluations/1").then().statusCode(200);

        String token = world.apiToken(lab);
        given().header("Authorization", "Bearer " + token).get("/api/v1/rounds/" + round + "/evaluations/1")
                .then().statusCode(403);
        given().header("Authorization", "Bearer " + token).get("/api/v1/rounds/" + round + "/evaluation-jobs/" + jobId)
                .then().statusCode(403);
        given().header("Authorization", "Bearer " + token).get("/api/v1/rounds/" + round + "/evaluations")
                .then().statusCode(403);
        assertThat(world.text("SELECT action FROM audit_event WHERE action LIKE 'evaluation.%' AND object_id = ?",
                Long.toString(round))).isEqualTo("evaluation.preview");
    }

    @Test
    void aReRunMakesANewVersionAndLeavesTheOldOneAlone() {
        long[] labs = labs(4);
        long round = world.round(RoundState.CLOSED, consensusMn("0.010"), Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED, labs);
        for (int i = 0; i < 3; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }
        world.reportResult(round, labs[3], "Mn", "0.760", null, "spark-oes", true);
        EvaluationViews.Run first = evaluations.run(round, false, COORDINATOR);
        EvaluationViews.MeasurandOutcome mn = first.measurands().get(0);
        assertThat(mn.n()).isEqualTo(3);
        assertThat(mn.excluded()).isEqualTo(1);
        assertThat(scoreOf(mn, labs[3]).excludedReason()).isEqualTo(EvaluationService.EXCLUDED_LATE);
        assertThat(scoreOf(mn, labs[3]).z()).isNull();

        // a confirmed correction changes one result; the re-run is version 2
        world.reportResult(round, labs[0], "Mn", "0.745", null, "spark-oes", false);
        EvaluationViews.Run second = evaluations.run(round, false, COORDINATOR);

        assertThat(second.run().version()).isEqualTo(2);
        assertThat(second.run().inputsSha256()).isNotEqualTo(first.run().inputsSha256());
        assertThat(second.run().outputsSha256()).isNotEqualTo(first.run().outputsSha256());
        EvaluationViews.Run storedFirst = evaluations.run(round, 1);
        assertThat(storedFirst.run().outputsSha256()).isEqualTo(first.run().outputsSha256());
        assertThat(EvaluationService.outputsSha256(storedFirst.measurands())).isEqualTo(first.run().outputsSha256());
        assertThat(storedFirst.measurands()).isEqualTo(first.measurands());
        assertThat(evaluations.runs(round)).extracting(EvaluationViews.RunSummary::version).containsExactly(1, 2);

        // append-only for the application's role
        assertThatThrownBy(() -> world.sql("UPDATE participant_score SET z = 0 WHERE laboratory_id = ?", labs[1]))
                .isInstanceOf(IllegalStateException.class);
        assertThatThrownBy(() -> world.sql("DELETE FROM evaluation_run WHERE round_id = ?", round))
                .isInstanceOf(IllegalStateException.class);
    }

    @Test
    void theExportedRoundGivesTheSameNumbersWithTheOfflineCommand() throws Exception {
        long[] labs = labs(MN.length + 1);
        long round = world.round(RoundState.CLOSED, consensusMn("0.010"), Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < MN.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], i % 3 == 0 ? "0.006" : null, i % 2 == 0 ? "spark-oes" : "xrf",
                    false);
        }
        world.reportResult(round, labs[MN.length], "Mn", "<0.5", null, "spark-oes", false);
        EvaluationViews.MeasurandOutcome stored = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        Path csv = Files.createTempFile("round-", ".csv");
        try {
            Files.writeString(csv, evaluations.exportCsv(round), StandardCharsets.UTF_8);
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int exit = EvaluateCommand.run(new String[]{"--sigma-pt", "Mn=0.010", csv.toString()},
                    new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
            assertThat(exit).as(err.toString(StandardCharsets.UTF_8)).isZero();
            JsonNode offline = org.roundtable.testing.EvaluateOutput.read(out.toString(StandardCharsets.UTF_8)).path("measurands").get(0);

            assertThat(offline.path("n").asInt()).isEqualTo(stored.n());
            assertThat(offline.path("censored").asInt()).isEqualTo(1);
            assertRelative(offline.path("assignedValue").asDouble(), stored.assignedValue());
            assertRelative(offline.path("assignedValueUncertainty").asDouble(), stored.assignedValueUncertainty());
            assertRelative(offline.path("robustSd").asDouble(), stored.robustSd());
            assertThat(offline.path("scoreUsed").asText()).isEqualTo(stored.scoreUsed());
            Map<String, JsonNode> byParticipant = new HashMap<>();
            offline.path("scores").forEach(s -> byParticipant.put(s.path("participant").asText(), s));
            List<String> compared = new ArrayList<>();
            for (EvaluationViews.Score s : stored.scores()) {
                JsonNode o = byParticipant.get(s.participantCode());
                assertThat(o).as(s.participantCode()).isNotNull();
                assertThat(o.path("classification").isNull() ? null : o.path("classification").asText())
                        .isEqualTo(s.classification());
                if (s.z() != null) {
                    assertRelative(o.path("z").asDouble(), s.z());
                    compared.add(s.participantCode());
                }
                if (s.zeta() != null) {
                    assertRelative(o.path("zeta").asDouble(), s.zeta());
                }
            }
            assertThat(compared).hasSize(MN.length);
        } finally {
            Files.deleteIfExists(csv);
        }
    }

    private static void assertRelative(double actual, double expected) {
        assertThat(actual).isCloseTo(expected, offset(Math.abs(expected) * 1e-12));
    }
}
