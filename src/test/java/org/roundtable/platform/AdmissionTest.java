package org.roundtable.platform;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.sql.SQLException;
import java.time.Duration;
import java.time.Instant;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * Admission answers 503 with Retry-After and the problem body (with the request id) when uploads are all being
 * read, and while the database is unavailable; it lets requests in again once the database answers.
 */
@QuarkusTest
class AdmissionTest {

    @Inject
    World world;

    @Inject
    Admission admission;

    @Test
    void anUploadFindingEverySlotTakenWaitsBrieflyThenGets503WithRetryAfter() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        try (Admission.Slot first = admission.uploadSlot(); Admission.Slot second = admission.uploadSlot()) {
            Response answer = given().header("Authorization", "Bearer " + token).header("X-Request-Id", "upload-wait-01")
                    .contentType("application/json").body("{\"results\":[]}")
                    .post("/api/v1/my-rounds/" + round + "/submission");
            assertThat(answer.statusCode()).isEqualTo(503);
            assertThat(answer.header("Retry-After")).isEqualTo("2");
            assertThat(answer.jsonPath().getString("requestId")).isEqualTo("upload-wait-01");
            assertThat(answer.jsonPath().getString("detail")).contains("uploads");
        }
        assertThat(world.submitCr(round, lab, "18.20")).isNotBlank();
    }

    @Test
    void whileTheDatabaseIsUnavailableRequestsGet503AndAfterwardsAreAdmittedAgain() throws InterruptedException {
        String member = world.user("lab-member", world.laboratory());
        World.Browser browser = world.signIn(member);
        assertThat(admission.isDatabaseOutage(new SQLException("the connection was lost", "08006"))).isTrue();
        Response refused = browser.request().accept("application/json").header("X-Request-Id", "outage-000001")
                .get("/api/v1/me");
        assertThat(refused.statusCode()).isEqualTo(503);
        assertThat(refused.header("Retry-After")).isEqualTo("5");
        assertThat(refused.jsonPath().getString("requestId")).isEqualTo("outage-000001");
        given().get("/q/health/live").then().statusCode(200);
        // the database is in fact there: the probe finds it within a few seconds
        Instant until = Instant.now().plus(Duration.ofSeconds(20));
        while (!admission.databaseAvailable() && Instant.now().isBefore(until)) {
            Thread.sleep(200);
        }
        assertThat(admission.databaseAvailable()).isTrue();
        browser.request().get("/api/v1/me").then().statusCode(200);
    }

    @Test
    void aRefusedStatementIsNotAnOutage() {
        assertThat(admission.isDatabaseOutage(new SQLException("duplicate key", "23505"))).isFalse();
        assertThat(admission.isDatabaseOutage(new IllegalStateException("no"))).isFalse();
        assertThat(admission.databaseAvailable()).isTrue();
    }

    /**
     * The shape the fault campaign found (a 500 during an external PostgreSQL restart): a commit that failed because
     * the server went away reaches the error mapper as CDI's wrapper around the transaction manager's
     * RollbackException, whose only trace of the database is a suppressed XAException caused by the driver's
     * "terminating connection due to administrator command" (SQLState 57P01).
     */
    @Test
    void aCommitThatFailedBecauseTheServerWentAwayIsAnOutageThoughTheCauseIsOnlySuppressed() {
        SQLException driver = new SQLException("FATAL: terminating connection due to administrator command", "57P01");
        javax.transaction.xa.XAException xa = new javax.transaction.xa.XAException(
                "Error trying to transactionCommit local transaction: " + driver.getMessage());
        xa.initCause(driver);
        jakarta.transaction.RollbackException rollback = new jakarta.transaction.RollbackException(
                "ARJUNA016053: Could not commit transaction.");
        rollback.addSuppressed(xa);
        RuntimeException wrapped = new io.quarkus.arc.ArcUndeclaredThrowableException("Error invoking subclass method", rollback);
        assertThat(Admission.outageCause(wrapped)).isSameAs(driver);
    }

    @Test
    void aClosedConnectionWithoutSqlStateIsAnOutage() {
        SQLException closed = new SQLException("This connection has been closed.");
        assertThat(Admission.outageCause(new IllegalStateException("rollback failed",
                new RuntimeException("Unable to rollback against JDBC Connection", closed)))).isSameAs(closed);
        SQLException next = new SQLException("batch entry 3 failed", "25P02");
        SQLException lost = new SQLException("An I/O error occurred while sending to the backend.", "08006");
        next.setNextException(lost);
        assertThat(Admission.outageCause(next)).isSameAs(lost);
    }

    @Test
    void aCycleOfCausesEndsTheSearchWithoutAnOutage() {
        RuntimeException first = new RuntimeException("first");
        RuntimeException second = new RuntimeException("second", first);
        first.addSuppressed(second);
        assertThat(Admission.outageCause(second)).isNull();
        assertThat(Admission.outageCause(new SQLException("closed text but a refused statement", "23505"))).isNull();
    }
}
