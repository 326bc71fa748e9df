package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.List;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.hasItem;
import static org.hamcrest.Matchers.hasSize;
import static org.hamcrest.Matchers.matchesPattern;

@QuarkusTest
class SubmissionTest {

    @Inject
    World world;

    @Inject
    DeadlineClosing deadlineClosing;

    private long lab;
    private long round;
    private String token;

    @BeforeEach
    void aLaboratoryEnrolledInARoundOpenForResults() {
        lab = world.laboratory();
        round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        token = world.apiToken(lab);
    }

    private static String cr(String value) {
        return "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"" + value + "\",\"unit\":\"%\",\"expandedUncertainty\":\"0.08\","
                + "\"method\":\"spark-oes\",\"replicates\":2,\"replicateValues\":[\"" + value + "\",\"" + value + "\"]}]}";
    }

    private Response submit(String json) {
        return given().header("Authorization", "Bearer " + token).contentType("application/json").body(json)
                .post("/api/v1/my-rounds/" + round + "/submission");
    }

    private long revisions() {
        return world.insert("SELECT count(*) FROM submission_revision v JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?", round);
    }

    @Test
    void anAcceptedSubmitGivesAReceiptAndCanBeReadBackAsReported() {
        submit(cr("18.10")).then().statusCode(201)
                .body("revision", equalTo(1))
                .body("receiptId", matchesPattern("RT-[A-Za-z0-9_-]{22}"))
                .body("sha256", matchesPattern("[0-9a-f]{64}"))
                .body("late", equalTo(false));
        given().header("Authorization", "Bearer " + token).get("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(200)
                .body("current.results[0].valueAsReported", equalTo("18.10"))
                .body("current.results[0].measurand", equalTo("Cr"))
                .body("revisions", hasSize(1));
    }

    @Test
    void eachSubmitIsANewRevisionAndEarlierOnesAreKept() {
        submit(cr("18.12")).then().statusCode(201).body("revision", equalTo(1));
        submit(cr("18.15")).then().statusCode(201).body("revision", equalTo(2));
        given().header("Authorization", "Bearer " + token).get("/api/v1/my-rounds/" + round + "/submission/revisions/1")
                .then().statusCode(200).body("results[0].valueAsReported", equalTo("18.12"));
        given().header("Authorization", "Bearer " + token).get("/api/v1/my-rounds/" + round + "/submission")
                .then().body("current.revision", equalTo(2)).body("current.results[0].valueAsReported", equalTo("18.15"));
    }

    @Test
    void oneBadRowRejectsTheWholeUploadWithRowColumnAndReasonAndSavesNothing() {
        String csv = "measurand,value,unit,method,replicates\nCr,18.12,%,spark-oes,2\nXx,1.0,%,spark-oes,1\n";
        given().header("Authorization", "Bearer " + token).contentType("text/csv").body(csv)
                .post("/api/v1/my-rounds/" + round + "/submission/file")
                .then().statusCode(422)
                .body("errors.key", hasItem("measurand.unknown-element"))
                .body("errors.find { it.key == 'measurand.unknown-element' }.row", equalTo(3))
                .body("errors.find { it.key == 'measurand.unknown-element' }.field", equalTo("measurand"));
        assertThat(revisions()).isZero();
    }

    @Test
    void valuesOutsideTheExpectedRangeNeedTheLaboratorysConfirmation() {
        // a unit slip: 1812 % is impossible, but 1.812 % is only outside the expected 17-20 % and must be confirmable
        submit(cr("1.812")).then().statusCode(422).body("errors.key", hasItem("warning.value.outside-expected-range"));
        assertThat(revisions()).isZero();
        given().header("Authorization", "Bearer " + token).contentType("application/json").body(cr("1.812"))
                .queryParam("confirmWarnings", true).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(201).body("confirmedWarnings.key", hasItem("value.outside-expected-range"));
    }

    @Test
    void aSemicolonCsvWithDecimalCommaAndByteOrderMarkIsAccepted() {
        byte[] bom = {(byte) 0xEF, (byte) 0xBB, (byte) 0xBF};
        byte[] body = ("measurand;value;unit;method;replicates\r\nCr;18,12;%;spark-oes;2\r\n").getBytes(java.nio.charset.StandardCharsets.UTF_8);
        byte[] withBom = new byte[bom.length + body.length];
        System.arraycopy(bom, 0, withBom, 0, bom.length);
        System.arraycopy(body, 0, withBom, bom.length, body.length);
        given().header("Authorization", "Bearer " + token).contentType("text/csv").body(withBom)
                .post("/api/v1/my-rounds/" + round + "/submission/file").then().statusCode(201)
                .body("detected", containsString("byte order mark"))
                .body("detected", containsString("delimiter ';'"))
                .body("detected", containsString("decimal ','"));
    }

    @Test
    void aRetryWithTheSameIdempotencyKeyReturnsTheOriginalReceiptAndADifferentPayloadIsRefused() {
        String key = "lims-" + World.unique("retry");
        String first = given().header("Authorization", "Bearer " + token).header("Idempotency-Key", key)
                .contentType("application/json").body(cr("18.12")).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(201).extract().path("receiptId");
        String retry = given().header("Authorization", "Bearer " + token).header("Idempotency-Key", key)
                .contentType("application/json").body(cr("18.12")).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(201).extract().path("receiptId");
        assertThat(retry).isEqualTo(first);
        given().header("Authorization", "Bearer " + token).header("Idempotency-Key", key)
                .contentType("application/json").body(cr("18.99")).post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(422);
        assertThat(revisions()).isEqualTo(1);
    }

    @Test
    void afterTheDeadlineARoundThatRefusesLateResultsRefusesAndTheSchedulerClosesIt() {
        world.sql("UPDATE round SET result_deadline = now() - interval '1 minute', dispatch_date = current_date - 1 WHERE id = ?", round);
        submit(cr("18.12")).then().statusCode(409).body("detail", containsString("deadline passed"));
        assertThat(deadlineClosing.closeDue()).isGreaterThanOrEqualTo(1);
        assertThat(world.text("SELECT state FROM round WHERE id = ?", round)).isEqualTo("CLOSED");
        assertThat(deadlineClosing.closeDue()).as("a second run (another instance) finds nothing to do").isZero();
    }

    @Test
    void aRoundThatAcceptsLateResultsFlagsThemUntilTheCoordinatorCloses() {
        world.sql("UPDATE round SET result_deadline = now() - interval '1 minute', dispatch_date = current_date - 1, "
                + "late_policy = 'ACCEPT_FLAGGED_UNSCORED' WHERE id = ?", round);
        submit(cr("18.12")).then().statusCode(201).body("late", equalTo(true));
        world.signIn(world.user("coordinator", null)).json().body("{\"action\":\"CLOSE\"}")
                .post("/api/v1/rounds/" + round + "/transitions").then().statusCode(200);
        submit(cr("18.13")).then().statusCode(409).body("detail", containsString("not open for results"));
    }

    @Test
    void afterTheCloseOnlyACoordinatorsCorrectionWithReasonAndEvidenceIsWritten() {
        submit(cr("181.2")).then().statusCode(422); // above 100 %: impossible, refused
        given().header("Authorization", "Bearer " + token).contentType("application/json").body(cr("1.812"))
                .queryParam("confirmWarnings", true).post("/api/v1/my-rounds/" + round + "/submission").then().statusCode(201);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.json().body("{\"action\":\"CLOSE\"}").post("/api/v1/rounds/" + round + "/transitions").then().statusCode(200);
        String correction = "{\"reason\":\"Decimal point slip confirmed by the laboratory\",\"evidence\":\"Instrument printout 2026-11-30\","
                + "\"results\":" + cr("18.12").substring("{\"results\":".length(), cr("18.12").length() - 1) + "}";
        coordinator.json().body(correction).post("/api/v1/rounds/" + round + "/submissions/" + lab + "/corrections")
                .then().statusCode(201).body("revision", equalTo(2)).body("channel", equalTo("CORRECTION"));
        coordinator.request().get("/api/v1/rounds/" + round + "/submissions/" + lab)
                .then().statusCode(200).body("", hasSize(2)).body("[1].correctionReason", containsString("Decimal point"));
    }

    @Test
    void aLaboratorySeesOnlyItsOwnSubmissionAndNeverAnotherLaboratorysCode() {
        long other = world.laboratory();
        long shared = world.round(RoundState.OPEN_FOR_RESULTS, lab, other);
        world.submitCr(shared, other, "18.20");
        World.Browser member = world.signIn(world.user("lab-member", lab));
        String mine = member.request().get("/api/v1/my-rounds/" + shared + "/submission").then().statusCode(200)
                .body("current", org.hamcrest.Matchers.nullValue()).extract().asString();
        String otherCode = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", shared, other);
        assertThat(mine).doesNotContain(otherCode).doesNotContain("18.20");
    }

    @Test
    void identicalResultVectorsFromTwoLaboratoriesAreFlaggedForTheCoordinatorOnly() {
        long other = world.laboratory();
        long shared = world.round(RoundState.OPEN_FOR_RESULTS, lab, other);
        world.submitCr(shared, lab, "18.31");
        world.submitCr(shared, other, "18.31");
        world.signIn(world.user("coordinator", null)).request().get("/api/v1/rounds/" + shared + "/review-flags")
                .then().statusCode(200).body("kind", hasItem("IDENTICAL_RESULTS"));
        given().header("Authorization", "Bearer " + token).get("/api/v1/my-rounds/" + shared + "/submission")
                .then().statusCode(200).body(org.hamcrest.Matchers.not(containsString("IDENTICAL")));
    }

    @Test
    void aLaboratoryAsksAndTheCoordinatorAnswersAndBothAreKept() {
        given().header("Authorization", "Bearer " + token).contentType("application/json").body("{\"body\":\"Is N wanted in mg/kg?\"}")
                .post("/api/v1/my-rounds/" + round + "/messages").then().statusCode(201);
        world.signIn(world.user("coordinator", null)).json().body("{\"body\":\"Yes, in mg/kg.\"}")
                .post("/api/v1/rounds/" + round + "/submissions/" + lab + "/messages").then().statusCode(201);
        given().header("Authorization", "Bearer " + token).get("/api/v1/my-rounds/" + round + "/messages")
                .then().statusCode(200).body("body", equalTo(List.of("Is N wanted in mg/kg?", "Yes, in mg/kg.")));
    }

    @Test
    void revisionsCannotBeChangedEvenByTheDatabaseOwner() {
        submit(cr("18.12")).then().statusCode(201);
        org.assertj.core.api.Assertions.assertThatThrownBy(() ->
                        world.sql("UPDATE reported_result SET value_as_reported = '99' WHERE revision_id IN "
                                + "(SELECT v.id FROM submission_revision v JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?)", round))
                .hasMessageContaining("permission denied");
    }
}
