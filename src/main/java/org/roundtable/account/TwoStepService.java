package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import javax.crypto.Cipher;
import javax.crypto.spec.GCMParameterSpec;
import javax.crypto.spec.SecretKeySpec;
import java.net.URLEncoder;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.security.GeneralSecurityException;
import java.security.SecureRandom;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.Locale;

/**
 * Two-step sign-in (ASVS v5.0.0-6.3.3): an authenticator app's time-based code ({@link Totp}) after the password,
 * or one of eight single-use recovery codes. Secrets are stored encrypted with AES-256-GCM (ASVS v5.0.0-11.3.2)
 * under a key derived from the installation's {@link SessionKey}; recovery codes only as SHA-256.
 */
@ApplicationScoped
public class TwoStepService {

    static final int SECRET_BYTES = 20;
    static final int RECOVERY_CODES = 8;
    private static final String RECOVERY_ALPHABET = "abcdefghjkmnpqrstuvwxyz23456789";
    private static final SecureRandom RANDOM = new SecureRandom();

    private final EntityManager entityManager;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final SessionService sessions;
    private final Clock clock;
    private final byte[] encryptionKey;

    public TwoStepService(EntityManager entityManager, AuditTrail audit, CurrentUser currentUser, SessionService sessions,
                          SessionKey sessionKey, Clock clock) {
        this.entityManager = entityManager;
        this.audit = audit;
        this.currentUser = currentUser;
        this.sessions = sessions;
        this.clock = clock;
        this.encryptionKey = sessionKey.derive("two-step-secrets");
    }

    public enum Status { OFF, AWAITING_CONFIRMATION, ON }

    /** A new secret to enter in an authenticator app, as text and as an {@code otpauth://} URI. */
    public record Enrolment(String secretBase32, String otpauthUri) {
    }

    @Transactional
    public Status status(long userId) {
        @SuppressWarnings("unchecked")
        List<Object> rows = entityManager.createNativeQuery("SELECT confirmed_at FROM user_two_step WHERE user_id = :user")
                .setParameter("user", userId).getResultList();
        if (rows.isEmpty()) {
            return Status.OFF;
        }
        return rows.get(0) == null ? Status.AWAITING_CONFIRMATION : Status.ON;
    }

    /** Starts (or restarts) setting up two-step sign-in for the signed-in user. */
    @Transactional
    public Enrolment start() {
        long userId = currentUser.requireUserId();
        if (status(userId) == Status.ON) {
            throw new DomainException.Conflict("Two-step sign-in is already on. An administrator can reset it.");
        }
        byte[] secret = new byte[SECRET_BYTES];
        RANDOM.nextBytes(secret);
        entityManager.createNativeQuery("""
                INSERT INTO user_two_step (user_id, secret_encrypted, created_at) VALUES (:user, :secret, :now)
                ON CONFLICT (user_id) DO UPDATE SET secret_encrypted = EXCLUDED.secret_encrypted,
                       created_at = EXCLUDED.created_at, confirmed_at = NULL, last_used_step = 0
                """)
                .setParameter("user", userId).setParameter("secret", encrypt(secret)).setParameter("now", now())
                .executeUpdate();
        String base32 = Totp.base32(secret);
        String label = URLEncoder.encode("Roundtable:" + currentUser.username(), StandardCharsets.UTF_8).replace("+", "%20");
        return new Enrolment(base32, "otpauth://totp/" + label + "?secret=" + base32
                + "&issuer=Roundtable&algorithm=SHA1&digits=" + Totp.DIGITS + "&period=" + Totp.STEP_SECONDS);
    }

    /** Confirms the set-up with a first code; returns the recovery codes, shown this once. */
    @Transactional
    public List<String> confirm(String code) {
        long userId = currentUser.requireUserId();
        if (status(userId) != Status.AWAITING_CONFIRMATION) {
            throw new DomainException.Conflict("Start setting up two-step sign-in first.");
        }
        if (!acceptCode(userId, code)) {
            throw new DomainException.Unprocessable("That code is not right. Check the time on your device and try the next code.");
        }
        entityManager.createNativeQuery("UPDATE user_two_step SET confirmed_at = :now WHERE user_id = :user")
                .setParameter("now", now()).setParameter("user", userId).executeUpdate();
        List<String> codes = new ArrayList<>();
        for (int i = 0; i < RECOVERY_CODES; i++) {
            String recovery = recoveryCode();
            codes.add(grouped(recovery));
            entityManager.createNativeQuery("INSERT INTO recovery_code (code_hash, user_id, created_at) VALUES (:hash, :user, :now)")
                    .setParameter("hash", Secrets.sha256Hex(recovery)).setParameter("user", userId)
                    .setParameter("now", now()).executeUpdate();
        }
        audit.record(new AuditTrail.Event(currentUser.actor(), "two-step.enabled", "user", Long.toString(userId),
                null, null, null));
        SecurityLog.event("two-step-enabled", currentUser.username(), "");
        return codes;
    }

    /**
     * Checks a second-step code for a user whose two-step sign-in is on: a time-based code not used before, or
     * an unused recovery code (then used up).
     */
    @Transactional(Transactional.TxType.REQUIRED)
    public boolean verifySecondStep(long userId, String code) {
        if (code == null) {
            return false;
        }
        String clean = code.strip().toLowerCase(Locale.ROOT).replace(" ", "").replace("-", "");
        if (clean.matches("\\d{" + Totp.DIGITS + "}")) {
            return acceptCode(userId, clean);
        }
        return entityManager.createNativeQuery("""
                UPDATE recovery_code SET used_at = :now WHERE code_hash = :hash AND user_id = :user AND used_at IS NULL
                """)
                .setParameter("now", now()).setParameter("hash", Secrets.sha256Hex(clean)).setParameter("user", userId)
                .executeUpdate() == 1;
    }

    /** Turns two-step sign-in off for a user (admin), e.g. after a lost device; ends the user's sessions. */
    @Transactional
    public void reset(long userId) {
        entityManager.createNativeQuery("DELETE FROM recovery_code WHERE user_id = :user").setParameter("user", userId).executeUpdate();
        int removed = entityManager.createNativeQuery("DELETE FROM user_two_step WHERE user_id = :user")
                .setParameter("user", userId).executeUpdate();
        if (removed == 0) {
            throw new DomainException.Conflict("Two-step sign-in is not on for this user.");
        }
        sessions.endAllOf(userId, "two-step-reset");
        audit.record(new AuditTrail.Event(currentUser.actor(), "two-step.reset", "user", Long.toString(userId),
                null, null, null));
        SecurityLog.event("two-step-reset", currentUser.username(), "user=" + userId);
    }

    /** Accepts a time-based code once: the step is recorded with a conditional update, so a replay races to lose. */
    private boolean acceptCode(long userId, String code) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(
                        "SELECT secret_encrypted, last_used_step FROM user_two_step WHERE user_id = :user")
                .setParameter("user", userId).getResultList();
        if (rows.isEmpty()) {
            return false;
        }
        byte[] secret = decrypt((String) rows.get(0)[0]);
        long step = Totp.matchingStep(secret, code, clock.instant(), ((Number) rows.get(0)[1]).longValue());
        if (step < 0) {
            return false;
        }
        return entityManager.createNativeQuery(
                        "UPDATE user_two_step SET last_used_step = :step WHERE user_id = :user AND last_used_step < :step")
                .setParameter("step", step).setParameter("user", userId).executeUpdate() == 1;
    }

    private String encrypt(byte[] plain) {
        try {
            byte[] iv = new byte[12];
            RANDOM.nextBytes(iv);
            Cipher cipher = Cipher.getInstance("AES/GCM/NoPadding");
            cipher.init(Cipher.ENCRYPT_MODE, new SecretKeySpec(encryptionKey, "AES"), new GCMParameterSpec(128, iv));
            byte[] sealed = cipher.doFinal(plain);
            return Base64.getEncoder().encodeToString(ByteBuffer.allocate(iv.length + sealed.length).put(iv).put(sealed).array());
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }

    private byte[] decrypt(String stored) {
        try {
            byte[] all = Base64.getDecoder().decode(stored);
            Cipher cipher = Cipher.getInstance("AES/GCM/NoPadding");
            cipher.init(Cipher.DECRYPT_MODE, new SecretKeySpec(encryptionKey, "AES"), new GCMParameterSpec(128, all, 0, 12));
            return cipher.doFinal(all, 12, all.length - 12);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException("the two-step secret cannot be decrypted (was the session key changed?)", e);
        }
    }

    /** 24 characters of a 31-letter alphabet (about 119 bits), shown in groups of four. */
    private static String recoveryCode() {
        StringBuilder code = new StringBuilder();
        for (int i = 0; i < 24; i++) {
            code.append(RECOVERY_ALPHABET.charAt(RANDOM.nextInt(RECOVERY_ALPHABET.length())));
        }
        return code.toString();
    }

    /** A recovery code as shown to the user: {@code abcd-efgh-...}. */
    static String grouped(String code) {
        return String.join("-", code.split("(?<=\\G.{4})"));
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
