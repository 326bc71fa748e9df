package org.roundtable.audit;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.OffsetDateTime;

/** Streams the audit trail out of PostgreSQL in sequence order (plain JDBC, usable without the server). */
public final class AuditRows {

    /** The columns {@link #read} expects, in order. */
    static final String SELECT_COLUMNS = """
            SELECT sequence_no, occurred_at, actor, actor_role, laboratory_id, action, object_type, object_id,
                   before_hash, after_hash, detail, request_id, previous_hash, entry_hash
              FROM audit_event
            """;

    private AuditRows() {
    }

    /** Verifies the whole chain on {@code connection}; {@code expectedHead} may be null. */
    public static AuditChain.Verification verify(Connection connection, String expectedHead) throws SQLException {
        AuditChain.Verifier verifier = new AuditChain.Verifier();
        boolean autoCommit = connection.getAutoCommit();
        if (autoCommit) {
            connection.setAutoCommit(false); // a cursor (fetch size) needs a transaction in PostgreSQL
        }
        try (PreparedStatement statement = connection.prepareStatement(SELECT_COLUMNS + " ORDER BY sequence_no")) {
            statement.setFetchSize(5000);
            try (ResultSet rs = statement.executeQuery()) {
                while (rs.next()) {
                    if (!verifier.accept(read(rs))) {
                        break;
                    }
                }
            }
        } finally {
            if (autoCommit) {
                connection.commit();
                connection.setAutoCommit(true);
            }
        }
        return verifier.result(expectedHead);
    }

    /**
     * How far one bounded pass of the verification got: its outcome (entries checked in this pass), the last entry
     * found intact and its hash, and whether entries after the pass remain unchecked.
     */
    public record Pass(AuditChain.Verification verification, long verifiedTo, String verifiedHash, boolean more) {
    }

    /**
     * Verifies at most {@code limit} entries after entry {@code verifiedTo} (found intact earlier with hash
     * {@code verifiedHash}), in sequence order, on {@code connection} inside its current transaction: the
     * incremental check from a checkpoint. An entry changed at or before {@code verifiedTo} is not seen here; the
     * full check ({@link #verify}) sees it.
     */
    public static Pass verifyAfter(Connection connection, long verifiedTo, String verifiedHash, int limit)
            throws SQLException {
        AuditChain.Verifier verifier = new AuditChain.Verifier(verifiedTo, verifiedHash);
        int read = 0;
        // one entry more than the limit tells whether more remain
        try (PreparedStatement statement = connection.prepareStatement(SELECT_COLUMNS
                + " WHERE sequence_no > ? ORDER BY sequence_no LIMIT ?")) {
            statement.setLong(1, verifiedTo);
            statement.setInt(2, limit + 1);
            try (ResultSet rs = statement.executeQuery()) {
                while (rs.next()) {
                    if (++read > limit) {
                        break;
                    }
                    if (!verifier.accept(read(rs))) {
                        break;
                    }
                }
            }
        }
        AuditChain.Verification outcome = verifier.result(null);
        return new Pass(outcome, verifier.verifiedTo(), verifier.verifiedHash(), outcome.intact() && read > limit);
    }

    static AuditEntry read(ResultSet rs) throws SQLException {
        long lab = rs.getLong(5);
        Long laboratoryId = rs.wasNull() ? null : lab;
        return new AuditEntry(rs.getLong(1), rs.getObject(2, OffsetDateTime.class).toInstant(), rs.getString(3),
                rs.getString(4), laboratoryId, rs.getString(6), rs.getString(7), rs.getString(8),
                trimmed(rs.getString(9)), trimmed(rs.getString(10)), rs.getString(11), rs.getString(12),
                trimmed(rs.getString(13)), trimmed(rs.getString(14)));
    }

    private static String trimmed(String fixedWidth) {
        return fixedWidth == null ? null : fixedWidth.strip();
    }
}
