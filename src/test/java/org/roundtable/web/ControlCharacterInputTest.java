package org.roundtable.web;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.TextInput;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * A NUL (or another control character) in a text field is refused with 400 naming the field, on every kind of
 * text input: JSON bodies and forms. The seven endpoints are the ones an attack run found answering 500.
 */
@QuarkusTest
class ControlCharacterInputTest {

    private static final String NUL = "a\u0000b";

    @Inject
    World world;

    @Test
    void aLaboratoryMessageWithNulIsRefused() {
        long lab = world.laboratory();
        long round = world.round(RoundState.DISPATCHED, lab);
        Response answer = world.signIn(world.user("lab-member", lab)).json().body(json("body", NUL))
                .post("/api/v1/my-rounds/" + round + "/messages");
        refused(answer, "body");
        assertThat(world.insert("SELECT count(*) FROM submission_message WHERE round_id = ?", round)).isZero();
    }

    @Test
    void aCoordinatorReplyWithNulIsRefused() {
        long lab = world.laboratory();
        long round = world.round(RoundState.DISPATCHED, lab);
        refused(world.signIn(world.user("coordinator", null)).json().body(json("body", "reply \u0007"))
                .post("/api/v1/rounds/" + round + "/submissions/" + lab + "/messages"), "body");
    }

    @Test
    void aTokenNameWithNulIsRefused() {
        long lab = world.laboratory();
        refused(world.signIn(world.user("lab-manager", lab)).json().body(json("name", NUL))
                .post("/api/v1/my-laboratory/tokens"), "name");
        assertThat(world.insert("SELECT count(*) FROM api_token WHERE laboratory_id = ?", lab)).isZero();
    }

    @Test
    void aMemberNameWithNulIsRefused() {
        long lab = world.laboratory();
        String username = World.unique("member");
        refused(world.signIn(world.user("lab-manager", lab)).form().formParam("username", username)
                .formParam("displayName", NUL).post("/my-laboratory/members"), "displayName");
        assertThat(world.insert("SELECT count(*) FROM app_user WHERE username = ?", username)).isZero();
    }

    @Test
    void aSchemeNameWithNulIsRefused() {
        String name = World.unique("scheme");
        refused(world.signIn(world.user("coordinator", null)).json()
                .body("{\"name\":\"" + name + "\\u0000\",\"materialFamily\":\"steel\"}")
                .post("/api/v1/schemes"), "name");
        assertThat(world.insert("SELECT count(*) FROM scheme WHERE name LIKE ?", name + "%")).isZero();
    }

    @Test
    void aLaboratoryNameWithNulIsRefused() {
        String name = World.unique("lab");
        refused(world.signIn(world.user("admin", null)).form().formParam("organisation", "Works")
                .formParam("name", name + "\u0000").formParam("country", "DE").post("/laboratories"), "name");
        assertThat(world.insert("SELECT count(*) FROM laboratory WHERE name LIKE ?", name + "%")).isZero();
    }

    @Test
    void roundInstructionsWithNulAreRefused() {
        long scheme = world.scheme();
        String code = World.unique("R");
        refused(world.signIn(world.user("coordinator", null)).form().formParam("schemeId", Long.toString(scheme))
                .formParam("code", code).formParam("instructions", "Dry at 105 \u00b0C.\u0000")
                .post("/rounds"), "instructions");
    }

    @Test
    void tabsNewlinesAndCarriageReturnsAreText() {
        assertThat(TextInput.firstRefused("line one\r\n\tline two")).isEqualTo(-1);
        assertThat(TextInput.firstRefused("x\u001by")).isEqualTo(1);
        assertThat(TextInput.firstRefused("x\u0085")).isEqualTo(1);
        assertThat(TextInput.firstRefused("\ud800x")).isZero();
        assertThat(TextInput.firstRefused("\ud83d\ude00 ok")).isEqualTo(-1);
    }

    @Test
    void bidirectionalOverridesAreStoredButNotShown() {
        assertThat(TextInput.firstRefused("Lab \u202egnp.exe")).isEqualTo(-1);
        assertThat(TextInput.withoutBidiControls("Lab \u202egnp.exe\u202c")).isEqualTo("Lab gnp.exe");
        assertThat(TextInput.withoutBidiControls("\u05de\u05e2\u05d1\u05d3\u05d4")).isEqualTo("\u05de\u05e2\u05d1\u05d3\u05d4");
    }

    private static String json(String field, String value) {
        StringBuilder escaped = new StringBuilder();
        for (char c : value.toCharArray()) {
            escaped.append(c < 0x20 ? String.format("\\u%04x", (int) c) : String.valueOf(c));
        }
        return "{\"" + field + "\":\"" + escaped + "\"}";
    }

    private static void refused(Response answer, String field) {
        assertThat(answer.statusCode()).as(answer.asString()).isEqualTo(400);
        assertThat(answer.asString()).contains(field).contains("control character");
    }
}
