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
                .then().statusCode(200).body(containsString(name)).body(containsString("Rows 1–1 of 1."));
        coordinator.request().queryParam("q", "%").get("/laboratories")
                .then().statusCode(200).body(containsString("No rows.")).body(not(containsString(name)));
    }

    @Test
    void theLaboratoriesPageShowsNoMoreRowsThanThePageSizeBudgetAndPagesOn() {
        String stem = World.unique("Paged");
        for (int i = 0; i < 12; i++) {
            world.insert("INSERT INTO laboratory (name, organisation, country, created_at) VALUES (?, 'Paging Works', 'DE', now()) "
                    + "RETURNING id", stem + "-" + i);
        }
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        // the test profile's budget is 5 rows (roundtable.display.page-size)
        coordinator.request().queryParam("q", stem).get("/laboratories")
                .then().statusCode(200).body(containsString("Rows 1–5 of 12.")).body(containsString("Page 1 of 3"))
                .body(containsString("page=2&amp;q=" + stem));
        coordinator.request().queryParam("q", stem).queryParam("page", 3).get("/laboratories")
                .then().statusCode(200).body(containsString("Rows 11–12 of 12.")).body(not(containsString("Next page")));
    }

    @Test
    void anAdministratorFindsAUserByName() {
        String member = world.user("lab-member", world.laboratory());
        world.signIn(world.user("admin", null)).request().queryParam("q", member).get("/admin/users")
                .then().statusCode(200).body(containsString(member)).body(containsString("Rows 1–1 of 1."));
    }
}
