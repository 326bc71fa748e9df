package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.io.ByteArrayOutputStream;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;

@QuarkusTest
class TwoStepSignInTest {

    private static final Pattern SECRET = Pattern.compile("id=\"two-step-secret\">([A-Z2-7]+)<");
    private static final Pattern RECOVERY = Pattern.compile("<li>([a-z0-9-]{29})</li>");

    @Inject
    World world;

    record Enabled(byte[] secret, String firstRecoveryCode) {
    }

    private Enabled enable(World.Browser browser) {
        String page = browser.form().post("/account/two-step/start").then().statusCode(200).extract().asString();
        Matcher m = SECRET.matcher(page);
        assertThat(m.find()).as(page).isTrue();
        byte[] secret = base32Decode(m.group(1));
        String code = Totp.code(secret, Totp.step(Instant.now()), Totp.DIGITS);
        String confirmed = browser.form().formParam("code", code).post("/account/two-step/confirm")
                .then().statusCode(200).body(containsString("Two-step sign-in is on")).extract().asString();
        Matcher r = RECOVERY.matcher(confirmed);
        assertThat(r.find()).isTrue();
        return new Enabled(secret, r.group(1));
    }

    /** Password step: returns the cookie of the sign-in awaiting its second step. */
    private String passwordStep(String username) {
        String[] form = world.anonymousForm();
        Response login = given().redirects().follow(false).cookie("rt_form", form[0])
                .contentType("application/x-www-form-urlencoded").formParam("_csrf", form[1])
                .formParam("username", username).formParam("password", World.PASSWORD).post("/login");
        assertThat(login.statusCode()).isEqualTo(303);
        assertThat(login.header("Location")).contains("/login/code");
        assertThat(login.getCookie("rt_session")).as("no session before the second step").isNull();
        return login.getCookie("rt_second_step");
    }

    private Response secondStep(String awaiting, String code) {
        String[] form = world.anonymousForm();
        return given().redirects().follow(false).cookie("rt_form", form[0]).cookie("rt_second_step", awaiting)
                .contentType("application/x-www-form-urlencoded").formParam("_csrf", form[1])
                .formParam("code", code).post("/login/code");
    }

    @Test
    void withTwoStepOnThePasswordAloneGivesNoSessionAndTheCodeCompletesTheSignIn() {
        String user = world.user("coordinator", null);
        Enabled enabled = enable(world.signIn(user));
        String awaiting = passwordStep(user);
        given().cookie("rt_session", awaiting).accept("application/json").get("/api/v1/me").then().statusCode(401);
        String code = Totp.code(enabled.secret(), Totp.step(Instant.now()) + 1, Totp.DIGITS);
        Response done = secondStep(awaiting, code);
        assertThat(done.statusCode()).isEqualTo(303);
        given().cookie("rt_session", done.getCookie("rt_session")).get("/api/v1/me")
                .then().statusCode(200).body("username", equalTo(user));
        assertThat(secondStep(passwordStep(user), code).statusCode()).as("a code is never accepted twice").isEqualTo(401);
    }

    @Test
    void aRecoveryCodeWorksOnceInPlaceOfACode() {
        String user = world.user("lab-manager", world.laboratory());
        Enabled enabled = enable(world.signIn(user));
        assertThat(secondStep(passwordStep(user), enabled.firstRecoveryCode()).statusCode()).isEqualTo(303);
        assertThat(secondStep(passwordStep(user), enabled.firstRecoveryCode()).statusCode()).isEqualTo(401);
    }

    @Test
    void aWrongCodeIsRefusedAndCountsTowardsThrottling() {
        String user = world.user("auditor", null);
        enable(world.signIn(user));
        secondStep(passwordStep(user), "000000").then().statusCode(401).body(containsString("not right"));
        assertThat(world.insert("SELECT count(*) FROM login_attempt WHERE username = ? AND NOT succeeded", user)).isEqualTo(1);
    }

    @Test
    void parallelWrongCodesGetAtMostTenChecks() throws Exception {
        String user = world.user("auditor", null);
        enable(world.signIn(user));
        List<Callable<Integer>> guesses = new ArrayList<>();
        for (int i = 0; i < 16; i++) {
            String awaiting = passwordStep(user);
            String guess = String.format("%06d", i);
            guesses.add(() -> secondStep(awaiting, guess).statusCode());
        }
        List<Integer> statuses = SignInThrottleRaceTest.inParallel(guesses);
        assertThat(statuses.stream().filter(s -> s == 401).count()).isLessThanOrEqualTo(10);
        assertThat(statuses).containsOnly(401, 429);
    }

    @Test
    void anAdministratorResetsALostDeviceAndTheUserSignsInWithThePasswordAgain() {
        String user = world.user("lab-member", world.laboratory());
        enable(world.signIn(user));
        world.signIn(world.user("admin", null)).json().post("/api/v1/users/" + world.userId(user) + "/two-step/reset")
                .then().statusCode(200);
        world.signIn(user).request().get("/api/v1/me").then().statusCode(200);
    }

    @Test
    void theTwoStepSecretIsStoredEncrypted() {
        String user = world.user("lab-member", world.laboratory());
        Enabled enabled = enable(world.signIn(user));
        long count = world.insert("SELECT count(*) FROM user_two_step WHERE user_id = ? AND secret_encrypted LIKE ?",
                world.userId(user), "%" + org.roundtable.account.Totp.base32(enabled.secret()) + "%");
        assertThat(count).isZero();
    }

    static byte[] base32Decode(String text) {
        String alphabet = "ABCDEFGHIJKLMNOPQRSTUVWXYZ234567";
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int buffer = 0;
        int bits = 0;
        for (char c : text.toCharArray()) {
            buffer = (buffer << 5) | alphabet.indexOf(c);
            bits += 5;
            if (bits >= 8) {
                out.write((buffer >> (bits - 8)) & 0xff);
                bits -= 8;
            }
        }
        return out.toByteArray();
    }
}
