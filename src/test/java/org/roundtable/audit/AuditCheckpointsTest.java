package org.roundtable.audit;

import io.agroal.api.AgroalDataSource;
import io.quarkus.agroal.DataSource;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.World;

import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The audit page's verification from checkpoints: a pass checks only the entries after the latest checkpoint (a
 * bounded number; run in the background, a view only reads the checkpoint), a tampered entry after the checkpoint is found, one before it is left to the full check; and
 * the page's filters and keyset paging.
 */
@QuarkusTest
class AuditCheckpointsTest {

    @Inject
    World world;

    @Inject
    AuditCheckpoints checkpoints;

    @Inject
    AuditSearch search;

    @Inject
    AuditCheckpointSchedule schedule;

    @Inject
    JobRunner runner;

    @Inject
    @DataSource("owner")
    AgroalDataSource owner;

    private long countCheckpoints() {
        try (Connection c = owner.getConnection(); Statement s = c.createStatement();
             java.sql.ResultSet rs = s.executeQuery("SELECT count(*) FROM audit_checkpoint")) {
            rs.next();
            return rs.getLong(1);
        } catch (SQLException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Three API tokens created by a fresh manager: three new entries by one actor. */
    private String threeEntries() {
        String username = world.user("lab-manager", world.laboratory());
        World.Browser manager = world.signIn(username);
        for (int i = 0; i < 3; i++) {
            manager.json().body("{\"name\":\"checkpoint " + i + "\"}").post("/api/v1/my-laboratory/tokens")
                    .then().statusCode(200);
        }
        return username;
    }

    private AuditCheckpoints.Status caughtUp() {
        AuditCheckpoints.Status status = checkpoints.advance("test");
        while (status.intact() && status.unverified() > 0) {
            status = checkpoints.advance("test");
        }
        assertThat(status.intact()).as(status.problem()).isTrue();
        return status;
    }

    @Test
    void aViewVerifiesOnlyTheEntriesAfterTheCheckpointAndAtMostItsLimit() throws SQLException {
        AuditCheckpoints.Status before = caughtUp();
        threeEntries();
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try {
                AuditCheckpoints.Status one = checkpoints.advance(c, "test", 1);
                assertThat(one.intact()).isTrue();
                assertThat(one.verifiedTo()).isEqualTo(before.verifiedTo() + 1);
                assertThat(one.unverified()).isGreaterThanOrEqualTo(2);
                AuditCheckpoints.Status rest = checkpoints.advance(c, "test", 1000);
                assertThat(rest.verifiedTo()).isEqualTo(rest.lastEntry());
                assertThat(rest.unverified()).isZero();
            } finally {
                c.rollback();
            }
        }
    }

    @Test
    void aTamperedEntryAfterTheCheckpointIsFoundByTheIncrementalCheck() throws SQLException {
        AuditCheckpoints.Status checkpoint = caughtUp();
        threeEntries();
        long tampered = checkpoint.verifiedTo() + 2;
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.execute("ALTER TABLE audit_event DISABLE TRIGGER audit_event_is_append_only");
                s.execute("UPDATE audit_event SET actor = 'someone else' WHERE sequence_no = " + tampered);
                AuditCheckpoints.Status found = checkpoints.advance(c, "test", 1000);
                assertThat(found.intact()).isFalse();
                assertThat(found.brokenAt()).isEqualTo(tampered);
                assertThat(found.problem()).contains("was altered");
                assertThat(found.verifiedTo()).as("the entry before it is intact").isEqualTo(tampered - 1);
                // and it stays broken on the next view, until a full check finds the chain intact again
                assertThat(checkpoints.advance(c, "test", 1000).intact()).isFalse();
            } finally {
                c.rollback();
            }
        }
        assertThat(caughtUp().intact()).as("the rollback restored the chain").isTrue();
    }

    @Test
    void anEntryChangedBeforeTheCheckpointIsLeftToTheFullCheck() throws SQLException {
        threeEntries();
        AuditCheckpoints.Status checkpoint = caughtUp();
        long tampered = checkpoint.verifiedTo() - 1;
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.execute("ALTER TABLE audit_event DISABLE TRIGGER audit_event_is_append_only");
                s.execute("UPDATE audit_event SET detail = 'rewritten' WHERE sequence_no = " + tampered);
                assertThat(checkpoints.advance(c, "test", 1000).intact()).as("the incremental check").isTrue();
                AuditCheckpoints.Status full = checkpoints.verifyAll(c, "test");
                assertThat(full.intact()).isFalse();
                assertThat(full.brokenAt()).isEqualTo(tampered);
            } finally {
                c.rollback();
            }
        }
    }

    @Test
    void theCheckpointsOwnEntryRewrittenIsFound() throws SQLException {
        threeEntries();
        AuditCheckpoints.Status checkpoint = caughtUp();
        try (Connection c = owner.getConnection()) {
            c.setAutoCommit(false);
            try (Statement s = c.createStatement()) {
                s.execute("ALTER TABLE audit_event DISABLE TRIGGER audit_event_is_append_only");
                s.execute("UPDATE audit_event SET entry_hash = repeat('e', 64) WHERE sequence_no = "
                        + checkpoint.verifiedTo());
                AuditCheckpoints.Status found = checkpoints.advance(c, "test", 1000);
                assertThat(found.intact()).isFalse();
                assertThat(found.brokenAt()).isEqualTo(checkpoint.verifiedTo());
            } finally {
                c.rollback();
            }
        }
    }

    @Test
    void theFiltersAndKeysetPagingFindOneActorsEntries() {
        String actor = threeEntries();
        AuditSearch.Slice mine = search.page(new AuditSearch.Filter(actor, null, null, null), null, null, 2);
        assertThat(mine.entries()).hasSize(2).allMatch(e -> e.actor().equals(actor));
        assertThat(mine.older()).isNotNull();
        AuditSearch.Slice older = search.page(new AuditSearch.Filter(actor, null, null, null), mine.older(), null, 2);
        assertThat(older.entries()).hasSize(1).allMatch(e -> e.actor().equals(actor));
        assertThat(older.entries().get(0).sequenceNo()).isLessThan(mine.entries().get(1).sequenceNo());
        assertThat(older.older()).isNull();
        assertThat(older.newer()).isNotNull();
        AuditSearch.Slice newer = search.page(new AuditSearch.Filter(actor, null, null, null), null, older.newer(), 2);
        assertThat(newer.entries()).extracting(AuditEntry::sequenceNo)
                .containsExactlyElementsOf(mine.entries().stream().map(AuditEntry::sequenceNo).toList());

        AuditSearch.Slice tokens = search.page(new AuditSearch.Filter(actor, "api-token.created", "api-token", null),
                null, null, 10);
        assertThat(tokens.entries()).hasSize(3);
        assertThat(search.page(new AuditSearch.Filter(actor, "round.created", null, null), null, null, 10).entries())
                .isEmpty();
        assertThat(search.actions()).extracting(AuditSearch.Choice::value).contains("api-token.created");
        assertThat(AuditSearch.label("api-token.created")).isEqualTo("API token created");
        assertThat(AuditSearch.label("round.close")).isEqualTo("Close for results");
    }

    @Test
    void theAuditPageShowsTheCheckpointFiltersInWordsAndChecksTheWholeChainOnDemand() {
        String actor = threeEntries();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        // the background pass that the test profile does not schedule; the view itself only reads the checkpoint
        schedule.catchUp(AuditCheckpointSchedule.PASSES_PER_TICK);
        long before = countCheckpoints();
        String html = coordinator.request().queryParam("actor", actor).get("/audit").then().statusCode(200)
                .extract().asString();
        assertThat(html).contains("Verified up to entry").contains("API token created")
                .doesNotContain("<td>api-token.created</td>");
        assertThat(html.split("<tr><td class=\"num\">", -1).length - 1).isEqualTo(3);
        assertThat(countCheckpoints()).as("a view writes no checkpoint").isEqualTo(before);

        String location = coordinator.form().redirects().follow(false)
                .post("/audit/verification").then().statusCode(303).extract().header("Location");
        assertThat(location).contains("/audit?check=");
        while (runner.runNext(AuditVerificationJob.KIND)) {
            // the test profile polls no jobs by itself: run the check here, as a worker would
        }
        String after = coordinator.request().get(location.substring(location.indexOf("/audit"))).then()
                .statusCode(200).extract().asString();
        assertThat(after).contains("Check of the whole chain: Done").contains("the whole chain was last checked");
    }
}
