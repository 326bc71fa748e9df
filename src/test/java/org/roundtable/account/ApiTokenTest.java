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
}
