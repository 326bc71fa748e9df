package org.roundtable.submission;

import io.agroal.api.AgroalDataSource;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.CountingDriver;
import org.roundtable.testing.World;

import java.util.List;
import java.util.function.Supplier;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * The statement budget of a submission through the JSON API, counted by the tests' JDBC wrapper
 * ({@link CountingDriver}: one execute or one batch is one statement; commits apart): the whole request, token check
 * included, in steady state (the round's upload rules already cached by an earlier laboratory's submission).
 * Speed itself is shown by the submission benchmark, not here. Counted on 2026-12-02: before the lean path 20
 * statements in 6 transactions (22 with an Idempotency-Key); now 11 in 2 (13 with an Idempotency-Key, 11 for a
 * second revision, 4 for "no change").
 */
@QuarkusTest
class SubmissionStatementsTest {

    /** The most statements a first submission without Idempotency-Key may send (issue 19: at most 15). */
    static final int BUDGET = 15;

    @Inject
    World world;

    @Inject
    AgroalDataSource dataSource;

    private static String results(String cr, String mn) {
        return "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"" + cr + "\",\"unit\":\"%\",\"expandedUncertainty\":\"0.08\","
                + "\"method\":\"spark-oes\",\"replicates\":2},{\"measurand\":\"Mn\",\"value\":\"" + mn + "\",\"unit\":\"%\","
                + "\"method\":\"xrf\",\"replicates\":1}]}";
    }

    /** Cr and Mn, Algorithm A consensus, fixed σpt. */
    private static EvaluationPlan crAndMn() {
        return new EvaluationPlan(List.of(World.simplePlan("0.10").measurands().get(0),
                new EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null, null, null, null, "FIXED", "0.010",
                        null, null, null, null, null, null, "2", null, null, null, null, null)));
    }

    private static List<CountingDriver.Call> counted(Supplier<Response> request, int expectedStatus) {
        CountingDriver.start();
        Response answer;
        try {
            answer = request.get();
        } catch (RuntimeException e) {
            CountingDriver.stop();
            throw e;
        }
        List<CountingDriver.Call> calls = CountingDriver.stop();
        assertThat(answer.statusCode()).as(answer.body().asString()).isEqualTo(expectedStatus);
        return calls;
    }

    private static long statements(List<CountingDriver.Call> calls) {
        return calls.stream().filter(CountingDriver.Call::isStatement).count();
    }

    private static long transactions(List<CountingDriver.Call> calls) {
        return calls.stream().filter(c -> c.kind().equals("commit") || c.kind().equals("rollback")).count();
    }

    private static String listing(String what, List<CountingDriver.Call> calls) {
        StringBuilder out = new StringBuilder(what + ": " + statements(calls) + " statements, " + transactions(calls)
                + " transactions\n");
        calls.forEach(c -> out.append("  ").append(c).append('\n'));
        return out.toString();
    }

    @Test
    void aSubmissionSendsAtMostFifteenStatementsAndARetryableOneAFewMore() {
        assertThat(CountingDriver.installed(dataSource)).as("the tests' datasource counts statements").isTrue();
        long first = world.laboratory();
        long second = world.laboratory();
        long third = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, crAndMn(), org.roundtable.scheme.Round.LatePolicy.REFUSE,
                first, second, third);
        String firstToken = world.apiToken(first);
        String secondToken = world.apiToken(second);
        String thirdToken = world.apiToken(third);
        String uri = "/api/v1/my-rounds/" + round + "/submission";
        // an earlier laboratory's submission: the round's rules are read once, then cached
        given().header("Authorization", "Bearer " + firstToken).contentType("application/json")
                .body(results("18.10", "0.700")).post(uri).then().statusCode(201);

        List<CountingDriver.Call> plain = counted(() -> given().header("Authorization", "Bearer " + secondToken)
                .contentType("application/json").body(results("18.11", "0.710")).post(uri), 201);
        List<CountingDriver.Call> keyed = counted(() -> given().header("Authorization", "Bearer " + thirdToken)
                .header("Idempotency-Key", "statements-" + World.unique("k"))
                .contentType("application/json").body(results("18.12", "0.720")).post(uri), 201);
        List<CountingDriver.Call> revised = counted(() -> given().header("Authorization", "Bearer " + secondToken)
                .contentType("application/json").body(results("18.13", "0.730")).post(uri), 201);
        List<CountingDriver.Call> unchanged = counted(() -> given().header("Authorization", "Bearer " + secondToken)
                .contentType("application/json").body(results("18.13", "0.730")).post(uri), 200);

        String report = listing("first submission, no Idempotency-Key", plain)
                + listing("first submission with an Idempotency-Key", keyed)
                + listing("a second revision", revised)
                + listing("the same values again (no change)", unchanged);
        System.out.println(report);
        assertThat(statements(plain)).as(report).isLessThanOrEqualTo(BUDGET);
        // the token check's own transaction (account feature), then the submission's one
        assertThat(transactions(plain)).as(report).isLessThanOrEqualTo(2);
        // the Idempotency-Key adds its claim and its stored answer
        assertThat(statements(keyed)).as(report).isLessThanOrEqualTo(statements(plain) + 2);
        assertThat(statements(revised)).as(report).isLessThanOrEqualTo(BUDGET + 1);
        assertThat(statements(unchanged)).as(report).isLessThan(statements(plain));
    }

    @Test
    void theKeptUploadRulesFollowAWithdrawnMeasurandAndAChangedCatalogue() {
        long first = world.laboratory();
        long second = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, crAndMn(), org.roundtable.scheme.Round.LatePolicy.REFUSE,
                first, second);
        String firstToken = world.apiToken(first);
        String secondToken = world.apiToken(second);
        String uri = "/api/v1/my-rounds/" + round + "/submission";
        given().header("Authorization", "Bearer " + firstToken).contentType("application/json")
                .body(results("18.10", "0.700")).post(uri).then().statusCode(201);

        // the coordinator withdraws Mn (a qualification decision, as QualificationService appends it)
        world.insert("INSERT INTO qualification_decision (round_id, element, decision, reason, decided_by, decided_at) "
                + "VALUES (?, 'Mn', 'WITHDRAW_MEASURAND', 'Lot inhomogeneous', 'world', now()) RETURNING id", round);
        Response refused = given().header("Authorization", "Bearer " + secondToken).contentType("application/json")
                .body(results("18.11", "0.710")).post(uri);
        assertThat(refused.statusCode()).isEqualTo(422);
        assertThat(refused.body().asString()).contains("Mn is not a measurand of this round");

        // the catalogue's expected range of Cr changes (a versioned row, as SchemeService.putMeasurand writes it)
        String crOnly = "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"18.11\",\"unit\":\"%\",\"method\":\"spark-oes\","
                + "\"replicates\":1}]}";
        world.sql("UPDATE measurand SET expected_min = 19, version = version + 1 WHERE element = 'Cr' AND scheme_id = "
                + "(SELECT scheme_id FROM round WHERE id = ?)", round);
        Response warned = given().header("Authorization", "Bearer " + secondToken).contentType("application/json")
                .body(crOnly).post(uri);
        assertThat(warned.statusCode()).as(warned.body().asString()).isEqualTo(422);
        assertThat(warned.body().asString()).contains("warning.");
        given().header("Authorization", "Bearer " + secondToken).contentType("application/json").body(crOnly)
                .queryParam("confirmWarnings", true).post(uri).then().statusCode(201);
    }
}
