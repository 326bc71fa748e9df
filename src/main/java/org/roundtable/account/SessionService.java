package org.roundtable.account;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.roundtable.platform.Timestamps;
import org.roundtable.platform.Secrets;

import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;

/**
 * Database-backed sessions, so that every instance sees the same sessions and ending one takes effect
 * everywhere at once (ASVS v5.0.0-7.2.x, 7.3.x, 7.4.x). The cookie carries a random 256-bit token; the
 * database keeps only its SHA-256. Each request re-reads the user's role and enabled flag, so disabling an
 * account or changing its role applies on its next request.
 */
@ApplicationScoped
public class SessionService {

    /** last_seen_at is written at most this often, to keep reads from turning into writes. */
    static final Duration TOUCH_INTERVAL = Duration.ofSeconds(30);

    private final EntityManager entityManager;
    private final SecuritySettings settings;
    private final Clock clock;

    public SessionService(EntityManager entityManager, SecuritySettings settings, Clock clock) {
        this.entityManager = entityManager;
        this.settings = settings;
        this.clock = clock;
    }

    /** Who a valid session belongs to, as read from the database on this request. */
    public record SessionPrincipal(long userId, String username, String displayName, Role role, Long laboratoryId,
                                   String sessionHash, boolean twoStepOn) {
    }

    /** How long a password-checked sign-in may wait for its second step. */
    static final Duration SECOND_STEP_WINDOW = Duration.ofMinutes(5);

    /** Starts a session for {@code userId} and returns the cookie token (shown to nobody else). */
    public String start(long userId) {
        return insert(userId, false, settings.absoluteTimeout());
    }

    /** Records a password-checked sign-in that still needs its second step; not a session until completed. */
    public String startAwaitingSecondStep(long userId) {
        return insert(userId, true, SECOND_STEP_WINDOW);
    }

    /**
     * Ends a sign-in awaiting its second step and returns its user, if it is still valid. The caller starts the real
     * session (a new token: the awaiting token never becomes a session token).
     */
    public java.util.Optional<Long> takeAwaitingSecondStep(String token) {
        if (token == null || token.isBlank() || token.length() > 100) {
            return java.util.Optional.empty();
        }
        return QuarkusTransaction.requiringNew().call(() -> {
            @SuppressWarnings("unchecked")
            List<Number> users = entityManager.createNativeQuery("""
                    SELECT user_id FROM user_session
                     WHERE token_hash = :hash AND awaiting_second_step AND ended_at IS NULL AND expires_at > :now
                    """).setParameter("hash", Secrets.sha256Hex(token)).setParameter("now", now()).getResultList();
            return users.stream().findFirst().map(Number::longValue);
        });
    }

    private String insert(long userId, boolean awaitingSecondStep, Duration lifetime) {
        String token = Secrets.randomToken(32);
        OffsetDateTime now = now();
        QuarkusTransaction.requiringNew().run(() -> entityManager.createNativeQuery("""
                INSERT INTO user_session (token_hash, user_id, created_at, last_seen_at, expires_at, awaiting_second_step)
                VALUES (:hash, :user, :now, :now, :expires, :awaiting)
                """)
                .setParameter("hash", Secrets.sha256Hex(token))
                .setParameter("user", userId)
                .setParameter("now", now)
                .setParameter("expires", now.plus(lifetime))
                .setParameter("awaiting", awaitingSecondStep)
                .executeUpdate());
        return token;
    }

    /** The principal of a live session, or empty when it is unknown, ended, expired, idle too long or disabled. */
    public Optional<SessionPrincipal> resolve(String token) {
        if (token == null || token.isBlank() || token.length() > 100) {
            return Optional.empty();
        }
        String hash = Secrets.sha256Hex(token);
        OffsetDateTime now = now();
        return QuarkusTransaction.requiringNew().call(() -> {
            @SuppressWarnings("unchecked")
            List<Object[]> rows = entityManager.createNativeQuery("""
                    SELECT u.id, u.username, u.display_name, u.role, u.laboratory_id, s.last_seen_at,
                           EXISTS (SELECT 1 FROM user_two_step t WHERE t.user_id = u.id AND t.confirmed_at IS NOT NULL)
                      FROM user_session s JOIN app_user u ON u.id = s.user_id
                     WHERE s.token_hash = :hash AND s.ended_at IS NULL AND u.enabled AND NOT s.awaiting_second_step
                       AND s.expires_at > :now AND s.last_seen_at > :idleLimit
                    """)
                    .setParameter("hash", hash)
                    .setParameter("now", now)
                    .setParameter("idleLimit", now.minus(settings.idleTimeout()))
                    .getResultList();
            if (rows.isEmpty()) {
                return Optional.<SessionPrincipal>empty();
            }
            Object[] row = rows.get(0);
            OffsetDateTime lastSeen = Timestamps.utc(row[5]);
            if (lastSeen.plus(TOUCH_INTERVAL).isBefore(now)) {
                entityManager.createNativeQuery("UPDATE user_session SET last_seen_at = :now WHERE token_hash = :hash")
                        .setParameter("now", now).setParameter("hash", hash).executeUpdate();
            }
            return Optional.of(new SessionPrincipal(((Number) row[0]).longValue(), (String) row[1], (String) row[2],
                    Role.fromName((String) row[3]).orElseThrow(),
                    row[4] == null ? null : ((Number) row[4]).longValue(), hash, Boolean.TRUE.equals(row[6])));
        });
    }

    /** Ends one session (sign-out). */
    public void end(String sessionHash, String reason) {
        QuarkusTransaction.joiningExisting().run(() -> entityManager.createNativeQuery("""
                UPDATE user_session SET ended_at = :now, end_reason = :reason
                 WHERE token_hash = :hash AND ended_at IS NULL
                """)
                .setParameter("now", now()).setParameter("reason", reason).setParameter("hash", sessionHash)
                .executeUpdate());
    }

    /** Ends every session of a user (account disabled, role or password changed). */
    public int endAllOf(long userId, String reason) {
        return QuarkusTransaction.joiningExisting().call(() -> entityManager.createNativeQuery("""
                UPDATE user_session SET ended_at = :now, end_reason = :reason
                 WHERE user_id = :user AND ended_at IS NULL
                """)
                .setParameter("now", now()).setParameter("reason", reason).setParameter("user", userId)
                .executeUpdate());
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
