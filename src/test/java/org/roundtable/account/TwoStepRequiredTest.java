package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import io.quarkus.test.junit.QuarkusTestProfile;
import io.quarkus.test.junit.TestProfile;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.time.Instant;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;

/** With two-step sign-in required for coordinators, a coordinator without it reaches only the set-up page. */
@QuarkusTest
@TestProfile(TwoStepRequiredTest.CoordinatorsNeedTwoStep.class)
class TwoStepRequiredTest {

    public static class CoordinatorsNeedTwoStep implements QuarkusTestProfile {
        @Override
        public Map<String, String> getConfigOverrides() {
            return Map.of("roundtable.security.two-step-required-roles", "coordinator");
        }
    }

    @Inject
    World world;

    @Test
    void aCoordinatorWithoutTwoStepIsSentToSetItUpAndAllowedAfterwards() {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.request().accept("text/html").get("/laboratories")
                .then().statusCode(303).header("Location", containsString("/account/two-step"));
        coordinator.request().accept("application/json").get("/api/v1/laboratories").then().statusCode(403);
        coordinator.request().get("/account/two-step").then().statusCode(200).body(containsString("requires two-step"));

        String page = coordinator.form().post("/account/two-step/start").then().statusCode(200).extract().asString();
        Matcher m = Pattern.compile("id=\"two-step-secret\">([A-Z2-7]+)<").matcher(page);
        assertThat(m.find()).isTrue();
        byte[] secret = TwoStepSignInTest.base32Decode(m.group(1));
        coordinator.form().formParam("code", Totp.code(secret, Totp.step(Instant.now()), Totp.DIGITS))
                .post("/account/two-step/confirm").then().statusCode(200);
        coordinator.request().accept("application/json").get("/api/v1/laboratories").then().statusCode(200);
    }

    @Test
    void rolesThatDoNotRequireItAreNotAffected() {
        world.signIn(world.user("lab-member", world.laboratory())).request().get("/api/v1/me").then().statusCode(200);
    }
}
