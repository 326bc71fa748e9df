package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.not;

/** The laboratories and users pages show a bounded page and find by part of a name. */
@QuarkusTest
class LaboratorySearchTest {

    @Inject
    World world;

    @Test
    void aCoordinatorFindsALaboratoryByPartOfItsNameAndWildcardsAreTakenLiterally() {
        long lab = world.laboratory();
        String name = world.text("SELECT name FROM laboratory WHERE id = ?", lab);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        coordinator.request().queryParam("q", name.substring(name.indexOf('-') + 1)).get("/laboratories")
                .then().statusCode(200).body(containsString(name)).body(containsString("1 of 1 laboratories shown"));
        coordinator.request().queryParam("q", "%").get("/laboratories")
                .then().statusCode(200).body(containsString("0 of 0 laboratories shown")).body(not(containsString(name)));
    }

    @Test
    void anAdministratorFindsAUserByName() {
        String member = world.user("lab-member", world.laboratory());
        world.signIn(world.user("admin", null)).request().queryParam("q", member).get("/admin/users")
                .then().statusCode(200).body(containsString(member)).body(containsString("1 of 1 users shown"));
    }
}
