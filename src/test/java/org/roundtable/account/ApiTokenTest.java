package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.nullValue;
import static org.hamcrest.Matchers.startsWith;

@QuarkusTest
class ApiTokenTest {

    @Inject
    World world;

    @Inject
    org.roundtable.testing.Publications publications;

    private static final String NO_LONGER_VALID = "no longer valid";

    @Test
    void aTokenIsShownOnceActsForItsLaboratoryAndIsStoredOnlyAsAHash() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        String secret = manager.json().body("{\"name\":\"LIMS main\"}").post("/api/v1/my-laboratory/tokens")
                .then().statusCode(200).body("secret", startsWith("rt_")).extract().path("secret");
        given().header("Authorization", "Bearer " + secret).get("/api/v1/me")
                .then().statusCode(200)
                .body("role", equalTo("lab-member"))
                .body("laboratoryId", equalTo((int) lab))
                .body("apiToken", equalTo(true));
        manager.request().get("/api/v1/my-laboratory/tokens").then().statusCode(200)
                .body("[0].name", equalTo("LIMS main"))
                .body("[0].secret", nullValue());
        assertThat(world.insert("SELECT count(*) FROM api_token WHERE token_hash = encode(sha256(convert_to(?, 'UTF8')), 'hex')", secret))
                .isEqualTo(1);
    }

    @Test
    void aRevokedTokenStopsWorkingAtOnce() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        io.restassured.response.Response created = manager.json().body("{\"name\":\"to revoke\"}").post("/api/v1/my-laboratory/tokens");
        String secret = created.path("secret");
        int id = created.path("token.id");
        given().header("Authorization", "Bearer " + secret).get("/api/v1/me").then().statusCode(200);
        manager.json().post("/api/v1/my-laboratory/tokens/" + id + "/revoke").then().statusCode(200);
        given().header("Authorization", "Bearer " + secret).get("/api/v1/me").then().statusCode(401);
    }

    @Test
    void anUnknownTokenIsRefused() {
        given().header("Authorization", "Bearer rt_not-a-real-token").get("/api/v1/me").then().statusCode(401);
    }

    @Test
    void aTokenCannotAdministerItsLaboratory() {
        String secret = world.apiToken(world.laboratory());
        given().header("Authorization", "Bearer " + secret).contentType("application/json").body("{\"name\":\"x\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(403);
    }

    @Test
    void aManagerCannotRevokeAnotherLaboratorysTokenAndLearnsNothingAboutIt() {
        long other = world.laboratory();
        long foreignToken = world.apiTokenId(other);
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        String foreign = manager.json().post("/api/v1/my-laboratory/tokens/" + foreignToken + "/revoke")
                .then().statusCode(404).extract().path("detail");
        String missing = manager.json().post("/api/v1/my-laboratory/tokens/987654321/revoke")
                .then().statusCode(404).extract().path("detail");
        assertThat(foreign).isEqualTo(missing);
    }

    @Test
    void aTokenThatReadsScoresCannotSubmitAndATokenThatSubmitsCannotReadScores() {
        long lab = world.laboratory();
        long round = publications.publishedRound(lab, org.roundtable.report.model.ReportStatus.PRELIMINARY);
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        String reader = manager.json().body("{\"name\":\"scores reader\",\"scope\":\"READ_SCORES\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(200).body("token.scope", equalTo("READ_SCORES"))
                .extract().path("secret");
        String submitter = manager.json().body("{\"name\":\"submitter\"}").post("/api/v1/my-laboratory/tokens")
                .then().statusCode(200).body("token.scope", equalTo("SUBMIT")).extract().path("secret");
        String scores = "/api/v1/my-rounds/" + round + "/scores";

        given().header("Authorization", "Bearer " + reader).get(scores).then().statusCode(200);
        given().header("Authorization", "Bearer " + reader).get(scores + ".csv").then().statusCode(200);
        given().header("Authorization", "Bearer " + reader).contentType("application/json")
                .body("{\"results\":[]}").post("/api/v1/my-rounds/" + round + "/submission")
                .then().statusCode(403).body("detail", org.hamcrest.Matchers.containsString("reads scores only"));
        given().header("Authorization", "Bearer " + submitter).get(scores)
                .then().statusCode(403).body("detail", org.hamcrest.Matchers.containsString("submits results only"));
        given().header("Authorization", "Bearer " + submitter).get("/my-rounds/" + round + "/scores").then().statusCode(403);
        // people are not limited by scopes
        manager.request().get(scores).then().statusCode(200);
    }

    @Test
    void tokensMadeBeforeScopesSubmitResultsAndNeverExpire() {
        String secret = world.apiToken(world.laboratory());
        assertThat(world.text("SELECT scope || '/' || coalesce(expires_at::text, 'never') FROM api_token WHERE token_hash = "
                + "encode(sha256(convert_to(?, 'UTF8')), 'hex')", secret)).isEqualTo("SUBMIT/never");
    }

    @Test
    void aRevokedOrExpiredTokenIsToldItIsNoLongerValidWhileAnUnknownOneGetsTheGeneric401() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        io.restassured.response.Response created = manager.json().body("{\"name\":\"old LIMS\"}")
                .post("/api/v1/my-laboratory/tokens");
        String revoked = created.path("secret");
        manager.json().post("/api/v1/my-laboratory/tokens/" + created.path("token.id") + "/revoke").then().statusCode(200);
        String expired = world.apiToken(lab);
        world.sql("UPDATE api_token SET created_at = now() - interval '10 days', expires_at = now() - interval '1 day' "
                + "WHERE token_hash = encode(sha256(convert_to(?, 'UTF8')), 'hex')", expired);

        for (String secret : java.util.List.of(revoked, expired)) {
            given().header("Authorization", "Bearer " + secret).get("/api/v1/me").then().statusCode(401)
                    .body("detail", org.hamcrest.Matchers.containsString(NO_LONGER_VALID));
        }
        String unknown = given().header("Authorization", "Bearer rt_" + "x".repeat(43)).get("/api/v1/me")
                .then().statusCode(401).extract().path("detail");
        assertThat(unknown).doesNotContain(NO_LONGER_VALID).contains("not valid");
    }

    @Test
    void aTokenWithAnExpiryWorksUntilThenAndTheExpiryMustLieAhead() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        String until = java.time.OffsetDateTime.now(java.time.ZoneOffset.UTC).plusDays(30).toString();
        String secret = manager.json().body("{\"name\":\"expiring\",\"expiresAt\":\"" + until + "\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(200)
                .body("token.expiresAt", org.hamcrest.Matchers.notNullValue()).extract().path("secret");
        given().header("Authorization", "Bearer " + secret).get("/api/v1/me").then().statusCode(200);
        String past = java.time.OffsetDateTime.now(java.time.ZoneOffset.UTC).minusDays(1).toString();
        manager.json().body("{\"name\":\"already over\",\"expiresAt\":\"" + past + "\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(400);
    }

    @Test
    void revokingATokenOnThePageAsksFirstAndNamesWhatStopsWorking() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        int id = manager.json().body("{\"name\":\"LIMS scores\",\"scope\":\"READ_SCORES\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(200).extract().path("token.id");
        manager.form().post("/my-laboratory/tokens/" + id + "/revoke").then().statusCode(200)
                .body(org.hamcrest.Matchers.containsString("can no longer read your laboratory"));
        manager.request().get("/api/v1/my-laboratory/tokens").then().body("find { it.id == " + id + " }.revokedAt",
                nullValue());
    }

    @Test
    void aTokenThatReadsScoresChangesNothingAndATokenThatSubmitsReadsNoReportsOrHistory() {
        long lab = world.laboratory();
        long round = world.round(org.roundtable.scheme.RoundState.OPEN_FOR_RESULTS, lab);
        String reader = world.apiToken(lab, "READ_SCORES");
        given().header("Authorization", "Bearer " + reader).contentType("application/json")
                .body("{\"results\":[{\"measurand\":\"Cr\",\"value\":\"18.10\",\"unit\":\"%\",\"method\":\"spark-oes\","
                        + "\"replicates\":2}]}")
                .post("/api/v1/my-rounds/" + round + "/submission").then().statusCode(403)
                .body("detail", startsWith("This API token reads scores only"));
        given().header("Authorization", "Bearer " + reader).contentType("application/json").body("{\"body\":\"hello\"}")
                .post("/api/v1/my-rounds/" + round + "/messages").then().statusCode(403);
        assertThat(world.text("SELECT count(*) FROM submission WHERE round_id = ?", round)).isEqualTo("0");

        String submitter = world.apiToken(lab);
        for (String path : java.util.List.of("/api/v1/my-rounds/" + round + "/documents", "/api/v1/my-laboratory/history",
                "/api/v1/rounds/" + round + "/published/results.json")) {
            given().header("Authorization", "Bearer " + submitter).get(path).then().statusCode(403)
                    .body("detail", startsWith("This API token submits results only"));
        }
        given().header("Authorization", "Bearer " + reader).get("/api/v1/my-laboratory/history").then().statusCode(200);
    }
}
