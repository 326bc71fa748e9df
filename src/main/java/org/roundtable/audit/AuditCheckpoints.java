package org.roundtable.audit;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.hibernate.Session;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;

/**
 * How far the audit chain is known to be intact, without re-verifying it on every view: the latest checkpoint
 * (table {@code audit_checkpoint}) says up to which entry the chain was found intact, with that entry's hash, or
 * where it was found broken. {@link #advance} verifies only the entries after the latest checkpoint, at most
 * {@link #ENTRIES_PER_PASS} of them, and appends a checkpoint; {@link #verifyAll} checks the whole chain (the
 * on-demand job, {@link AuditVerificationJob}) and appends a full-check checkpoint.
 *
 * <p>An incremental pass also checks that the checkpoint's entry still carries the checkpoint's hash and that the
 * trail has not become shorter than the checkpoint; a change to an earlier entry is found by the full check (and
 * by {@code verify-audit}). Checkpoints are not recorded in the audit trail: they state a fact about it and change
 * nothing, and recording them would add an entry with every view.
 */
@ApplicationScoped
public class AuditCheckpoints {

    /** The most entries one view verifies (the rest waits for the next view or the full check). */
    public static final int ENTRIES_PER_PASS = 10_000;
    /** Advisory lock key of a checkpoint pass ("RTAUDCP"): one pass at a time, the others show the latest. */
    static final long PASS_LOCK = 0x52_54_41_55_44_43_50L;

    /**
     * The state of the verification as the page shows it.
     *
     * @param verifiedTo   the last entry found intact (0: none yet)
     * @param checkedAt    when the latest checkpoint was taken (null: never)
     * @param intact       false once an entry was found broken
     * @param brokenAt     the first broken entry, when not intact
     * @param problem      what is wrong with it
     * @param lastEntry    the newest entry of the trail now
     * @param lastFullCheck when the whole chain was last checked (null: never)
     */
    public record Status(long verifiedTo, String verifiedHash, Instant checkedAt, boolean intact, Long brokenAt,
                         String problem, long lastEntry, Instant lastFullCheck) {

        /** Entries newer than the checkpoint, not yet verified. */
        public long unverified() {
            return Math.max(0, lastEntry - verifiedTo);
        }
    }

    private final EntityManager entityManager;
    private final Clock clock;
    private final org.roundtable.job.JobService jobs;
    private final AuditTrail audit;

    public AuditCheckpoints(EntityManager entityManager, Clock clock, org.roundtable.job.JobService jobs,
                            AuditTrail audit) {
        this.entityManager = entityManager;
        this.clock = clock;
        this.jobs = jobs;
        this.audit = audit;
    }

    /**
     * Verifies the entries after the latest checkpoint (at most {@link #ENTRIES_PER_PASS}) and appends a
     * checkpoint when the pass learnt something; a broken chain is left as found until the full check. When
     * another pass holds the lock, returns the latest checkpoint as it is.
     */
    @Transactional
    public Status advance(String checkedBy) {
        return entityManager.unwrap(Session.class).doReturningWork(c -> advance(c, checkedBy, ENTRIES_PER_PASS));
    }

    /** {@link #advance(String)} on {@code connection}, inside its transaction, with a limit (for tests). */
    public Status advance(Connection connection, String checkedBy, int limit) throws SQLException {
        boolean locked;
        try (PreparedStatement lock = connection.prepareStatement("SELECT pg_try_advisory_xact_lock(?)")) {
            lock.setLong(1, PASS_LOCK);
            try (ResultSet rs = lock.executeQuery()) {
                rs.next();
                locked = rs.getBoolean(1);
            }
        }
        Status latest = latest(connection);
        if (!locked || !latest.intact()) {
            return latest;
        }
        // the checkpoint's own entry must still be there with the checkpoint's hash
        if (latest.verifiedTo() > 0) {
            String now = hashOf(connection, latest.verifiedTo());
            if (now == null || latest.lastEntry() < latest.verifiedTo()) {
                return append(connection, latest.verifiedTo() - 1, latest.verifiedHash(), false, latest.verifiedTo(),
                        "entry " + latest.verifiedTo() + " is missing (the trail ends before the last checkpoint)",
                        checkedBy, latest.lastFullCheck(), latest.lastEntry());
            }
            if (!now.equals(latest.verifiedHash())) {
                return append(connection, latest.verifiedTo() - 1, latest.verifiedHash(), false, latest.verifiedTo(),
                        "entry " + latest.verifiedTo() + " was altered after it was verified (its hash is not the"
                                + " checkpoint's)", checkedBy, latest.lastFullCheck(), latest.lastEntry());
            }
        }
        if (latest.lastEntry() <= latest.verifiedTo()) {
            return latest;
        }
        AuditRows.Pass pass = AuditRows.verifyAfter(connection, latest.verifiedTo(),
                latest.verifiedTo() == 0 ? AuditChain.GENESIS : latest.verifiedHash(), limit);
        AuditChain.Verification v = pass.verification();
        return append(connection, pass.verifiedTo(), pass.verifiedHash(), false,
                v.intact() ? null : v.firstBrokenSequenceNo(), v.problem(), checkedBy, latest.lastFullCheck(),
                latest.lastEntry());
    }

    /** Queues the check of the whole chain ({@link AuditVerificationJob}) and records who asked. */
    @Transactional
    public org.roundtable.job.Job requestFullCheck(Actor actor) {
        org.roundtable.job.Job job = jobs.enqueue(AuditVerificationJob.KIND, "{}", actor.name());
        audit.record(new AuditTrail.Event(actor, "audit.full-check-requested", "audit-trail", null, null, null,
                "job " + job.id));
        return job;
    }

    /** Verifies the whole chain from entry 1 and appends a full-check checkpoint. */
    @Transactional
    public Status verifyAll(String checkedBy) {
        return entityManager.unwrap(Session.class).doReturningWork(c -> verifyAll(c, checkedBy));
    }

    /** {@link #verifyAll(String)} on {@code connection}, inside its transaction. */
    public Status verifyAll(Connection connection, String checkedBy) throws SQLException {
        AuditChain.Verifier verifier = new AuditChain.Verifier();
        try (PreparedStatement statement = connection.prepareStatement(AuditRows.SELECT_COLUMNS
                + " ORDER BY sequence_no")) {
            statement.setFetchSize(5000);
            try (ResultSet rs = statement.executeQuery()) {
                while (rs.next()) {
                    if (!verifier.accept(AuditRows.read(rs))) {
                        break;
                    }
                }
            }
        }
        AuditChain.Verification v = verifier.result(null);
        return append(connection, verifier.verifiedTo(), verifier.verifiedHash(), true,
                v.intact() ? null : v.firstBrokenSequenceNo(), v.problem(), checkedBy, null, lastEntry(connection));
    }

    /** The latest checkpoint and the newest entry, without verifying anything. */
    @Transactional
    public Status latest() {
        return entityManager.unwrap(Session.class).doReturningWork(this::latest);
    }

    private Status latest(Connection connection) throws SQLException {
        long last = lastEntry(connection);
        Instant full = null;
        try (PreparedStatement s = connection.prepareStatement(
                "SELECT max(checked_at) FROM audit_checkpoint WHERE full_check")) {
            try (ResultSet rs = s.executeQuery()) {
                if (rs.next() && rs.getObject(1) != null) {
                    full = rs.getObject(1, OffsetDateTime.class).toInstant();
                }
            }
        }
        try (PreparedStatement s = connection.prepareStatement("""
                SELECT verified_to, head_hash, checked_at, intact, broken_at, problem
                  FROM audit_checkpoint ORDER BY id DESC LIMIT 1
                """)) {
            try (ResultSet rs = s.executeQuery()) {
                if (!rs.next()) {
                    return new Status(0, AuditChain.GENESIS, null, true, null, null, last, null);
                }
                long broken = rs.getLong(5);
                Long brokenAt = rs.wasNull() ? null : broken;
                return new Status(rs.getLong(1), rs.getString(2).strip(),
                        rs.getObject(3, OffsetDateTime.class).toInstant(), rs.getBoolean(4), brokenAt,
                        rs.getString(6), last, full);
            }
        }
    }

    private Status append(Connection connection, long verifiedTo, String verifiedHash, boolean fullCheck,
                          Long brokenAt, String problem, String checkedBy, Instant lastFullCheck, long lastEntry)
            throws SQLException {
        Instant now = AuditChain.storedPrecision(Instant.now(clock));
        try (PreparedStatement s = connection.prepareStatement("""
                INSERT INTO audit_checkpoint (verified_to, head_hash, full_check, intact, broken_at, problem,
                       checked_by, checked_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)
                """)) {
            s.setLong(1, Math.max(0, verifiedTo));
            s.setString(2, verifiedHash);
            s.setBoolean(3, fullCheck);
            s.setBoolean(4, brokenAt == null);
            s.setObject(5, brokenAt);
            s.setString(6, problem == null ? null : problem.length() > 1000 ? problem.substring(0, 1000) : problem);
            s.setString(7, checkedBy);
            s.setObject(8, OffsetDateTime.ofInstant(now, ZoneOffset.UTC));
            s.executeUpdate();
        }
        return new Status(Math.max(0, verifiedTo), verifiedHash, now, brokenAt == null, brokenAt, problem, lastEntry,
                fullCheck ? now : lastFullCheck);
    }

    private static long lastEntry(Connection connection) throws SQLException {
        try (PreparedStatement s = connection.prepareStatement("SELECT coalesce(max(sequence_no), 0) FROM audit_event");
             ResultSet rs = s.executeQuery()) {
            rs.next();
            return rs.getLong(1);
        }
    }

    private static String hashOf(Connection connection, long sequence) throws SQLException {
        try (PreparedStatement s = connection.prepareStatement("SELECT entry_hash FROM audit_event WHERE sequence_no = ?")) {
            s.setLong(1, sequence);
            try (ResultSet rs = s.executeQuery()) {
                return rs.next() ? rs.getString(1).strip() : null;
            }
        }
    }
}
