package org.roundtable.audit;

import io.agroal.api.AgroalDataSource;
import io.quarkus.agroal.DataSource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;

import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.equalTo;

@QuarkusTest
class AuditTrailTest {

    @Inject
    World world;

    @Inject
    AuditTrail audit;

    @Inject
    @DataSource("owner")
    AgroalDataSource owner;

    @BeforeEach
    void someStateChangesHaveBeenAudited() {
        World.Browser manager = world.signIn(world.user("lab-manager", world.laboratory()));
        for (int i = 0; i < 3; i++) {
            manager.json().body("{\"name\":\"audited " + i + "\"}").post("/api/v1/my-laboratory/tokens").then().statusCode(200);
        }
    }

    @Test
    void theChainVerifiesEndToEnd() {
        AuditChain.Verification verification = audit.verify(null);
        assertThat(verification.intact()).as(verification.problem()).isTrue();
        assertThat(verification.entriesChecked()).isGreaterThanOrEqualTo(3);
    }

    @Test
    void coordinatorsSeeTheVerificationThroughTheApi() {
        world.signIn(world.user("coordinator", null)).request().get("/api/v1/audit/verification")
                .then().statusCode(200).body("intact", equalTo(true));
    }

    @Test
    void anEditedRowIsDetected() throws SQLException {
        assertTampered("UPDATE audit_event SET actor = 'someone else' WHERE sequence_no = (SELECT max(sequence_no) - 1 FROM audit_event)",
                "was altered");
    }

    @Test
    void aDeletedRowIsDetected() throws SQLException {
        assertTampered("DELETE FROM audit_event WHERE sequence_no = (SELECT max(sequence_no) - 1 FROM audit_event)",
                "is missing");
    }

    @Test
    void reorderedRowsAreDetected() throws SQLException {
        assertTampered("""
                CREATE TEMP TABLE last_two ON COMMIT DROP AS SELECT max(sequence_no) AS n FROM audit_event;
                UPDATE audit_event SET sequence_no = 999999999999 WHERE sequence_no = (SELECT n FROM last_two);
                UPDATE audit_event SET sequence_no = (SELECT n FROM last_two) WHERE sequence_no = (SELECT n - 1 FROM last_two);
                UPDATE audit_event SET sequence_no = (SELECT n - 1 FROM last_two) WHERE sequence_no = 999999999999
                """, "");
    }

    @Test
    void anInsertedRowIsDetected() throws SQLException {
        assertTampered("""
                UPDATE audit_event SET sequence_no = sequence_no + 1 WHERE sequence_no = (SELECT max(sequence_no) FROM audit_event);
                INSERT INTO audit_event (sequence_no, occurred_at, actor, action, object_type, previous_hash, entry_hash)
                SELECT max(sequence_no) - 1, now(), 'forger', 'forged', 'nothing', repeat('a', 64), repeat('b', 64) FROM audit_event
                """, "");
    }

    @Test
    void aCutOffTailIsDetectedAgainstTheHeadKeptOutside() throws SQLException {
        String head = audit.verify(null).headHash();
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.execute("ALTER TABLE audit_event DISABLE TRIGGER audit_event_is_append_only");
                s.execute("DELETE FROM audit_event WHERE sequence_no = (SELECT max(sequence_no) FROM audit_event)");
                AuditChain.Verification withoutAnchor = AuditRows.verify(c, null);
                AuditChain.Verification withAnchor = AuditRows.verify(c, head);
                assertThat(withoutAnchor.intact()).as("a shorter chain is still a valid chain").isTrue();
                assertThat(withAnchor.intact()).isFalse();
                assertThat(withAnchor.problem()).contains("chain head differs");
            } finally {
                c.rollback();
            }
        }
        assertThat(audit.verify(head).intact()).isTrue();
    }

    private void assertTampered(String tampering, String expectedProblem) throws SQLException {
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.execute("ALTER TABLE audit_event DISABLE TRIGGER audit_event_is_append_only");
                s.execute(tampering);
                AuditChain.Verification verification = AuditRows.verify(c, null);
                assertThat(verification.intact()).isFalse();
                assertThat(verification.firstBrokenSequenceNo()).isNotNull();
                assertThat(verification.problem()).contains(expectedProblem);
            } finally {
                c.rollback();
            }
        }
        assertThat(audit.verify(null).intact()).as("the rollback restored the chain").isTrue();
    }
}
