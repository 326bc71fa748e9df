package org.roundtable.scheme;

import java.security.SecureRandom;
import java.util.Set;

/**
 * Random participant codes: 6 characters from an alphabet without the look-alikes 0/O, 1/I/L, drawn from a
 * CSPRNG, so a code says nothing about the laboratory, its enrolment order or other codes. 31^6 ≈ 8.9·10^8
 * codes; a draw that collides with a code already taken (in the round, or the scheme) is drawn again. The
 * database keeps codes unique per round (and per scheme) as well.
 */
public final class ParticipantCodes {

    public static final String ALPHABET = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";
    public static final int LENGTH = 6;
    private static final SecureRandom RANDOM = new SecureRandom();

    private ParticipantCodes() {
    }

    /** A fresh code not in {@code taken}; adds it to {@code taken}. */
    public static String draw(Set<String> taken) {
        while (true) {
            char[] code = new char[LENGTH];
            for (int i = 0; i < LENGTH; i++) {
                code[i] = ALPHABET.charAt(RANDOM.nextInt(ALPHABET.length()));
            }
            String candidate = new String(code);
            if (taken.add(candidate)) {
                return candidate;
            }
        }
    }
}
