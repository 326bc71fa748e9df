package org.roundtable.report;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.platform.Secrets;

import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.temporal.ChronoUnit;

/**
 * A fixed-window limit on public verifications per client and minute, counted in PostgreSQL (table
 * {@code verification_rate}) so that all instances behind the load balancer share it. The client is stored
 * only as the SHA-256 of its address. Windows older than an hour are deleted as new hits are counted.
 */
@ApplicationScoped
public class VerificationRateLimit {

    private final EntityManager entityManager;
    private final Clock clock;
    private final int perMinute;

    public VerificationRateLimit(EntityManager entityManager, Clock clock,
                                 @ConfigProperty(name = "roundtable.verification.per-minute", defaultValue = "30") int perMinute) {
        this.entityManager = entityManager;
        this.clock = clock;
        this.perMinute = perMinute;
    }

    /** Counts one verification by {@code clientAddress}; false when the client is over the configured limit. */
    public boolean admit(String clientAddress) {
        return admit(clientAddress, perMinute);
    }

    /** Counts one verification by {@code clientAddress}; false when this minute's count exceeds {@code limit}. */
    public boolean admit(String clientAddress, int limit) {
        String client = Secrets.sha256Hex(clientAddress == null ? "unknown" : clientAddress);
        Instant window = Instant.now(clock).truncatedTo(ChronoUnit.MINUTES);
        OffsetDateTime windowStart = OffsetDateTime.ofInstant(window, ZoneOffset.UTC);
        int hits = QuarkusTransaction.requiringNew().call(() -> {
            entityManager.createNativeQuery("DELETE FROM verification_rate WHERE window_start < :cutoff")
                    .setParameter("cutoff", windowStart.minusHours(1)).executeUpdate();
            return ((Number) entityManager.createNativeQuery("""
                    INSERT INTO verification_rate (client_hash, window_start, hits) VALUES (:client, :window, 1)
                    ON CONFLICT (client_hash, window_start) DO UPDATE SET hits = verification_rate.hits + 1
                    RETURNING hits
                    """)
                    .setParameter("client", client)
                    .setParameter("window", windowStart)
                    .getSingleResult()).intValue();
        });
        return hits <= limit;
    }
}
