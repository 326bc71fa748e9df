package org.roundtable.account;

import io.quarkus.narayana.jta.QuarkusTransaction;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Locale;
import java.util.Optional;

/**
 * Sign-in with username and password, throttled per username in the database (ASVS v5.0.0-6.3.1): after
 * {@code max-failed-sign-ins} failures within {@code throttle-window}, further attempts are refused until the
 * window has passed. Unknown users, wrong passwords and disabled accounts get the same answer after the
 * same work.
 * <p>
 * Each attempt is <em>reserved</em> before the password (or second-step code) is checked: under a per-username
 * advisory lock, the recent failures are counted and the attempt is inserted as a failure, in one short
 * transaction; only a correct check then settles it as a success. Parallel guesses therefore queue on the lock
 * and see each other's reservations, so no more than the limit are ever checked, however many arrive at once;
 * an attempt whose server dies mid-check stays counted as a failure.
 */
@ApplicationScoped
public class SignInService {

    public static final String GENERIC_FAILURE = "The username or password is not correct.";
    public static final String THROTTLED = "Too many failed sign-ins for this username. Try again in a few minutes.";

    private final UserAccountRepository users;
    private final Passwords passwords;
    private final SessionService sessions;
    private final SecuritySettings settings;
    private final EntityManager entityManager;
    private final TwoStepService twoStep;
    private final Clock clock;

    public SignInService(UserAccountRepository users, Passwords passwords, SessionService sessions,
                         SecuritySettings settings, EntityManager entityManager, TwoStepService twoStep, Clock clock) {
        this.users = users;
        this.passwords = passwords;
        this.sessions = sessions;
        this.settings = settings;
        this.entityManager = entityManager;
        this.twoStep = twoStep;
        this.clock = clock;
    }

    /** Thrown when sign-in is refused; the message is safe to show. */
    public static class SignInRefused extends DomainException {
        public SignInRefused(String message, int status) {
            super(status, "Sign-in refused", message);
        }
    }

    /**
     * The outcome of a correct password: a session token, or — when two-step sign-in is on — a token that only
     * {@link #completeSecondStep} accepts.
     */
    public record SignInResult(String token, boolean secondStepNeeded) {
    }

    /** Checks the credentials and starts a session (or the wait for the second step). */
    public SignInResult signIn(String username, String password, String remoteAddress) {
        String name = username == null ? "" : username.strip().toLowerCase(Locale.ROOT);
        if (name.isEmpty() || name.length() > 64) {
            passwords.burnVerificationTime(password);
            throw new SignInRefused(GENERIC_FAILURE, 401);
        }
        long attempt = reserveAttempt(name, remoteAddress);
        Optional<UserAccount> user = QuarkusTransaction.requiringNew().call(() ->
                users.find("username", name).firstResultOptional());
        boolean ok = user.isPresent() && user.get().enabled && user.get().passwordHash != null
                && passwords.matches(password, user.get().passwordHash);
        if (user.isEmpty() || user.get().passwordHash == null) {
            passwords.burnVerificationTime(password);
        }
        if (!ok) {
            SecurityLog.event("sign-in-failed", name, user.isPresent() && !user.get().enabled ? "reason=disabled" : "");
            throw new SignInRefused(GENERIC_FAILURE, 401);
        }
        settleAsSuccess(attempt);
        if (twoStep.status(user.get().id) == TwoStepService.Status.ON) {
            SecurityLog.event("sign-in-password-ok", name, "second step needed");
            return new SignInResult(sessions.startAwaitingSecondStep(user.get().id), true);
        }
        SecurityLog.event("sign-in", name, "role=" + user.get().role);
        return new SignInResult(sessions.start(user.get().id), false);
    }

    /** Completes a sign-in with the second step; returns the session token. */
    public String completeSecondStep(String awaitingToken, String code, String remoteAddress) {
        Long userId = sessions.takeAwaitingSecondStep(awaitingToken)
                .orElseThrow(() -> new SignInRefused("This sign-in has expired. Please sign in again.", 401));
        String name = QuarkusTransaction.requiringNew().call(() -> users.findById(userId).username);
        long attempt = reserveAttempt(name, remoteAddress);
        boolean ok = QuarkusTransaction.requiringNew().call(() -> twoStep.verifySecondStep(userId, code));
        if (!ok) {
            SecurityLog.event("sign-in-second-step-failed", name, "");
            throw new SignInRefused("That code is not right.", 401);
        }
        settleAsSuccess(attempt);
        sessions.end(Secrets.sha256Hex(awaitingToken), "second-step-done");
        SecurityLog.event("sign-in", name, "two-step");
        return sessions.start(userId);
    }

    /**
     * Reserves one attempt for {@code name}: under a transaction-scoped advisory lock on the username, counts the
     * failures in the window and records this attempt as a failure. Returns the attempt's id, or throws
     * {@link SignInRefused} (429) when the limit is reached — the refused attempt is recorded too, so a
     * continuing attack keeps the username throttled.
     */
    private long reserveAttempt(String name, String remoteAddress) {
        OffsetDateTime now = now();
        long[] outcome = QuarkusTransaction.requiringNew().call(() -> {
            entityManager.createNativeQuery("SELECT count(*) FROM (SELECT pg_advisory_xact_lock(hashtext(:key))) AS locked")
                    .setParameter("key", "sign-in:" + name)
                    .getSingleResult();
            long recentFailures = ((Number) entityManager.createNativeQuery("""
                    SELECT count(*) FROM login_attempt
                     WHERE username = :name AND NOT succeeded AND attempted_at > :since
                    """)
                    .setParameter("name", name)
                    .setParameter("since", now.minus(settings.throttleWindow()))
                    .getSingleResult()).longValue();
            long id = ((Number) entityManager.createNativeQuery("""
                    INSERT INTO login_attempt (username, succeeded, attempted_at, remote_address)
                    VALUES (:name, false, :at, :address) RETURNING id
                    """)
                    .setParameter("name", name)
                    .setParameter("at", now)
                    .setParameter("address", remoteAddress == null ? null : SecurityLog.safe(remoteAddress))
                    .getSingleResult()).longValue();
            return new long[] {id, recentFailures};
        });
        if (outcome[1] >= settings.maxFailedSignIns()) {
            SecurityLog.event("sign-in-throttled", name, "failures=" + outcome[1]);
            throw new SignInRefused(THROTTLED, 429);
        }
        return outcome[0];
    }

    private void settleAsSuccess(long attempt) {
        QuarkusTransaction.requiringNew().run(() -> entityManager.createNativeQuery(
                        "UPDATE login_attempt SET succeeded = true WHERE id = :id")
                .setParameter("id", attempt)
                .executeUpdate());
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
