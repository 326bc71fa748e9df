package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The administrator's users page: the laboratory of a new user is chosen from the laboratory search, roles change
 * after a confirmation naming what is lost (audited), and nobody disables their own account.
 */
@QuarkusTest
class UserAdministrationPagesTest {

    @Inject
    World world;

    @Test
    void theLaboratoryOfANewUserIsFoundByNameAndChosenWithWhatWasTypedKept() {
        long lab = world.laboratory();
        String name = world.text("SELECT name FROM laboratory WHERE id = ?", lab);
        World.Browser admin = world.signIn(world.user("admin", null));
        String username = World.unique("newmember").toLowerCase();

        Response found = admin.form().formParam("username", username).formParam("displayName", "New Member")
                .formParam("role", "lab-member").formParam("laboratoryQuery", name).formParam("find", "yes")
                .post("/admin/users");
        assertThat(found.statusCode()).isEqualTo(200);
        assertThat(found.asString()).contains("name=\"laboratoryId\" value=\"" + lab + "\"").contains(name)
                .contains("value=\"" + username + "\"").contains("value=\"New Member\"");

        Response withoutLaboratory = admin.form().formParam("username", username).formParam("displayName", "New Member")
                .formParam("role", "lab-member").formParam("laboratoryQuery", "").post("/admin/users");
        assertThat(withoutLaboratory.statusCode()).isEqualTo(400);
        assertThat(withoutLaboratory.asString()).contains("id=\"laboratory-problem\"").contains("value=\"" + username + "\"");

        Response created = admin.form().formParam("username", username).formParam("displayName", "New Member")
                .formParam("role", "lab-member").formParam("laboratoryQuery", name)
                .formParam("laboratoryId", Long.toString(lab)).post("/admin/users");
        assertThat(created.statusCode()).as(created.asString()).isEqualTo(200);
        assertThat(created.asString()).contains("User " + username + " created.");
        assertThat(world.insert("SELECT laboratory_id FROM app_user WHERE username = ?", username)).isEqualTo(lab);
    }

    @Test
    void aRoleChangeIsConfirmedWithWhatIsLostThenAppliedAndAudited() {
        World.Browser admin = world.signIn(world.user("admin", null));
        String coordinator = world.user("coordinator", null);
        long id = world.userId(coordinator);

        Response step = admin.form().formParam("role", "auditor").post("/admin/users/" + id + "/role");
        assertThat(step.statusCode()).isEqualTo(200);
        assertThat(step.asString()).contains("Make " + coordinator + " an auditor?").contains("loses what a coordinator may do")
                .contains("signed out everywhere");
        assertThat(world.text("SELECT role FROM app_user WHERE id = ?", id)).isEqualTo("coordinator");

        Response done = admin.form().formParam("role", "auditor").formParam("confirmed", "yes").post("/admin/users/" + id + "/role");
        assertThat(done.statusCode()).isEqualTo(200);
        assertThat(done.asString()).contains(coordinator + " is now an auditor.");
        assertThat(world.text("SELECT role FROM app_user WHERE id = ?", id)).isEqualTo("auditor");
        assertThat(world.insert("SELECT count(*) FROM audit_event WHERE action = 'user.role-changed' AND object_id = ?",
                Long.toString(id))).isEqualTo(1);
    }

    @Test
    void aLaboratoryRoleIsNotGivenToAUserWithoutALaboratory() {
        World.Browser admin = world.signIn(world.user("admin", null));
        long id = world.userId(world.user("auditor", null));
        Response refused = admin.form().formParam("role", "lab-member").formParam("confirmed", "yes")
                .post("/admin/users/" + id + "/role");
        assertThat(refused.statusCode()).isEqualTo(400);
        assertThat(refused.asString()).contains("belongs to no laboratory");
        assertThat(world.text("SELECT role FROM app_user WHERE id = ?", id)).isEqualTo("auditor");
    }

    @Test
    void anAdministratorSeesNoDisableButtonOnTheirOwnRowAndTheServerRefusesIt() {
        String me = world.user("admin", null);
        long myId = world.userId(me);
        World.Browser admin = world.signIn(me);
        String page = admin.request().queryParam("q", me).get("/admin/users").asString();
        String ownRow = page.substring(page.indexOf("id=\"user-" + myId + "\""));
        ownRow = ownRow.substring(0, ownRow.indexOf("</tr>"));
        assertThat(ownRow).doesNotContain("Disable").doesNotContain("/role\"").contains("you");

        Response refused = admin.form().formParam("enabled", "false").post("/admin/users/" + myId + "/enabled");
        assertThat(refused.statusCode()).isEqualTo(409);
        assertThat(refused.asString()).contains("You cannot disable your own account");
        Response confirmedAnyway = admin.form().formParam("enabled", "false").formParam("confirmed", "yes")
                .post("/admin/users/" + myId + "/enabled");
        assertThat(confirmedAnyway.statusCode()).isEqualTo(409);
        Response ownRole = admin.form().formParam("role", "coordinator").formParam("confirmed", "yes")
                .post("/admin/users/" + myId + "/role");
        assertThat(ownRole.statusCode()).isEqualTo(409);
        assertThat(world.text("SELECT enabled::text FROM app_user WHERE id = ?", myId)).isEqualTo("true");
        assertThat(world.text("SELECT role FROM app_user WHERE id = ?", myId)).isEqualTo("admin");
    }
}
