package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.testing.World;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Every action in every state through the real API, server-side: a round is placed in the state with all
 * that state implies, then the action is taken with a request that would succeed if the state allowed it.
 * Allowed actions succeed (and lifecycle steps land in the table's next state and are audited); the others
 * are refused with 409 and a message naming the state, and change nothing.
 */
@QuarkusTest
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class RoundLifecycleApiTest {

    @Inject
    World world;

    // one laboratory and two sign-ins serve every case of this class (one test instance); each case has its own round
    private long lab;
    private World.Browser coordinator;
    private World.Browser member;

    /** Signs in on the first case (not in a BeforeAll: the HTTP port is set up per test). */
    private void signInOnce() {
        if (coordinator == null) {
            lab = world.laboratory();
            coordinator = world.signIn(world.user("coordinator", null));
            member = world.signIn(world.user("lab-member", lab));
        }
    }

    static Stream<Arguments> everyActionInEveryState() {
        return Arrays.stream(RoundState.values())
                .flatMap(state -> Arrays.stream(RoundAction.values()).map(action -> Arguments.of(state, action)));
    }

    @ParameterizedTest(name = "{1} in {0}")
    @MethodSource("everyActionInEveryState")
    void anActionSucceedsInTheStatesThatAllowItAndIsRefusedClearlyInAllOthers(RoundState state, RoundAction action) {
        signInOnce();
        long round = world.round(state, lab);
        long auditBefore = world.insert("SELECT count(*) FROM audit_event WHERE object_type = 'round' AND object_id = ?",
                Long.toString(round));

        Response response = take(action, round, lab, coordinator, member);

        boolean allowed = RoundStateMachine.allows(state, action);
        String stateAfter = world.text("SELECT state FROM round WHERE id = ?", round);
        if (!allowed) {
            assertThat(response.statusCode()).as(response.asString()).isEqualTo(409);
            assertThat(response.jsonPath().getString("detail"))
                    .contains("The round is " + state.name().toLowerCase().replace('_', ' '));
            assertThat(stateAfter).isEqualTo(state.name());
        } else if (action.changesState() && !action.availableNow()) {
            assertThat(response.statusCode()).isEqualTo(409);
            assertThat(response.jsonPath().getString("detail")).contains("evaluation and report features");
            assertThat(stateAfter).isEqualTo(state.name());
        } else {
            assertThat(response.statusCode()).as(response.asString()).isEqualTo(200);
            if (action.changesState()) {
                assertThat(stateAfter).isEqualTo(RoundStateMachine.next(state, action).orElseThrow().name());
                assertThat(world.insert("SELECT count(*) FROM audit_event WHERE object_type = 'round' AND object_id = ? "
                        + "AND action = ?", Long.toString(round), "round." + action.name().toLowerCase().replace('_', '-')))
                        .isEqualTo(1);
            } else {
                assertThat(stateAfter).isEqualTo(state.name());
            }
        }
        if (response.statusCode() != 200) {
            assertThat(world.insert("SELECT count(*) FROM audit_event WHERE object_type = 'round' AND object_id = ?",
                    Long.toString(round))).isEqualTo(auditBefore);
        }
    }

    /** A request for the action that would succeed in a state that allows it. */
    private Response take(RoundAction action, long round, long lab, World.Browser coordinator, World.Browser member) {
        String base = "/api/v1/rounds/" + round;
        return switch (action) {
            case EDIT_DETAILS -> coordinator.json().body(Map.of("schemeId", 1, "code", World.unique("E").toUpperCase(),
                    "itemDescription", "Stainless steel disc", "itemsPerLaboratory", 1, "dispatchDate", "2027-03-01",
                    "resultDeadline", "2027-03-29T17:00", "timeZone", "Europe/Berlin",
                    "instructions", "Treat the disc as a routine sample.")).put(base);
            case EDIT_DRAFT_PLAN -> coordinator.json().body(World.simplePlan("0.10")).put(base + "/plan");
            case NEW_PLAN_VERSION -> coordinator.json().body(Map.of("plan", World.simplePlan("0.12"),
                    "reason", "Expert panel asked for a wider sigma_pt")).post(base + "/plan/versions");
            case ENROL -> coordinator.json().body(Map.of("laboratoryId", world.laboratory())).post(base + "/enrolments");
            case UPLOAD_QUALIFICATION_DATA -> coordinator.json().body(Map.of("csv", HomogeneityWorkedExampleTest.csv()))
                    .post(base + "/qualification/homogeneity");
            case RECORD_QUALIFICATION_DECISION -> coordinator.json().body(Map.of("element", "Cr", "decision", "ACCEPT",
                    "reason", "Checks reviewed")).post(base + "/qualification/decisions");
            case ACKNOWLEDGE_RECEIPT -> member.json().body(Map.of("itemLabel", "A", "condition", "GOOD"))
                    .post("/api/v1/my-rounds/" + round + "/receipts");
            case REPLACE_ITEM -> {
                List<Long> items = world.insert("SELECT count(*) FROM item_dispatch WHERE round_id = ?", round) > 0
                        ? List.of(world.itemOf(round, lab)) : List.of(1L);
                yield coordinator.json().body(Map.of("reason", "Disc arrived bent")).post(base + "/items/" + items.get(0) + "/replacement");
            }
            case WITHDRAW_ITEM -> coordinator.json().body(Map.of("itemLabel", "A", "reason", "Lot found contaminated."))
                    .post(base + "/items/withdrawal");
            default -> coordinator.json().body(Map.of("action", action.name())).post(base + "/transitions");
        };
    }
}
