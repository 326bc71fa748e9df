package org.roundtable.evaluation;

import com.fasterxml.jackson.databind.JsonNode;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

/**
 * The evaluation's rules on real rounds in PostgreSQL: blunders marked by the coordinator (left out of the
 * statistics, still scored), the plan's boundary, stopping and quartile rules, and u_hom added to u(x_pt) by a
 * qualification decision.
 */
@QuarkusTest
class EvaluationRulesTest {

    private static final Actor COORDINATOR = new Actor("evaluation-rules-test", "coordinator", null);

    /**
     * Constructed Mn data, low-alloy steel, % m/m, p = 20 (the project's statistics reference §14.2/§14.3, CALC:
     * computed independently in Python and R, no published source).
     */
    private static final String[] MN = {"0.742", "0.751", "0.748", "0.739", "0.755", "0.746", "0.744", "0.750", "0.747",
        "0.741", "0.753", "0.745", "0.749", "0.738", "0.752", "0.743", "0.746", "0.790", "0.772", "0.748"};

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    ExclusionService exclusions;

    private static EvaluationPlan.MeasurandPlan mn(String sigmaPt, String exclusionRules, String quartileRule,
                                                   String stoppingRule, String boundaryRule) {
        return new EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null, null, null, null, "FIXED", sigmaPt,
                null, null, null, null, null, null, null, null, exclusionRules, quartileRule, stoppingRule, boundaryRule);
    }

    private static EvaluationPlan.MeasurandPlan certifiedCr(String value, String expandedU, String sigmaPt,
                                                            String boundaryRule) {
        return new EvaluationPlan.MeasurandPlan("Cr", "CERTIFIED_REFERENCE", null, value, expandedU, "2", null,
                "FIXED", sigmaPt, null, null, null, null, null, null, null, null, null, null, null, boundaryRule);
    }

    private long[] labs(int n) {
        long[] labs = new long[n];
        for (int i = 0; i < n; i++) {
            labs[i] = world.laboratory();
        }
        return labs;
    }

    private String code(long round, long lab) {
        return world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, lab);
    }

    private static EvaluationViews.Score scoreOf(EvaluationViews.MeasurandOutcome m, long laboratoryId) {
        return m.scores().stream().filter(s -> s.laboratoryId() == laboratoryId).findFirst().orElseThrow();
    }

    /** The 20 Mn results and a 21st laboratory whose result slipped a decimal point (7.48 for 0.748). */
    private long[] mnRoundWithABlunder(long round, long[] labs) {
        for (int i = 0; i < MN.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], i == 0 ? "0.006" : null, i % 2 == 0 ? "spark-oes" : "xrf",
                    false);
        }
        world.reportResult(round, labs[MN.length], "Mn", "7.48", "0.02", "spark-oes", false);
        return labs;
    }

    // ---- blunders -------------------------------------------------------------------------------------------------

    @Test
    void aMarkedBlunderIsLeftOutOfEveryStatisticButStillScoredWithItsReason() {
        long[] labs = labs(MN.length + 1);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(mn("0.010", null, null, null, null))),
                Round.LatePolicy.REFUSE, labs);
        mnRoundWithABlunder(round, labs);
        long blunder = labs[MN.length];

        EvaluationViews.Run before = evaluations.run(round, false, COORDINATOR);
        ExclusionService.Exclusion mark = exclusions.mark(round, new ExclusionService.MarkRequest(code(round, blunder),
                "Mn", "A", "reported in mg/g instead of %"), COORDINATOR);
        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);
        EvaluationViews.MeasurandOutcome mn = run.measurands().get(0);

        // the statistics are those of the 20 others: CALC (statistics reference §14.3) x* 0.7475547640,
        // s* 0.0062873256, 28 iterations (rel 1e-8); median 0.7475, MADe 0.005932 (§14.2, rel 1e-9)
        assertThat(mn.n()).isEqualTo(20);
        assertThat(mn.excluded()).isEqualTo(1);
        assertThat(mn.assignedValue()).isCloseTo(0.7475547640, within(0.7475547640 * 1e-8));
        assertThat(mn.robustSd()).isCloseTo(0.0062873256, within(0.0062873256 * 1e-8));
        assertThat(mn.iterations()).isEqualTo(28);
        assertThat(mn.median()).isCloseTo(0.7475, within(0.7475 * 1e-9));
        assertThat(mn.madE()).isCloseTo(0.005932, within(0.005932 * 1e-9));
        assertThat(mn.methodGroups()).extracting(EvaluationViews.MethodGroupStatistics::n).containsExactly(10, 10);
        // the blunder is scored against that x_pt: z = (7.48 − 0.7475547640)/0.010 (arithmetic)
        EvaluationViews.Score b = scoreOf(mn, blunder);
        assertThat(b.excludedReason()).isEqualTo("blunder: reported in mg/g instead of %");
        assertThat(b.z()).isCloseTo((7.48 - mn.assignedValue()) / 0.010, within(1e-9));
        assertThat(b.classification()).isEqualTo("unsatisfactory");
        assertThat(b.zeta()).isNotNull();
        assertThat(scoreOf(mn, labs[0]).excludedReason()).isNull();
        // without the mark the blunder was in the statistics (21 values), and the mark is part of the inputs
        assertThat(before.measurands().get(0).n()).isEqualTo(21);
        assertThat(run.run().inputsSha256()).isNotEqualTo(before.run().inputsSha256());
        assertThat(mark.reported()).isEqualTo("7.48");
        // read back from the stored rows, identical
        assertThat(evaluations.run(round, run.run().version()).measurands()).isEqualTo(run.measurands());
        assertThat(world.text("SELECT detail FROM audit_event WHERE action = 'evaluation.exclusion-marked' AND object_id = ?",
                Long.toString(round))).contains("reported in mg/g instead of %");
    }

    @Test
    void aWithdrawnMarkNoLongerApplies() {
        long[] labs = labs(MN.length + 1);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(mn("0.010", null, null, null, null))),
                Round.LatePolicy.REFUSE, labs);
        mnRoundWithABlunder(round, labs);
        long blunder = labs[MN.length];
        EvaluationViews.Run unmarked = evaluations.run(round, false, COORDINATOR);
        ExclusionService.Exclusion mark = exclusions.mark(round, new ExclusionService.MarkRequest(code(round, blunder),
                "Mn", "A", "wrong element reported"), COORDINATOR);

        ExclusionService.Exclusion withdrawn = exclusions.withdraw(round, mark.id(),
                new ExclusionService.WithdrawalRequest("the laboratory confirmed the value"), COORDINATOR);
        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);

        assertThat(withdrawn.current()).isFalse();
        EvaluationViews.MeasurandOutcome mn = run.measurands().get(0);
        assertThat(mn.n()).isEqualTo(21);
        assertThat(mn.excluded()).isZero();
        assertThat(scoreOf(mn, blunder).excludedReason()).isNull();
        assertThat(run.run().inputsSha256()).isEqualTo(unmarked.run().inputsSha256());
        assertThat(run.run().outputsSha256()).isEqualTo(unmarked.run().outputsSha256());
        ExclusionService.RoundExclusions listed = exclusions.list(round);
        assertThat(listed.current()).isEmpty();
        assertThat(listed.withdrawn()).singleElement().satisfies(e -> {
            assertThat(e.reason()).isEqualTo("wrong element reported");
            assertThat(e.withdrawal().reason()).isEqualTo("the laboratory confirmed the value");
        });
        // marks are append-only
        assertThatThrownBy(() -> world.sql("DELETE FROM result_exclusion WHERE round_id = ?", round))
                .isInstanceOf(IllegalStateException.class);
    }

    @Test
    void censoredResultsAndABlunderAreBothLeftOutOfTheStatistics() {
        long[] labs = labs(13);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(mn("0.010", null, null, null, null))),
                Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < 10; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }
        world.reportResult(round, labs[10], "Mn", "<0.5", null, "spark-oes", false);
        world.reportResult(round, labs[11], "Mn", "<0.9", null, "spark-oes", false);
        world.reportResult(round, labs[12], "Mn", "0.0748", null, "spark-oes", false);
        exclusions.mark(round, new ExclusionService.MarkRequest(code(round, labs[12]), "Mn", "A", "decimal point slipped"),
                COORDINATOR);
        // the same round without the blunder's laboratory gives the reference numbers
        long[] others = java.util.Arrays.copyOf(labs, 12);
        long reference = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(mn("0.010", null, null, null, null))),
                Round.LatePolicy.REFUSE, others);
        for (int i = 0; i < 10; i++) {
            world.reportResult(reference, others[i], "Mn", MN[i], null, "spark-oes", false);
        }
        world.reportResult(reference, others[10], "Mn", "<0.5", null, "spark-oes", false);
        world.reportResult(reference, others[11], "Mn", "<0.9", null, "spark-oes", false);

        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().get(0);
        EvaluationViews.MeasurandOutcome expected = evaluations.run(reference, false, COORDINATOR).measurands().get(0);

        assertThat(mn.n()).isEqualTo(10);
        assertThat(mn.censored()).isEqualTo(2);
        assertThat(mn.excluded()).isEqualTo(1);
        assertThat(mn.assignedValue()).isEqualTo(expected.assignedValue());
        assertThat(mn.robustSd()).isEqualTo(expected.robustSd());
        assertThat(mn.nIqr()).isEqualTo(expected.nIqr());
        // the censored results are classified against x_pt, the blunder scored with its reason
        assertThat(scoreOf(mn, labs[10]).classification()).isEqualTo("inconsistent");
        assertThat(scoreOf(mn, labs[11]).classification()).isEqualTo("consistent");
        EvaluationViews.Score b = scoreOf(mn, labs[12]);
        assertThat(b.excludedReason()).isEqualTo("blunder: decimal point slipped");
        assertThat(b.z()).isCloseTo((0.0748 - mn.assignedValue()) / 0.010, within(1e-9));
    }

    @Test
    void theExclusionApiChecksWhatItIsGivenAndTheRoundState() {
        long[] labs = labs(2);
        long round = world.round(RoundState.OPEN_FOR_RESULTS, new EvaluationPlan(List.of(mn("0.010", null, null, null,
                null))), Round.LatePolicy.REFUSE, labs);
        world.reportResult(round, labs[0], "Mn", "0.748", null, "spark-oes", false);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String path = "/api/v1/rounds/" + round + "/exclusions";
        String code = code(round, labs[0]);

        Response blank = coordinator.json().body(Map.of("participantCode", code, "element", "Mn", "itemLabel", "A",
                "reason", " ")).post(path);
        assertThat(blank.statusCode()).isEqualTo(400);
        assertThat(blank.jsonPath().getString("detail")).contains("reason");
        Response unknownCode = coordinator.json().body(Map.of("participantCode", "ZZZZ", "element", "Mn",
                "itemLabel", "A", "reason", "x")).post(path);
        assertThat(unknownCode.statusCode()).isEqualTo(422);
        assertThat(unknownCode.jsonPath().getString("detail")).contains("ZZZZ");
        assertThat(coordinator.json().body(Map.of("participantCode", code, "element", "Ni", "itemLabel", "A",
                "reason", "x")).post(path).jsonPath().getString("detail")).contains("Ni is not a measurand");
        assertThat(coordinator.json().body(Map.of("participantCode", code, "element", "Mn", "itemLabel", "B",
                "reason", "x")).post(path).statusCode()).isEqualTo(422);
        // a participant without a result for it
        assertThat(coordinator.json().body(Map.of("participantCode", code(round, labs[1]), "element", "Mn",
                "itemLabel", "A", "reason", "x")).post(path).statusCode()).isEqualTo(422);

        JsonNode marked = coordinator.json().body(Map.of("participantCode", code.toLowerCase(), "element", "mn",
                "itemLabel", "A", "reason", "wrong unit")).post(path).then().statusCode(201).extract().as(JsonNode.class);
        assertThat(marked.path("participantCode").asText()).isEqualTo(code);
        assertThat(marked.path("element").asText()).isEqualTo("Mn");
        coordinator.json().body(Map.of("participantCode", code, "element", "Mn", "itemLabel", "A", "reason", "again"))
                .post(path).then().statusCode(409);
        JsonNode listed = coordinator.json().get(path).then().statusCode(200).extract().as(JsonNode.class);
        assertThat(listed.path("current").get(0).path("reason").asText()).isEqualTo("wrong unit");
        long id = marked.path("id").asLong();
        coordinator.json().body(Map.of("reason", "")).post(path + "/" + id + "/withdrawal").then().statusCode(400);
        coordinator.json().body(Map.of("reason", "value confirmed")).post(path + "/" + id + "/withdrawal")
                .then().statusCode(200);
        coordinator.json().body(Map.of("reason", "twice")).post(path + "/" + id + "/withdrawal").then().statusCode(409);
        coordinator.json().body(Map.of("reason", "x")).post(path + "/999999999/withdrawal").then().statusCode(404);

        // laboratories never reach it; a round not yet open for results refuses marks
        given().header("Authorization", "Bearer " + world.apiToken(labs[0])).get(path).then().statusCode(403);
        long dispatched = world.round(RoundState.DISPATCHED, new EvaluationPlan(List.of(mn("0.010", null, null, null,
                null))), Round.LatePolicy.REFUSE, labs);
        coordinator.json().body(Map.of("participantCode", code(dispatched, labs[0]), "element", "Mn", "itemLabel", "A",
                "reason", "x")).post("/api/v1/rounds/" + dispatched + "/exclusions").then().statusCode(409);
    }

    // ---- the plan's rules ------------------------------------------------------------------------------------------

    @Test
    void theBoundaryRuleDecidesScoresOfExactlyTwoAndThree() {
        for (EvaluationPlan.BoundaryRule rule : EvaluationPlan.BoundaryRule.values()) {
            long[] labs = labs(4);
            long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(certifiedCr("10", "0.002", "0.5",
                    rule.name()))), Round.LatePolicy.REFUSE, labs);
            // z = (x − 10)/0.5 exactly (binary-exact decimals): 2.0, −2.0, 3.0, −3.0
            String[] values = {"11", "9", "11.5", "8.5"};
            for (int i = 0; i < labs.length; i++) {
                world.reportResult(round, labs[i], "Cr", values[i], null, "spark-oes", false);
            }
            EvaluationViews.MeasurandOutcome cr = evaluations.run(round, false, COORDINATOR).measurands().get(0);
            assertThat(cr.scoreUsed()).isEqualTo("z");
            assertThat(scoreOf(cr, labs[0]).z()).isEqualTo(2.0);
            assertThat(scoreOf(cr, labs[3]).z()).isEqualTo(-3.0);
            boolean isoBands = rule == EvaluationPlan.BoundaryRule.SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3;
            // ISO/IEC 17043:2010 Annex B: |z| ≤ 2 satisfactory, |z| ≥ 3 unsatisfactory; the other rule: 2 ≤ |z| ≤ 3
            // questionable
            assertThat(scoreOf(cr, labs[0]).classification()).isEqualTo(isoBands ? "satisfactory" : "questionable");
            assertThat(scoreOf(cr, labs[1]).classification()).isEqualTo(isoBands ? "satisfactory" : "questionable");
            assertThat(scoreOf(cr, labs[2]).classification()).isEqualTo(isoBands ? "unsatisfactory" : "questionable");
            assertThat(scoreOf(cr, labs[3]).classification()).isEqualTo(isoBands ? "unsatisfactory" : "questionable");
            assertThat(cr.rules().boundaryRule()).isEqualTo(rule.name());
        }
    }

    @Test
    void theStoppingAndQuartileRulesOfThePlanAreAppliedAndRecorded() {
        long[] labs = labs(MN.length);
        long round = world.round(RoundState.CLOSED, new EvaluationPlan(List.of(mn("0.010",
                "Results reported in the wrong unit are blunders.", "HYNDMAN_FAN_6", "THIRD_SIGNIFICANT_FIGURE", null))),
                Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", MN[i], null, "spark-oes", false);
        }

        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);
        EvaluationViews.MeasurandOutcome mn = run.measurands().get(0);

        // CALC (statistics reference §14.2): nIQR with R quantile(type = 6) 0.00630105 (type 7 would be 0.00555975)
        assertThat(mn.nIqr()).isCloseTo(0.00630105, within(0.00630105 * 1e-8));
        // CALC (legacy third-significant-figure rule, AlgorithmATest): 6 iterations, x* 0.7475538, s* 0.0062832 (abs
        // 1e-7), against 28 iterations to the fixed point
        assertThat(mn.iterations()).isEqualTo(6);
        assertThat(mn.assignedValue()).isCloseTo(0.7475538, within(1e-7));
        assertThat(mn.robustSd()).isCloseTo(0.0062832, within(1e-7));
        assertThat(mn.rules()).isEqualTo(new EvaluationViews.Rules("HYNDMAN_FAN_6", "THIRD_SIGNIFICANT_FIGURE",
                "SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3", "Results reported in the wrong unit are blunders.", "ACCEPT",
                List.of("u_char"), false, 2, 2.0, false, 10, 10));
        assertThat(evaluations.run(round, run.run().version()).measurands().get(0).rules()).isEqualTo(mn.rules());
    }

    // ---- qualification decisions -----------------------------------------------------------------------------------

    @Test
    void aDecisionToAddUHomPutsTheBetweenItemSdIntoUOfTheAssignedValue() {
        long[] labs = labs(2);
        // certified Cr 18.12 % with U = 0.056 (k = 2): u_char = 0.028 ≤ 0.3·σpt = 0.030, so z would be used
        long round = world.round(RoundState.ENROLLING, new EvaluationPlan(List.of(certifiedCr("18.12", "0.056", "0.10",
                null))), Round.LatePolicy.REFUSE, labs);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        uploadQualificationData(coordinator, round, false);
        decide(coordinator, round, "ADD_HOMOGENEITY_UNCERTAINTY", "account for the between-disc spread");
        world.sql("UPDATE round SET state = 'CLOSED' WHERE id = ?", round);
        world.reportResult(round, labs[0], "Cr", "18.20", null, "spark-oes", false);
        world.reportResult(round, labs[1], "Cr", "18.10", "0.04", "spark-oes", false);

        EvaluationViews.MeasurandOutcome cr = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        // s_s² = 0.000136666667 (statistics reference §14.8, CALC); u(x_pt) = sqrt(0.028² + s_s²) = 0.0303424895
        // (CALC: python3 -c 'import math; print(math.sqrt(0.028**2 + (0.000553333333333333 - 0.00028)/2))'), rel 1e-6
        assertThat(cr.assignedValueUncertainty()).isCloseTo(0.0303424895, within(0.0303424895 * 1e-6));
        // now u(x_pt) > 0.3·σpt: z′ classifies (ISO 13528:2015, 9.2.1); z′ = 0.08/sqrt(0.01 + u²) = 0.76553563
        // (same command, rel 1e-6)
        assertThat(cr.scoreUsed()).isEqualTo("zPrime");
        assertThat(scoreOf(cr, labs[0]).zPrime()).isCloseTo(0.76553563, within(0.76553563 * 1e-6));
        assertThat(cr.warnings()).extracting(EvaluationViews.Warning::code).contains("u-hom-added",
                "uncertainty-of-assigned-value-large");
        assertThat(cr.warnings().stream().filter(w -> w.code().equals("u-hom-added")).findFirst().orElseThrow()
                .message()).contains("uhom = ss = 0.012 %") // s_s at Cr's 2 reporting digits + 1
                .contains("“Add the homogeneity uncertainty to u(xpt)”").doesNotContain("u_hom", "_UNCERTAINTY");
        assertThat(cr.rules().qualificationDecision()).isEqualTo("ADD_HOMOGENEITY_UNCERTAINTY");
        assertThat(cr.rules().assignedValueUncertaintyComponents()).containsExactly("u_char", "u_hom");
    }

    @Test
    void aDecisionToWidenSigmaPtAddsTheBetweenItemSdToIt() {
        long[] labs = labs(2);
        long round = world.round(RoundState.ENROLLING, World.simplePlan("0.10"), Round.LatePolicy.REFUSE, labs);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        uploadQualificationData(coordinator, round, false);
        decide(coordinator, round, "WIDEN_SIGMA_PT", "discs differ a little");
        world.sql("UPDATE round SET state = 'CLOSED' WHERE id = ?", round);
        world.reportResult(round, labs[0], "Cr", "18.20", null, "spark-oes", false);
        world.reportResult(round, labs[1], "Cr", "18.10", null, "spark-oes", false);

        EvaluationViews.MeasurandOutcome cr = evaluations.run(round, false, COORDINATOR).measurands().get(0);

        // σpt' = sqrt(0.10² + s_s²), s_s² = 0.000136666667 (statistics reference §14.8, CALC): 0.1006810144
        // (CALC: python3 -c 'import math; print(math.sqrt(0.01 + (0.000553333333333333 - 0.00028)/2))'), rel 1e-6
        assertThat(cr.sigmaPt()).isCloseTo(0.1006810144, within(0.1006810144 * 1e-6));
        assertThat(cr.warnings()).extracting(EvaluationViews.Warning::code).contains("sigma-pt-widened");
        assertThat(cr.rules().sigmaPtWidened()).isTrue();
        assertThat(cr.rules().qualificationDecision()).isEqualTo("WIDEN_SIGMA_PT");
    }

    @Test
    void aDecisionToAddUHomAndUStabPutsBothIntoUOfTheAssignedValue() {
        long[] labs = labs(2);
        long round = world.round(RoundState.ENROLLING, new EvaluationPlan(List.of(certifiedCr("18.12", "0.056", "0.10",
                null))), Round.LatePolicy.REFUSE, labs);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        uploadQualificationData(coordinator, round, true);
        decide(coordinator, round, "ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY",
                "the discs may change a little over the round");
        world.sql("UPDATE round SET state = 'CLOSED' WHERE id = ?", round);
        world.reportResult(round, labs[0], "Cr", "18.20", null, "spark-oes", false);
        world.reportResult(round, labs[1], "Cr", "18.10", "0.04", "spark-oes", false);

        EvaluationViews.Run run = evaluations.run(round, false, COORDINATOR);
        EvaluationViews.MeasurandOutcome cr = run.measurands().get(0);

        // u_char = 0.056/2 = 0.028; u_hom² = s_s² = 0.000136666667 (statistics reference §14.8, CALC);
        // u_stab = |ȳ1 − ȳ2|/√3 = 0.011/√3 (§14.9, CALC; rectangular half-width, ISO 13528:2015 / ISO Guide 35:2017
        // practice, from memory); u(x_pt)² = 0.000784 + 0.000136666667 + 0.000121/3 = 0.000961, u(x_pt) = 0.031
        // (CALC: python3 -c 'import math; print(math.sqrt(0.028**2 + (0.000553333333333333 - 0.00028)/2
        // + (0.011/math.sqrt(3))**2))' -> 0.031), rel 1e-6
        assertThat(cr.assignedValueUncertainty()).isCloseTo(0.031, within(0.031 * 1e-6));
        // u(x_pt) > 0.3·σpt: z′ classifies (ISO 13528:2015, 9.2.1); z′ = 0.08/sqrt(0.01 + 0.031²) = 0.76412586
        // (CALC: python3 -c 'import math; print(0.08/math.sqrt(0.01+0.031**2))'), rel 1e-6
        assertThat(cr.scoreUsed()).isEqualTo("zPrime");
        assertThat(scoreOf(cr, labs[0]).zPrime()).isCloseTo(0.76412586, within(0.76412586 * 1e-6));
        assertThat(cr.warnings()).extracting(EvaluationViews.Warning::code).contains("u-hom-u-stab-added")
                .doesNotContain("u-hom-added");
        assertThat(cr.warnings().stream().filter(w -> w.code().equals("u-hom-u-stab-added")).findFirst().orElseThrow()
                .message()).contains("uhom = ss = 0.012 %").contains("ustab = |ȳ1 − ȳ2|/√3 = 0.01")
                .contains("= 0.006 %").doesNotContain("u_stab", "0.0063508");
        assertThat(cr.rules().qualificationDecision()).isEqualTo("ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY");
        assertThat(cr.rules().assignedValueUncertaintyComponents()).containsExactly("u_char", "u_hom", "u_stab");
        // the decision is kept in the run's inputs: s_s, then |ȳ1 − ȳ2| as a fifth field
        String trailer = world.text("SELECT inputs_trailer FROM evaluation_run WHERE round_id = ? AND version = ?",
                round, run.run().version());
        assertThat(trailer).matches("qualification\tCr\tADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY\t0\\.0116904\\d*"
                + "\t0\\.01[01]\\d*\n");
    }

    @Test
    void theDecisionToAddUStabIsRefusedWithoutStabilityDataAndForAConsensus() {
        long[] labs = labs(2);
        long round = world.round(RoundState.ENROLLING, new EvaluationPlan(List.of(certifiedCr("18.12", "0.056", "0.10",
                null))), Round.LatePolicy.REFUSE, labs);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        uploadQualificationData(coordinator, round, false);
        var refused = coordinator.json().body(Map.of("element", "Cr", "decision",
                "ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY", "reason", "drift suspected"))
                .post("/api/v1/rounds/" + round + "/qualification/decisions");
        assertThat(refused.statusCode()).as(refused.asString()).isEqualTo(409);
        assertThat(refused.jsonPath().getString("detail")).contains("Upload homogeneity and stability data first");
        // World.round records one ACCEPT per measurand; the refused decision adds no row
        assertThat(world.text("SELECT string_agg(decision, ',') FROM qualification_decision WHERE round_id = ?", round))
                .doesNotContain("STABILITY");

        long consensus = world.round(RoundState.ENROLLING, World.simplePlan("0.10"), Round.LatePolicy.REFUSE, labs);
        uploadQualificationData(coordinator, consensus, true);
        var forConsensus = coordinator.json().body(Map.of("element", "Cr", "decision",
                "ADD_HOMOGENEITY_AND_STABILITY_UNCERTAINTY", "reason", "drift suspected"))
                .post("/api/v1/rounds/" + consensus + "/qualification/decisions");
        assertThat(forConsensus.statusCode()).as(forConsensus.asString()).isEqualTo(409);
        assertThat(forConsensus.jsonPath().getString("detail")).contains("not a consensus");
    }

    /** Uploads the Cr homogeneity data of statistics reference §14.8 and, with {@code stability}, those of §14.9. */
    private static void uploadQualificationData(World.Browser coordinator, long round, boolean stability) {
        coordinator.json().body(Map.of("csv", resource("/scheme/homogeneity-cr-stainless.csv")))
                .post("/api/v1/rounds/" + round + "/qualification/homogeneity").then().statusCode(200);
        if (stability) {
            coordinator.json().body(Map.of("csv", resource("/scheme/stability-cr-stainless.csv")))
                    .post("/api/v1/rounds/" + round + "/qualification/stability").then().statusCode(200);
        }
    }

    /** Records the coordinator's qualification decision on Cr, which must be accepted. */
    private static void decide(World.Browser coordinator, long round, String decision, String reason) {
        coordinator.json().body(Map.of("element", "Cr", "decision", decision, "reason", reason))
                .post("/api/v1/rounds/" + round + "/qualification/decisions").then().statusCode(200);
    }

    private static String resource(String name) {
        try (InputStream in = EvaluationRulesTest.class.getResourceAsStream(name)) {
            return new String(java.util.Objects.requireNonNull(in, name).readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
