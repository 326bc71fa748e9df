package org.roundtable.account;

import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import java.security.GeneralSecurityException;
import java.time.Instant;

/**
 * Time-based one-time passwords.
 *
 * <p>Definition (RFC 6238, with HOTP of RFC 4226): T = floor((unix time − 0)/30 s);
 * HOTP(K, T) = Truncate(HMAC-SHA-1(K, T as 8-byte big-endian)) mod 10^digits, where Truncate takes 4 bytes at the
 * offset given by the low nibble of the last HMAC byte, with the top bit cleared. Codes are accepted for the
 * current step and one step either side (clock drift), and never twice (the caller keeps the last used step).
 *
 * <p>References: M'Raihi D. et al. (2011) RFC 6238 TOTP: Time-Based One-Time Password Algorithm, section 4 and
 * Appendix B (test vectors); M'Raihi D. et al. (2005) RFC 4226 HOTP, section 5.3.
 */
public final class Totp {

    public static final int STEP_SECONDS = 30;
    public static final int DIGITS = 6;
    static final int ALLOWED_DRIFT_STEPS = 1;

    private Totp() {
    }

    public static long step(Instant time) {
        return Math.floorDiv(time.getEpochSecond(), STEP_SECONDS);
    }

    /** The code for a time step, {@code digits} long with leading zeros. */
    public static String code(byte[] key, long step, int digits) {
        try {
            Mac mac = Mac.getInstance("HmacSHA1");
            mac.init(new SecretKeySpec(key, "HmacSHA1"));
            byte[] hash = mac.doFinal(java.nio.ByteBuffer.allocate(8).putLong(step).array());
            int offset = hash[hash.length - 1] & 0x0f;
            int binary = ((hash[offset] & 0x7f) << 24) | ((hash[offset + 1] & 0xff) << 16)
                    | ((hash[offset + 2] & 0xff) << 8) | (hash[offset + 3] & 0xff);
            int modulus = (int) Math.pow(10, digits);
            return String.format("%0" + digits + "d", binary % modulus);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }

    /**
     * The step a presented code matches, within the allowed drift and after {@code lastUsedStep}, or -1.
     */
    public static long matchingStep(byte[] key, String presented, Instant now, long lastUsedStep) {
        if (presented == null) {
            return -1;
        }
        String code = presented.replace(" ", "");
        if (!code.matches("\\d{" + DIGITS + "}")) {
            return -1;
        }
        long current = step(now);
        for (long step = current - ALLOWED_DRIFT_STEPS; step <= current + ALLOWED_DRIFT_STEPS; step++) {
            if (step > lastUsedStep && org.roundtable.platform.Secrets.constantTimeEquals(code(key, step, DIGITS), code)) {
                return step;
            }
        }
        return -1;
    }

    /** RFC 4648 base32 without padding, as authenticator apps expect. */
    public static String base32(byte[] bytes) {
        final String alphabet = "ABCDEFGHIJKLMNOPQRSTUVWXYZ234567";
        StringBuilder out = new StringBuilder();
        int buffer = 0;
        int bits = 0;
        for (byte b : bytes) {
            buffer = (buffer << 8) | (b & 0xff);
            bits += 8;
            while (bits >= 5) {
                out.append(alphabet.charAt((buffer >> (bits - 5)) & 31));
                bits -= 5;
            }
        }
        if (bits > 0) {
            out.append(alphabet.charAt((buffer << (5 - bits)) & 31));
        }
        return out.toString();
    }
}
