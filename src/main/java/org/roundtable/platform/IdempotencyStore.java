package org.roundtable.platform;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;
import java.util.regex.Pattern;

/**
 * Makes a POST safe to retry (IETF draft-ietf-httpapi-idempotency-key-header-07): the first request with a key
 * does the work and stores its answer in the same transaction; a retry with the same key and the same payload gets
 * the stored answer; the same key with a different payload is refused (422).
 *
 * <p>Use inside the caller's transaction:
 * <pre>
 *   Optional&lt;StoredAnswer&gt; earlier = idempotency.claim(scope, key, payloadHash);
 *   if (earlier.isPresent()) return earlier.get();   // a retry
 *   ... do the work ...
 *   idempotency.complete(scope, key, 201, receiptJson);
 * </pre>
 * The claim inserts the key first; a concurrent request with the same key blocks on the primary key until this
 * transaction ends, then sees the stored answer (or, if this one rolled back, does the work itself). Records older
 * than {@link #RETENTION} may be purged.
 */
@ApplicationScoped
public class IdempotencyStore {

    public static final Duration RETENTION = Duration.ofDays(30);
    private static final Pattern KEY = Pattern.compile("[A-Za-z0-9._:-]{8,255}");

    private final EntityManager entityManager;
    private final Clock clock;

    public IdempotencyStore(EntityManager entityManager, Clock clock) {
        this.entityManager = entityManager;
        this.clock = clock;
    }

    /** The answer given to the first request with a key. */
    public record StoredAnswer(int statusCode, String body) {
    }

    /**
     * Claims {@code key} for this transaction, or returns the answer stored by an earlier request with it.
     *
     * @throws DomainException.BadRequest    the key is malformed (8 to 255 of {@code A-Z a-z 0-9 . _ : -})
     * @throws DomainException.Unprocessable the key was used before with a different payload
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public Optional<StoredAnswer> claim(String scope, String key, String requestHash) {
        if (key == null || !KEY.matcher(key).matches()) {
            throw new DomainException.BadRequest("The Idempotency-Key header needs 8 to 255 characters of A-Z, a-z, 0-9, . _ : -");
        }
        int inserted = entityManager.createNativeQuery("""
                INSERT INTO idempotency_record (scope, idempotency_key, request_hash, created_at)
                VALUES (:scope, :key, :hash, :now)
                ON CONFLICT (scope, idempotency_key) DO NOTHING
                """)
                .setParameter("scope", scope).setParameter("key", key).setParameter("hash", requestHash)
                .setParameter("now", now())
                .executeUpdate();
        if (inserted == 1) {
            return Optional.empty();
        }
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT request_hash, status_code, response_body FROM idempotency_record
                 WHERE scope = :scope AND idempotency_key = :key
                """).setParameter("scope", scope).setParameter("key", key).getResultList();
        Object[] row = rows.get(0);
        if (!requestHash.equals(row[0].toString().strip())) {
            throw new DomainException.Unprocessable(
                    "This Idempotency-Key was already used for a different request. Use a new key for new data.");
        }
        if (row[1] == null) {
            // cannot happen after the other transaction committed; kept as a clear failure rather than a guess
            throw new DomainException.Conflict("A request with this Idempotency-Key is still being processed.");
        }
        return Optional.of(new StoredAnswer(((Number) row[1]).intValue(), (String) row[2]));
    }

    /** Stores the answer of the request that claimed {@code key}; must run in the same transaction as the claim. */
    @Transactional(Transactional.TxType.MANDATORY)
    public void complete(String scope, String key, int statusCode, String body) {
        int updated = entityManager.createNativeQuery("""
                UPDATE idempotency_record SET status_code = :status, response_body = :body, completed_at = :now
                 WHERE scope = :scope AND idempotency_key = :key AND status_code IS NULL
                """)
                .setParameter("status", statusCode).setParameter("body", body).setParameter("now", now())
                .setParameter("scope", scope).setParameter("key", key)
                .executeUpdate();
        if (updated != 1) {
            throw new IllegalStateException("complete() without a claim for " + scope + "/" + key);
        }
    }

    /** Removes records past the retention period; safe on several instances. */
    @Transactional
    public int purgeExpired() {
        return entityManager.createNativeQuery("DELETE FROM idempotency_record WHERE created_at < :limit")
                .setParameter("limit", now().minus(RETENTION)).executeUpdate();
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
