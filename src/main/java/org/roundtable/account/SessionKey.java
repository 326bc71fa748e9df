package org.roundtable.account;

import io.quarkus.runtime.LaunchMode;
import jakarta.enterprise.context.ApplicationScoped;
import org.jboss.logging.Logger;
import org.roundtable.platform.Secrets;

import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import java.nio.charset.StandardCharsets;
import java.security.GeneralSecurityException;

/**
 * The installation's secret ({@code roundtable.security.session-key}, from
 * {@code QUARKUS_HTTP_AUTH_SESSION_ENCRYPTION_KEY}), the same on every instance. Purposes get their own derived
 * keys (HMAC-SHA256 of the purpose name), so a CSRF token can never be replayed as anything else. Required in
 * production; tests and development fall back to a random per-process key with a warning.
 */
@ApplicationScoped
public class SessionKey {

    private static final Logger LOG = Logger.getLogger(SessionKey.class);

    private final byte[] master;

    public SessionKey(SecuritySettings settings) {
        this.master = settings.sessionKey().filter(k -> !k.isBlank())
                .map(k -> k.getBytes(StandardCharsets.UTF_8))
                .orElseGet(SessionKey::developmentKey);
    }

    /** A 256-bit key for one purpose, e.g. {@code "csrf"} or {@code "two-step-secrets"}. */
    public byte[] derive(String purpose) {
        return hmac(master, purpose.getBytes(StandardCharsets.UTF_8));
    }

    static byte[] hmac(byte[] key, byte[] message) {
        try {
            Mac mac = Mac.getInstance("HmacSHA256");
            mac.init(new SecretKeySpec(key, "HmacSHA256"));
            return mac.doFinal(message);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }

    private static byte[] developmentKey() {
        if (LaunchMode.current() == LaunchMode.NORMAL) {
            throw new IllegalStateException("roundtable.security.session-key is not set. Set the environment variable "
                    + "QUARKUS_HTTP_AUTH_SESSION_ENCRYPTION_KEY (at least 32 random characters, the same on every instance).");
        }
        LOG.warn("No session key configured: using a random one for this process (tests and development only)");
        return Secrets.randomToken(32).getBytes(StandardCharsets.UTF_8);
    }
}
