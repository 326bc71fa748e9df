package org.roundtable.audit;

import io.agroal.api.AgroalDataSource;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.jboss.logging.MDC;

import java.sql.Connection;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/**
 * Appends to the audit trail inside the caller's transaction, so that a state change and its audit row
 * commit or roll back together. Appends are serialised across all instances by a transaction-scoped
 * advisory lock, which keeps the sequence gap-free and the chain linear.
 */
@ApplicationScoped
public class AuditTrail {

    /** Advisory lock key reserved for audit appends. */
    static final long APPEND_LOCK = 0x52_54_41_55_44_49_54L; // "RTAUDIT"
    private static final int MAX_DETAIL = 4000;

    private final EntityManager entityManager;
    private final AgroalDataSource dataSource;
    private final Clock clock;

    public AuditTrail(EntityManager entityManager, AgroalDataSource dataSource, Clock clock) {
        this.entityManager = entityManager;
        this.dataSource = dataSource;
        this.clock = clock;
    }

    /** What to record. {@code beforeHash}/{@code afterHash} are SHA-256 hex of the object's canonical form, or null. */
    public record Event(Actor actor, String action, String objectType, String objectId, String beforeHash,
                        String afterHash, String detail) {
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public AuditEntry record(Event event) {
        entityManager.createNativeQuery("SELECT pg_advisory_xact_lock(:key)").setParameter("key", APPEND_LOCK)
                .getSingleResult();
        @SuppressWarnings("unchecked")
        List<Object[]> last = entityManager.createNativeQuery(
                "SELECT sequence_no, entry_hash FROM audit_event ORDER BY sequence_no DESC LIMIT 1").getResultList();
        long sequence = last.isEmpty() ? 1 : ((Number) last.get(0)[0]).longValue() + 1;
        String previous = last.isEmpty() ? AuditChain.GENESIS : last.get(0)[1].toString().strip();
        Object requestId = MDC.get("requestId");
        AuditEntry unsigned = new AuditEntry(sequence, AuditChain.storedPrecision(Instant.now(clock)),
                event.actor().name(), event.actor().role(), event.actor().laboratoryId(), event.action(),
                event.objectType(), event.objectId(), event.beforeHash(), event.afterHash(),
                clip(event.detail()), requestId == null ? null : requestId.toString(), previous, null);
        AuditEntry entry = withHash(unsigned);
        entityManager.createNativeQuery("""
                INSERT INTO audit_event (sequence_no, occurred_at, actor, actor_role, laboratory_id, action,
                       object_type, object_id, before_hash, after_hash, detail, request_id, previous_hash, entry_hash)
                VALUES (:seq, :at, :actor, :role, :lab, :action, :type, :id, :before, :after, :detail, :request,
                        :previous, :hash)
                """)
                .setParameter("seq", entry.sequenceNo())
                .setParameter("at", OffsetDateTime.ofInstant(entry.occurredAt(), ZoneOffset.UTC))
                .setParameter("actor", entry.actor())
                .setParameter("role", entry.actorRole())
                .setParameter("lab", entry.laboratoryId())
                .setParameter("action", entry.action())
                .setParameter("type", entry.objectType())
                .setParameter("id", entry.objectId())
                .setParameter("before", entry.beforeHash())
                .setParameter("after", entry.afterHash())
                .setParameter("detail", entry.detail())
                .setParameter("request", entry.requestId())
                .setParameter("previous", entry.previousHash())
                .setParameter("hash", entry.entryHash())
                .executeUpdate();
        return entry;
    }

    /** Recomputes the whole chain and reports the first broken link. */
    public AuditChain.Verification verify(String expectedHead) {
        try (Connection connection = dataSource.getConnection()) {
            return AuditRows.verify(connection, expectedHead);
        } catch (SQLException e) {
            throw new IllegalStateException("could not read the audit trail", e);
        }
    }

    /** A page of entries, newest first, optionally only those before {@code beforeSequence}. */
    @Transactional
    public List<AuditEntry> page(Long beforeSequence, int limit) {
        return entityManager.unwrap(org.hibernate.Session.class).doReturningWork(connection -> {
            try (var statement = connection.prepareStatement(
                    AuditRows.SELECT_COLUMNS + " WHERE sequence_no < ? ORDER BY sequence_no DESC LIMIT ?")) {
                statement.setLong(1, beforeSequence == null ? Long.MAX_VALUE : beforeSequence);
                statement.setInt(2, Math.max(1, Math.min(limit, 1000)));
                try (var rs = statement.executeQuery()) {
                    List<AuditEntry> entries = new java.util.ArrayList<>();
                    while (rs.next()) {
                        entries.add(AuditRows.read(rs));
                    }
                    return entries;
                }
            }
        });
    }

    /** Streams every entry in sequence order to {@code sink} (for exports). */
    public void forEach(java.util.function.Consumer<AuditEntry> sink) {
        try (Connection connection = dataSource.getConnection()) {
            connection.setAutoCommit(false);
            try (var statement = connection.prepareStatement(AuditRows.SELECT_COLUMNS + " ORDER BY sequence_no")) {
                statement.setFetchSize(5000);
                try (var rs = statement.executeQuery()) {
                    while (rs.next()) {
                        sink.accept(AuditRows.read(rs));
                    }
                }
            } finally {
                connection.commit();
            }
        } catch (SQLException e) {
            throw new IllegalStateException("could not read the audit trail", e);
        }
    }

    static AuditEntry withHash(AuditEntry e) {
        return new AuditEntry(e.sequenceNo(), e.occurredAt(), e.actor(), e.actorRole(), e.laboratoryId(), e.action(),
                e.objectType(), e.objectId(), e.beforeHash(), e.afterHash(), e.detail(), e.requestId(),
                e.previousHash(), AuditChain.entryHash(e));
    }

    private static String clip(String detail) {
        return detail == null || detail.length() <= MAX_DETAIL ? detail : detail.substring(0, MAX_DETAIL);
    }
}
