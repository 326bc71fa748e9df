package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static io.restassured.RestAssured.given;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;
import static org.hamcrest.Matchers.startsWith;

@QuarkusTest
class SignInTest {

    @Inject
    World world;

    @Test
    void signedInUserIsKnownByTheSessionCookie() {
        long lab = world.laboratory();
        String member = world.user("lab-member", lab);
        World.Browser browser = world.signIn(member);
        browser.request().get("/api/v1/me").then().statusCode(200)
                .body("username", equalTo(member))
                .body("role", equalTo("lab-member"))
                .body("laboratoryId", equalTo((int) lab));
    }

    @Test
    void sessionCookieIsHttpOnlyAndSameSite() {
        String coordinator = world.user("coordinator", null);
        String[] form = world.anonymousForm();
        given().redirects().follow(false).cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("username", coordinator).formParam("password", World.PASSWORD)
                .post("/login")
                .then().statusCode(303)
                .header("Set-Cookie", containsString("HttpOnly"))
                .header("Set-Cookie", containsString("SameSite=Lax"));
    }

    @Test
    void wrongPasswordAndUnknownUserGetTheSameAnswer() {
        String coordinator = world.user("coordinator", null);
        String[] form = world.anonymousForm();
        String wrongPassword = given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("username", coordinator).formParam("password", "not-the-password")
                .post("/login").then().statusCode(401).extract().asString();
        String unknownUser = given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("username", "nobody-" + coordinator).formParam("password", "x")
                .post("/login").then().statusCode(401).extract().asString();
        org.assertj.core.api.Assertions.assertThat(wrongPassword).contains(SignInService.GENERIC_FAILURE);
        org.assertj.core.api.Assertions.assertThat(unknownUser).contains(SignInService.GENERIC_FAILURE);
    }

    @Test
    void signInIsThrottledAfterTenFailuresEvenWithTheRightPassword() {
        String coordinator = world.user("coordinator", null);
        String[] form = world.anonymousForm();
        for (int i = 0; i < 10; i++) {
            given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                    .formParam("_csrf", form[1]).formParam("username", coordinator).formParam("password", "wrong-" + i)
                    .post("/login").then().statusCode(401);
        }
        given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("username", coordinator).formParam("password", World.PASSWORD)
                .post("/login").then().statusCode(429).body(containsString("Too many failed sign-ins"));
    }

    @Test
    void signOutEndsTheSessionOnTheServer() {
        World.Browser browser = world.signIn(world.user("coordinator", null));
        browser.form().post("/logout").then().statusCode(303);
        browser.request().accept("application/json").get("/api/v1/me").then().statusCode(401);
    }

    @Test
    void disablingAnAccountStopsItsSessionAtOnce() {
        String admin = world.user("admin", null);
        String member = world.user("lab-member", world.laboratory());
        World.Browser victim = world.signIn(member);
        victim.request().get("/api/v1/me").then().statusCode(200);
        world.signIn(admin).json().post("/api/v1/users/" + world.userId(member) + "/disable")
                .then().statusCode(200).body("enabled", equalTo(false));
        victim.request().accept("application/json").get("/api/v1/me").then().statusCode(401);
        world.signIn(admin); // the admin itself is unaffected
    }

    @Test
    void aRoleChangeAppliesOnTheNextRequest() {
        String admin = world.user("admin", null);
        String coordinator = world.user("coordinator", null);
        World.Browser browser = world.signIn(coordinator);
        browser.request().get("/api/v1/laboratories").then().statusCode(200);
        world.sql("UPDATE app_user SET role = 'auditor' WHERE username = ?", coordinator);
        browser.request().accept("application/json").get("/api/v1/laboratories").then().statusCode(403);
        org.assertj.core.api.Assertions.assertThat(admin).isNotBlank();
    }

    @Test
    void idleSessionsExpire() {
        World.Browser browser = world.signIn(world.user("coordinator", null));
        world.sql("UPDATE user_session SET last_seen_at = now() - interval '31 minutes' WHERE user_id = (SELECT id FROM app_user WHERE username = ?)",
                browser.username());
        browser.request().accept("application/json").get("/api/v1/me").then().statusCode(401);
    }

    @Test
    void sessionsEndAtTheAbsoluteTimeoutWhateverTheActivity() {
        World.Browser browser = world.signIn(world.user("coordinator", null));
        world.sql("UPDATE user_session SET created_at = now() - interval '13 hours', expires_at = now() - interval '1 hour' WHERE user_id = (SELECT id FROM app_user WHERE username = ?)",
                browser.username());
        browser.request().accept("application/json").get("/api/v1/me").then().statusCode(401);
    }

    @Test
    void browsersAreSentToSignInAndBack() {
        given().redirects().follow(false).accept("text/html").get("/laboratories")
                .then().statusCode(303).header("Location", startsWith("http")).header("Location", containsString("/login?next=%2Flaboratories"));
    }

    @Test
    void aOneTimeLinkSetsThePasswordOnceOnly() {
        String admin = world.user("admin", null);
        String member = world.user("lab-member", world.laboratory());
        String path = world.signIn(admin).json().post("/api/v1/users/" + world.userId(member) + "/password-link")
                .then().statusCode(200).extract().path("passwordLinkPath");
        String code = path.substring(path.indexOf('#') + 1);
        String[] form = world.anonymousForm();
        given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("link", code).formParam("password", "short")
                .post("/password/set").then().statusCode(422).body(containsString("at least 12 characters"));
        given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("link", code).formParam("password", "password1234")
                .post("/password/set").then().statusCode(422).body(containsString("commonly used"));
        given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("link", code).formParam("password", "a fresh long passphrase")
                .post("/password/set").then().statusCode(200).body(containsString("Your password is set"));
        world.signIn(member, "a fresh long passphrase");
        given().cookie("rt_form", form[0]).contentType("application/x-www-form-urlencoded")
                .formParam("_csrf", form[1]).formParam("link", code).formParam("password", "another long passphrase")
                .post("/password/set").then().statusCode(422);
    }
}
