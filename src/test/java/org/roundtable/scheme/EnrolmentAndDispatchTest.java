package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.util.List;
import java.util.Map;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Enrolment with random participant codes, the code table's confidentiality, dispatch, receipt
 * acknowledgement, replacement of a damaged item and withdrawal of an item with a notice — through the API
 * as coordinators and laboratories use it.
 */
@QuarkusTest
class EnrolmentAndDispatchTest {

    @Inject
    World world;

    private World.Browser coordinator;
    private long roundId;
    private long labA;
    private long labB;
    private String orgC;

    @BeforeEach
    void aRoundWithThreeLaboratoriesDispatched() {
        coordinator = world.signIn(world.user("coordinator", null));
        roundId = world.round(RoundState.ENROLLING);
        labA = world.laboratory();
        labB = world.laboratory();
        enrol(Map.of("laboratoryId", labA)).then().statusCode(200);
        enrol(Map.of("laboratoryId", labB)).then().statusCode(200);
        orgC = World.unique("Brightfield Castings");
        Response created = enrol(Map.of("organisation", orgC, "name", "Foundry laboratory", "country", "PL",
                "contactName", "Ola Kowal", "contactEmail", "ola@brightfield.example",
                "managerUsername", World.unique("brightfield.manager")));
        assertThat(created.statusCode()).as(created.asString()).isEqualTo(200);
        assertThat(created.jsonPath().getString("passwordLinkPath")).startsWith("/password/set#");
        transition("CONFIRM_QUALIFICATION");
        transition("DISPATCH_ITEMS");
    }

    @Test
    void everyLaboratoryGetsADistinctRandomCodeFromTheUnambiguousAlphabet() {
        List<String> codes = coordinator.request().get("/api/v1/rounds/" + roundId + "/participants")
                .then().statusCode(200).extract().jsonPath().getList("participantCode");
        assertThat(codes).hasSize(3).doesNotHaveDuplicates()
                .allMatch(c -> c.matches("[ABCDEFGHJKMNPQRSTUVWXYZ23456789]{6}"), "6 characters without 0, O, 1, I, L");
    }

    @Test
    void enrollingTheSameLaboratoryTwiceIsRefused() {
        world.sql("UPDATE round SET state = 'ENROLLING' WHERE id = ?", roundId);
        Response again = enrol(Map.of("laboratoryId", labA));
        assertThat(again.statusCode()).isEqualTo(409);
        assertThat(again.jsonPath().getString("detail")).contains("enrolled in the round already");
    }

    @Test
    void aLaboratorySeesItsOwnCodeInstructionsAndCautionsButNeverOtherLaboratoriesOrTheCodeTable() {
        World.Browser memberA = world.signIn(world.user("lab-member", labA));
        String codeA = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", roundId, labA);
        String codeB = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", roundId, labB);
        String nameB = world.text("SELECT name FROM laboratory WHERE id = ?", labB);

        Response mine = memberA.request().accept("application/json").get("/api/v1/my-rounds/" + roundId);
        assertThat(mine.statusCode()).isEqualTo(200);
        assertThat(mine.jsonPath().getString("participantCode")).isEqualTo(codeA);
        assertThat(mine.jsonPath().getString("cautionsHeading")).contains("Safety cautions");
        assertThat(mine.jsonPath().getList("cautions", String.class)).anyMatch(c -> c.contains("high voltage"))
                .anyMatch(c -> c.contains("Argon")).anyMatch(c -> c.contains("beryllium"));
        assertThat(mine.jsonPath().getString("cautionsDeference")).contains("instrument maker's manual");
        String body = mine.asString();
        assertThat(body).doesNotContain(codeB).doesNotContain(nameB).doesNotContain(orgC)
                .doesNotContain("\"laboratoryId\"").doesNotContain("sigmaPt");

        String list = memberA.request().accept("application/json").get("/api/v1/my-rounds").asString();
        assertThat(list).contains(codeA).doesNotContain(codeB).doesNotContain(nameB);

        assertThat(memberA.request().accept("application/json").get("/api/v1/rounds/" + roundId + "/participants").statusCode())
                .isEqualTo(403);

        // a laboratory not enrolled sees nothing, exactly as for a round that does not exist
        World.Browser outsider = world.signIn(world.user("lab-manager", world.laboratory()));
        Response other = outsider.request().accept("application/json").get("/api/v1/my-rounds/" + roundId);
        Response missing = outsider.request().accept("application/json").get("/api/v1/my-rounds/987654321");
        assertThat(other.statusCode()).isEqualTo(404);
        assertThat(other.jsonPath().getString("detail")).isEqualTo(missing.jsonPath().getString("detail"));
    }

    @Test
    void aLaboratoryAcknowledgesReceiptOnceAndMustDescribeADamagedItem() {
        World.Browser memberA = world.signIn(world.user("lab-member", labA));
        Response damagedWithoutNote = memberA.json().body(Map.of("itemLabel", "A", "condition", "DAMAGED"))
                .post("/api/v1/my-rounds/" + roundId + "/receipts");
        assertThat(damagedWithoutNote.statusCode()).isEqualTo(400);
        Response received = memberA.json().body(Map.of("itemLabel", "A", "condition", "DAMAGED",
                "note", "Disc bent in transit; surface scratched")).post("/api/v1/my-rounds/" + roundId + "/receipts");
        assertThat(received.statusCode()).as(received.asString()).isEqualTo(200);
        assertThat(received.jsonPath().getString("items[0].status")).isEqualTo("RECEIVED");
        assertThat(received.jsonPath().getString("items[0].condition")).isEqualTo("DAMAGED");
        Response twice = memberA.json().body(Map.of("itemLabel", "A", "condition", "GOOD"))
                .post("/api/v1/my-rounds/" + roundId + "/receipts");
        assertThat(twice.statusCode()).isEqualTo(409);

        // the coordinator sends a replacement; the laboratory then acknowledges that one
        long itemA = world.itemOf(roundId, labA);
        Response replacement = coordinator.json().body(Map.of("reason", "Reported damaged on receipt"))
                .post("/api/v1/rounds/" + roundId + "/items/" + itemA + "/replacement");
        assertThat(replacement.statusCode()).as(replacement.asString()).isEqualTo(200);
        assertThat(replacement.jsonPath().getLong("replacesId")).isEqualTo(itemA);
        Response second = memberA.json().body(Map.of("itemLabel", "A", "condition", "GOOD"))
                .post("/api/v1/my-rounds/" + roundId + "/receipts");
        assertThat(second.statusCode()).isEqualTo(200);
        assertThat(second.jsonPath().getList("items.status")).containsExactly("REPLACED", "RECEIVED");
        assertThat(world.insert("SELECT count(*) FROM audit_event WHERE action = 'item.replaced' AND object_id = ?",
                Long.toString(itemA))).isEqualTo(1);
    }

    @Test
    void aWithdrawnItemIsMarkedForEveryLaboratoryAndAnnouncedInANotice() {
        Response withdrawal = coordinator.json().body(Map.of("itemLabel", "A", "reason", "Lot found segregated in the centre."))
                .post("/api/v1/rounds/" + roundId + "/items/withdrawal");
        assertThat(withdrawal.statusCode()).as(withdrawal.asString()).isEqualTo(200);
        assertThat(coordinator.request().get("/api/v1/rounds/" + roundId + "/items").jsonPath().getList("status"))
                .containsOnly("WITHDRAWN").hasSize(3);
        World.Browser memberB = world.signIn(world.user("lab-member", labB));
        Response mine = memberB.request().accept("application/json").get("/api/v1/my-rounds/" + roundId);
        assertThat(mine.jsonPath().getString("notices[0].body")).contains("Item A").contains("withdrawn")
                .contains("segregated");
        assertThat(mine.jsonPath().getBoolean("receiptOpen")).isTrue();
        Response receipt = memberB.json().body(Map.of("itemLabel", "A", "condition", "GOOD"))
                .post("/api/v1/my-rounds/" + roundId + "/receipts");
        assertThat(receipt.statusCode()).isEqualTo(409);
    }

    @Test
    void schemeWideCodesAreKeptByALaboratoryFromRoundToRound() {
        long scheme = world.scheme();
        long lab = world.laboratory();
        String code1 = enrolInSchemeScopedRound(scheme, lab);
        String code2 = enrolInSchemeScopedRound(scheme, lab);
        assertThat(code2).isEqualTo(code1);
    }

    private String enrolInSchemeScopedRound(long scheme, long lab) {
        long round = world.round(RoundState.ENROLLING);
        world.sql("UPDATE round SET scheme_id = ?, code_scope = 'SCHEME' WHERE id = ?", scheme, round);
        return coordinator.json().body(Map.of("laboratoryId", lab)).post("/api/v1/rounds/" + round + "/enrolments")
                .then().statusCode(200).extract().jsonPath().getString("participant.participantCode");
    }

    private Response enrol(Map<String, Object> body) {
        return coordinator.json().body(body).post("/api/v1/rounds/" + roundId + "/enrolments");
    }

    private void transition(String action) {
        Response r = coordinator.json().body(Map.of("action", action)).post("/api/v1/rounds/" + roundId + "/transitions");
        assertThat(r.statusCode()).as(r.asString()).isEqualTo(200);
    }
}
