package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;

/** Bulk enrolment through the API: 10,000 laboratories in one request, and all-or-nothing on bad rows. */
@QuarkusTest
class BulkEnrolmentTest {

    @Inject
    World world;

    @Test
    void tenThousandLaboratoriesAreEnrolledInOneRequestWithinSeconds() {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        long round = world.round(RoundState.ENROLLING);
        String batch = World.unique("bulk");
        List<Map<String, String>> rows = rows(batch, 10_000);
        long auditBefore = world.insert("SELECT count(*) FROM audit_event");

        long started = System.nanoTime();
        Response response = coordinator.json().body(rows).post("/api/v1/rounds/" + round + "/enrolments/bulk");
        double seconds = (System.nanoTime() - started) / 1e9;

        assertThat(response.statusCode()).as(response.asString().substring(0, Math.min(500, response.asString().length())))
                .isEqualTo(200);
        assertThat(seconds).as("seconds for 10,000 laboratories").isLessThan(60);
        assertThat(response.jsonPath().getInt("count")).isEqualTo(10_000);
        List<String> codes = response.jsonPath().getList("laboratories.participantCode");
        assertThat(new HashSet<>(codes)).hasSize(10_000);
        assertThat(response.jsonPath().getList("laboratories.passwordLinkPath", String.class))
                .allMatch(p -> p.startsWith("/password/set#"));
        assertThat(world.insert("SELECT count(*) FROM round_participant WHERE round_id = ?", round)).isEqualTo(10_000);
        assertThat(world.insert("SELECT count(*) FROM app_user WHERE username LIKE ? AND role = 'lab-manager' "
                + "AND password_hash IS NULL", batch + "%")).isEqualTo(10_000);
        assertThat(world.insert("SELECT count(*) FROM password_reset r JOIN app_user u ON u.id = r.user_id "
                + "WHERE u.username LIKE ? AND r.used_at IS NULL", batch + "%")).isEqualTo(10_000);
        // one event for the laboratories and one for the enrolment, not one per row
        assertThat(world.insert("SELECT count(*) FROM audit_event") - auditBefore).isEqualTo(2);
        System.out.printf("bulk enrolment of 10,000 laboratories: %.1f s%n", seconds);
    }

    @Test
    void aBadRowRefusesTheWholeBatchNamingTheRowAndSavesNothing() {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        long round = world.round(RoundState.ENROLLING);
        String batch = World.unique("badbulk");
        List<Map<String, String>> rows = new ArrayList<>(rows(batch, 20));
        Map<String, String> bad = new java.util.HashMap<>(rows.get(12));
        bad.put("country", "Atlantis");
        rows.set(12, bad);
        Response response = coordinator.json().body(rows).post("/api/v1/rounds/" + round + "/enrolments/bulk");
        assertThat(response.statusCode()).isEqualTo(400);
        assertThat(response.jsonPath().getString("detail")).startsWith("Row 13: ").contains("country");
        assertThat(world.insert("SELECT count(*) FROM laboratory WHERE organisation LIKE ?", "Org " + batch + "%")).isZero();
        assertThat(world.insert("SELECT count(*) FROM round_participant WHERE round_id = ?", round)).isZero();
    }

    private static List<Map<String, String>> rows(String batch, int n) {
        List<Map<String, String>> rows = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            rows.add(Map.of("organisation", "Org " + batch + " " + i, "name", "Metals laboratory", "country", i % 2 == 0 ? "DE" : "FI",
                    "contactName", "Contact " + i, "contactEmail", "lab" + i + "@bulk.example",
                    "managerUsername", batch + "." + i));
        }
        return rows;
    }
}
