package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;

import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.equalTo;

/** A laboratory's grants to auditors: one active grant per auditor (extend it instead), revoked versus expired. */
@QuarkusTest
class AuditorGrantTest {

    @Inject
    World world;

    private static String inDays(int days) {
        return OffsetDateTime.now(ZoneOffset.UTC).plusDays(days).withNano(0).toString();
    }

    @Test
    void aSecondActiveGrantToTheSameAuditorIsRefusedWithTheWayToExtendTheExistingOne() {
        long lab = world.laboratory();
        String auditor = world.user("auditor", null);
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        int first = manager.json().body("{\"auditorUsername\":\"" + auditor + "\",\"validUntil\":\"" + inDays(30) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants").then().statusCode(200).extract().path("id");
        manager.json().body("{\"auditorUsername\":\"" + auditor + "\",\"validUntil\":\"" + inDays(60) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants").then().statusCode(409)
                .body("detail", containsString("/api/v1/my-laboratory/auditor-grants/" + first + "/extend"));
        // the page says the same and links the extend form of the existing grant
        manager.form().formParam("auditorUsername", auditor).formParam("validUntil", inDays(60).substring(0, 10))
                .post("/my-laboratory/auditor-grants").then().statusCode(409)
                .body(containsString("href=\"#extend-" + first + "\""))
                .body(containsString("id=\"extend-" + first + "\""));

        String later = manager.json().body("{\"validUntil\":\"" + inDays(90) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants/" + first + "/extend").then().statusCode(200)
                .body("active", equalTo(true)).extract().path("validUntil");
        assertThat(OffsetDateTime.parse(later)).isAfter(OffsetDateTime.now(ZoneOffset.UTC).plusDays(89));
        assertThat(world.text("SELECT count(*)::text FROM auditor_grant WHERE laboratory_id = ?", lab)).isEqualTo("1");
        assertThat(world.text("SELECT count(*)::text FROM audit_event WHERE action = 'auditor-grant.extended' AND object_id = ?",
                Integer.toString(first))).isEqualTo("1");
    }

    @Test
    void anotherLaboratorysGrantCannotBeExtendedAndLooksMissing() {
        long other = world.laboratory();
        long foreign = world.grant(other, world.user("auditor", null));
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        String body = "{\"validUntil\":\"" + inDays(90) + "\"}";
        String foreignAnswer = manager.json().body(body).post("/api/v1/my-laboratory/auditor-grants/" + foreign + "/extend")
                .then().statusCode(404).extract().path("detail");
        String missing = manager.json().body(body).post("/api/v1/my-laboratory/auditor-grants/987654321/extend")
                .then().statusCode(404).extract().path("detail");
        assertThat(foreignAnswer).isEqualTo(missing);
    }

    @Test
    void theLaboratorysPageTellsARevokedGrantFromAnExpiredOne() {
        long lab = world.laboratory();
        World.Browser manager = world.signIn(world.user("lab-manager", lab));
        long revoked = world.grant(lab, world.user("auditor", null));
        manager.form().formParam("confirmed", "yes").post("/my-laboratory/auditor-grants/" + revoked + "/revoke")
                .then().statusCode(200);
        long expired = world.grant(lab, world.user("auditor", null));
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '20 days', valid_until = now() - interval '1 day' "
                + "WHERE id = ?", expired);
        String page = manager.request().get("/my-laboratory").then().statusCode(200).extract().asString();
        assertThat(page).contains("status-bad\">revoked</span>").contains("status-bad\">expired</span>");
        // an expired grant is not extended: it is granted anew
        manager.json().body("{\"validUntil\":\"" + inDays(30) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants/" + expired + "/extend").then().statusCode(409)
                .body("detail", containsString("expired"));
    }
}
