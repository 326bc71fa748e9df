package org.roundtable.audit.benchmark;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.flywaydb.core.Flyway;
import org.roundtable.audit.AuditChain;
import org.roundtable.audit.AuditEntry;
import org.roundtable.audit.AuditRows;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Full verification of a 1,000,000-entry audit chain straight from PostgreSQL (goal: ≤ 60 s). The chain is built
 * with the production hashing ({@link AuditChain}) and inserted in batches into the migrated schema; then
 * {@link AuditRows#verify} streams and recomputes it, as the {@code verify-audit} command does. Writes
 * {@code audit-chain.json} in the working directory ({@code target/benchmarks} under {@code -Pbenchmark}).
 */
public final class AuditChainBenchmark {

    static final int ENTRIES = Integer.getInteger("bench.auditEntries", 1_000_000);

    private AuditChainBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        Path work = Files.createTempDirectory("roundtable-audit-bench");
        try (EmbeddedPostgres postgres = EmbeddedPostgres.builder().setDataDirectory(work.resolve("pg")).start()) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            Flyway.configure().dataSource(jdbc, "postgres", "").locations("classpath:db/migration")
                    .placeholders(Map.of("appRole", "roundtable_app")).load().migrate();
            long buildStart = System.nanoTime();
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                c.setAutoCommit(false);
                insertChain(c);
                c.commit();
            }
            double buildSeconds = (System.nanoTime() - buildStart) / 1e9;
            double best = Double.MAX_VALUE;
            AuditChain.Verification verification = null;
            for (int run = 0; run < 3; run++) {
                long start = System.nanoTime();
                try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                    verification = AuditRows.verify(c, null);
                }
                best = Math.min(best, (System.nanoTime() - start) / 1e9);
            }
            Map<String, Object> figures = new LinkedHashMap<>();
            figures.put("entries", ENTRIES);
            figures.put("intact", verification.intact());
            figures.put("entriesChecked", verification.entriesChecked());
            figures.put("buildAndInsertSeconds", Math.round(buildSeconds * 100) / 100.0);
            figures.put("verifySecondsBestOfThree", Math.round(best * 100) / 100.0);
            String json = new ObjectMapper().writerWithDefaultPrettyPrinter().writeValueAsString(figures);
            Files.writeString(Path.of("audit-chain.json"), json);
            System.out.println("Audit chain verification: " + json);
        }
    }

    private static void insertChain(Connection c) throws Exception {
        try (PreparedStatement insert = c.prepareStatement("""
                INSERT INTO audit_event (sequence_no, occurred_at, actor, actor_role, laboratory_id, action, object_type,
                       object_id, before_hash, after_hash, detail, request_id, previous_hash, entry_hash)
                VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
                """)) {
            String previous = AuditChain.GENESIS;
            Instant t0 = Instant.parse("2026-01-01T00:00:00Z");
            for (int i = 1; i <= ENTRIES; i++) {
                AuditEntry unsigned = new AuditEntry(i, t0.plusMillis(i * 37L), "user" + (i % 50), "lab-member",
                        (long) (i % 1000), "submission.revision-accepted", "submission", i + "/1", null,
                        "a".repeat(64), "round=1 laboratory=" + (i % 1000), "req" + i, previous, null);
                String hash = AuditChain.entryHash(unsigned);
                insert.setLong(1, i);
                insert.setObject(2, OffsetDateTime.ofInstant(unsigned.occurredAt(), ZoneOffset.UTC));
                insert.setString(3, unsigned.actor());
                insert.setString(4, unsigned.actorRole());
                insert.setLong(5, unsigned.laboratoryId());
                insert.setString(6, unsigned.action());
                insert.setString(7, unsigned.objectType());
                insert.setString(8, unsigned.objectId());
                insert.setString(9, null);
                insert.setString(10, unsigned.afterHash());
                insert.setString(11, unsigned.detail());
                insert.setString(12, unsigned.requestId());
                insert.setString(13, previous);
                insert.setString(14, hash);
                insert.addBatch();
                previous = hash;
                if (i % 5000 == 0) {
                    insert.executeBatch();
                }
            }
            insert.executeBatch();
        }
    }
}
