package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static io.restassured.RestAssured.given;
import static org.hamcrest.Matchers.containsString;

@QuarkusTest
class CsrfTest {

    @Inject
    World world;

    @Test
    void aFormPostWithoutTheTokenIsRefused() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        manager.request().contentType("application/x-www-form-urlencoded").formParam("name", "no token")
                .post("/my-laboratory/tokens").then().statusCode(403);
    }

    @Test
    void aFormPostWithAnotherSessionsTokenIsRefused() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        World.Browser other = world.signIn(world.user("lab-manager", world.laboratory()));
        manager.request().contentType("application/x-www-form-urlencoded").formParam("_csrf", other.csrfToken())
                .formParam("name", "stolen token").post("/my-laboratory/tokens").then().statusCode(403);
    }

    @Test
    void aPostFromAForeignOriginIsRefusedEvenWithTheToken() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        manager.form().header("Origin", "https://evil.example").formParam("name", "cross-site")
                .post("/my-laboratory/tokens").then().statusCode(403);
    }

    @Test
    void aPostWithTheTokenFromThisSiteIsAccepted() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        manager.form().formParam("name", "accepted").post("/my-laboratory/tokens")
                .then().statusCode(200).body(containsString("shown only once"));
    }

    @Test
    void theSignInFormNeedsItsTokenToo() {
        String coordinator = world.user("coordinator", null);
        given().contentType("application/x-www-form-urlencoded").formParam("username", coordinator)
                .formParam("password", World.PASSWORD).post("/login").then().statusCode(403);
    }

    @Test
    void jsonCallsWithTheSessionCookieNeedTheHeader() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        manager.request().contentType("application/json").body("{\"name\":\"json\"}")
                .post("/api/v1/my-laboratory/tokens").then().statusCode(403);
        manager.json().body("{\"name\":\"json\"}").post("/api/v1/my-laboratory/tokens").then().statusCode(200);
    }
}
