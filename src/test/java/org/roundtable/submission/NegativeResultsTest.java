package org.roundtable.submission;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.EvaluationViews;
import org.roundtable.evaluation.offline.EvaluateCommand;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Round;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

/**
 * Negative results per measurand, on PostgreSQL through the API upload: refused by default with a message naming the
 * measurand, accepted where the round's plan allows them (blank-corrected trace elements), stored as reported and
 * evaluated — and a σpt the plan takes from x_pt (Horwitz) refuses a negative consensus instead of falling back.
 *
 * <p>Check values: z = (x − x_pt)/σpt with x_pt = median of five values (Algorithm A leaves it there for these
 * symmetric values; hand arithmetic); results invented for these tests.
 */
@QuarkusTest
class NegativeResultsTest {

    private static final Actor COORDINATOR = new Actor("negative-results-test", "coordinator", null);

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    /** Cr refuses negative values (the default); Mn, blank-corrected, accepts them; σpt of Mn as given. */
    private static EvaluationPlan plan(String mnSigmaMethod, String mnSigmaPt, String mnProvisional) {
        return new EvaluationPlan(List.of(
                new EvaluationPlan.MeasurandPlan("Cr", "CONSENSUS_ALL", null, null, null, null, null, "FIXED", "0.10",
                        null, null, null, null, null, null, "2", null, null, null, null, null, null, null, null, null,
                        null),
                new EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null, null, null, null, mnSigmaMethod,
                        mnSigmaPt, null, null, null, null, mnProvisional, null, "2", null, null, null, null, null,
                        null, null, null, null, "true")));
    }

    private static Response upload(String token, long round, String csv) {
        return given().header("Authorization", "Bearer " + token).contentType("text/csv").body(csv)
                .queryParam("confirmWarnings", true).post("/api/v1/my-rounds/" + round + "/submission/file");
    }

    private static String row(String measurand, String value) {
        return "measurand,value,unit,method,replicates\n" + measurand + "," + value + ",%,spark-oes,1\n";
    }

    @Test
    void aNegativeValueOfAMeasurandThePlanDoesNotOpenToThemIsRefusedNamingTheMeasurand() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, plan("FIXED", "0.005", null), Round.LatePolicy.REFUSE,
                lab);
        Response r = upload(world.apiToken(lab), round, row("Cr", "-0.02"));

        r.then().statusCode(422);
        assertThat(r.jsonPath().getString("errors[0].key")).isEqualTo("value.negative");
        assertThat(r.jsonPath().getString("errors[0].field")).isEqualTo("value");
        assertThat(r.jsonPath().getString("errors[0].message")).isEqualTo(
                "Cr = -0.02 is negative; the round's plan does not accept negative results for Cr. Check the sign,"
                        + " or ask the coordinator whether negative blank-corrected results are accepted.");
        assertThat(world.insert("SELECT count(*) FROM submission WHERE round_id = ?", round)).isZero();
    }

    @Test
    void aNegativeUncertaintyIsRefusedEvenWhereNegativeValuesAreAllowed() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, plan("FIXED", "0.005", null), Round.LatePolicy.REFUSE,
                lab);
        Response r = upload(world.apiToken(lab), round, "measurand,value,unit,expanded_uncertainty,method,replicates\n"
                + "Mn,-0.002,%,-0.001,spark-oes,1\n");

        r.then().statusCode(422);
        assertThat(r.jsonPath().getString("errors[0].key")).isEqualTo("value.negative");
        assertThat(r.jsonPath().getString("errors[0].field")).isEqualTo("expanded_uncertainty");
        assertThat(r.jsonPath().getString("errors[0].message")).isEqualTo("An expanded uncertainty cannot be negative.");
    }

    @Test
    void negativeResultsOfABlankCorrectedMeasurandAreAcceptedStoredAsReportedAndScored() {
        long[] labs = new long[5];
        String[] values = {"-0.004", "-0.002", "0.000", "0.002", "0.004"};
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.OPEN_FOR_RESULTS, plan("FIXED", "0.002", null), Round.LatePolicy.REFUSE,
                labs);
        for (int i = 0; i < labs.length; i++) {
            String token = world.apiToken(labs[i]);
            upload(token, round, "measurand,value,unit,method,replicates,replicate_values\nMn," + values[i]
                    + ",%,spark-oes,2," + values[i] + "|" + values[i] + "\n").then().statusCode(201);
        }
        given().header("Authorization", "Bearer " + world.apiToken(labs[0])).get("/api/v1/my-rounds/" + round
                + "/submission").then().statusCode(200);
        assertThat(world.text("SELECT rr.value_as_reported || ' ' || rr.value_in_measurand_unit FROM reported_result rr"
                + " JOIN submission_revision v ON v.id = rr.revision_id JOIN submission s ON s.id = v.submission_id"
                + " WHERE s.round_id = ? AND s.laboratory_id = ?", round, labs[0])).isEqualTo("-0.004 -0.004");

        world.sql("UPDATE round SET state = 'CLOSED' WHERE id = ?", round);
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().stream()
                .filter(m -> m.element().equals("Mn")).findFirst().orElseThrow();

        assertThat(mn.n()).isEqualTo(5);
        assertThat(mn.assignedValue()).isCloseTo(0.0, org.assertj.core.data.Offset.offset(1e-12));
        EvaluationViews.Score lowest = mn.scores().stream().filter(s -> s.reported().equals("-0.004")).findFirst()
                .orElseThrow();
        // z = (−0.004 − 0)/0.002 = −2 (hand arithmetic)
        assertThat(lowest.z()).isCloseTo(-2.0, org.assertj.core.data.Offset.offset(1e-9));
        assertThat(lowest.classification()).isEqualTo("satisfactory");
    }

    @Test
    void aHorwitzSigmaPtOfANegativeConsensusScoresNobodyAndSaysWhyInsteadOfUsingTheRobustSd() {
        long[] labs = new long[5];
        String[] values = {"-0.006", "-0.004", "-0.003", "-0.002", "0.000"};
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.OPEN_FOR_RESULTS, plan("HORWITZ_THOMPSON", null, "0.002"),
                Round.LatePolicy.REFUSE, labs);
        for (int i = 0; i < labs.length; i++) {
            upload(world.apiToken(labs[i]), round, row("Mn", values[i])).then().statusCode(201);
        }
        world.sql("UPDATE round SET state = 'CLOSED' WHERE id = ?", round);
        EvaluationViews.MeasurandOutcome mn = evaluations.run(round, false, COORDINATOR).measurands().stream()
                .filter(m -> m.element().equals("Mn")).findFirst().orElseThrow();

        assertThat(mn.assignedValue()).isNegative();
        assertThat(mn.sigmaPt()).isNull();
        assertThat(mn.warnings()).filteredOn(w -> w.code().equals("no-sigma-pt")).singleElement()
                .satisfies(w -> assertThat(w.message()).contains("Horwitz", "not defined", "fixed σpt"));
        assertThat(mn.warnings()).noneMatch(w -> w.code().equals("sigma-pt-data-derived"));
        assertThat(mn.scores()).allSatisfy(s -> {
            assertThat(s.z()).isNull();
            assertThat(s.classification()).isNull();
        });
    }

    /**
     * The same bad row, uploaded to the server and given to {@code evaluate}: the same row, column and message (both
     * run the intake's validator). Cells: measurand, value, U, k.
     */
    @ParameterizedTest(name = "{4}")
    @CsvSource(delimiter = '|', value = {
        "Cr|-0.02|||a negative value of a measurand that does not allow them",
        "Mn|<-0.002|||a negative 'less than' limit, even where negative values are allowed",
        "Mn|0.002|-0.001||a negative uncertainty",
        "Mn|0.002|0||an uncertainty of zero",
        "Mn|0.002|0.001|5|a coverage factor above 4",
        "Cr|100.5|||a mass fraction above 100 %",
        "Mn|-100.5|||a negative mass fraction below -100 %",
        "Cr|1e-3|||a number with an exponent",
        "Cr|=1+1|||a formula"})
    void theSameBadRowGetsTheSameMessageFromTheServerAndFromEvaluate(String measurand, String value, String u,
                                                                     String k, String what) throws IOException {
        String uCell = u == null ? "" : u;
        String kCell = k == null ? "" : k;
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, plan("FIXED", "0.005", null), Round.LatePolicy.REFUSE,
                lab);
        Response server = upload(world.apiToken(lab), round, "measurand,value,unit,expanded_uncertainty,"
                + "coverage_factor,method,replicates\n" + measurand + "," + value + ",%," + uCell + "," + kCell
                + ",spark-oes,1\n");
        server.then().statusCode(422);
        int row = server.jsonPath().getInt("errors[0].row");
        String field = server.jsonPath().getString("errors[0].field");
        String message = server.jsonPath().getString("errors[0].message");

        Path file = Files.createTempFile("negative-results", ".csv");
        try {
            Files.writeString(file, "participant,measurand,unit,value,expanded_uncertainty,coverage_factor,method\n"
                    + "A," + measurand + ",%," + value + "," + uCell + "," + kCell + ",spark-oes\n");
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int exit = EvaluateCommand.run(new String[] {"--negative-allowed", "Mn", file.toString()},
                    new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
            assertThat(exit).as(what).isEqualTo(EvaluateCommand.BAD_INPUT);
            assertThat(err.toString(StandardCharsets.UTF_8)).as(what)
                    .contains("row " + row + ", column " + field + ": '" + server.jsonPath().getString("errors[0].value")
                            + "': " + message);
        } finally {
            Files.delete(file);
        }
    }
}
