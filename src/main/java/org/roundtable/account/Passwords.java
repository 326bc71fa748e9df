package org.roundtable.account;

import io.quarkus.elytron.security.common.BcryptUtil;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.Base64;
import java.util.HashSet;
import java.util.Locale;
import java.util.Set;

/**
 * Password policy and storage.
 *
 * <p>Policy (ASVS v5.0.0-6.2.1, 6.2.9, 6.2.12): 12 to 128 characters, any characters allowed, not the
 * username, and not on the offline list of commonly breached passwords shipped in
 * {@code account/common-passwords.txt}.
 *
 * <p>Storage (ASVS v5.0.0-11.4.2): bcrypt (cost {@code roundtable.security.bcrypt-cost}, default 12) over the Base64 of the password's SHA-256, so that
 * passwords longer than bcrypt's 72-byte input limit are not silently truncated.
 */
@ApplicationScoped
public class Passwords {

    public static final int MINIMUM_LENGTH = 12;
    public static final int MAXIMUM_LENGTH = 128;

    private final Set<String> common;
    private final int cost;
    private final String dummyHash;

    public Passwords(SecuritySettings settings) {
        this.common = loadCommonPasswords();
        this.cost = settings.bcryptCost();
        this.dummyHash = BcryptUtil.bcryptHash(Secrets.randomToken(32), cost);
    }

    public String hash(String password) {
        return BcryptUtil.bcryptHash(prehash(password), cost);
    }

    public boolean matches(String password, String storedHash) {
        if (password == null || storedHash == null || password.length() > MAXIMUM_LENGTH) {
            return false;
        }
        return BcryptUtil.matches(prehash(password), storedHash);
    }

    /** Spends about the time of one verification, so that unknown usernames answer as slowly as known ones. */
    public void burnVerificationTime(String password) {
        matches(password == null ? "" : password, dummyHash);
    }

    /** Checks the policy; throws with a plain reason when the password is not acceptable. */
    public void checkAcceptable(String password, String username) {
        if (password == null || password.codePointCount(0, password.length()) < MINIMUM_LENGTH) {
            throw new DomainException.Unprocessable("A password needs at least " + MINIMUM_LENGTH + " characters.");
        }
        if (password.length() > MAXIMUM_LENGTH) {
            throw new DomainException.Unprocessable("A password may have at most " + MAXIMUM_LENGTH + " characters.");
        }
        String lower = password.toLowerCase(Locale.ROOT);
        if (username != null && lower.contains(username.toLowerCase(Locale.ROOT))) {
            throw new DomainException.Unprocessable("A password must not contain the username.");
        }
        if (common.contains(lower)) {
            throw new DomainException.Unprocessable("This password is on a list of commonly used passwords; choose another.");
        }
    }

    private static String prehash(String password) {
        return Base64.getEncoder().encodeToString(Secrets.sha256(password.getBytes(StandardCharsets.UTF_8)));
    }

    private static Set<String> loadCommonPasswords() {
        Set<String> words = new HashSet<>();
        try (InputStream in = Passwords.class.getResourceAsStream("/account/common-passwords.txt")) {
            if (in == null) {
                throw new IllegalStateException("account/common-passwords.txt is missing from the build");
            }
            BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8));
            String line;
            while ((line = reader.readLine()) != null) {
                String word = line.strip();
                if (!word.isEmpty() && !word.startsWith("#")) {
                    words.add(word.toLowerCase(Locale.ROOT));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return Set.copyOf(words);
    }
}
