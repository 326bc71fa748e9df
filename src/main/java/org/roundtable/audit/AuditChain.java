package org.roundtable.audit;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.time.Instant;
import java.time.format.DateTimeFormatter;
import java.time.temporal.ChronoUnit;
import java.util.HexFormat;
import java.util.Objects;

/**
 * The hash chain over the audit trail.
 *
 * <p>Each entry's hash is SHA-256 over a canonical encoding of all its fields (each field written as
 * {@code <length>:<value>;}, a missing value as {@code -1:;}, the time as ISO-8601 UTC with microseconds),
 * including the previous entry's hash. The first entry links to 64 zeros. Editing, deleting, inserting or
 * reordering a row therefore breaks either a sequence number, a link, or a recomputed hash; cutting off the
 * tail is detected by comparing the head hash with one kept outside the database (Crosby and Wallach,
 * "Efficient Data Structures for Tamper-Evident Logging", USENIX Security 2009, on linear chains).
 */
public final class AuditChain {

    public static final String GENESIS = "0".repeat(64);
    private static final DateTimeFormatter MICROS = DateTimeFormatter.ofPattern("uuuu-MM-dd'T'HH:mm:ss.SSSSSS'Z'")
            .withZone(java.time.ZoneOffset.UTC);

    private AuditChain() {
    }

    /** PostgreSQL keeps microseconds; hashes are computed over the stored precision. */
    public static Instant storedPrecision(Instant instant) {
        return instant.truncatedTo(ChronoUnit.MICROS);
    }

    public static String entryHash(AuditEntry e) {
        StringBuilder canonical = new StringBuilder(256);
        field(canonical, Long.toString(e.sequenceNo()));
        field(canonical, MICROS.format(storedPrecision(e.occurredAt())));
        field(canonical, e.actor());
        field(canonical, e.actorRole());
        field(canonical, e.laboratoryId() == null ? null : e.laboratoryId().toString());
        field(canonical, e.action());
        field(canonical, e.objectType());
        field(canonical, e.objectId());
        field(canonical, e.beforeHash());
        field(canonical, e.afterHash());
        field(canonical, e.detail());
        field(canonical, e.requestId());
        field(canonical, e.previousHash());
        try {
            byte[] digest = MessageDigest.getInstance("SHA-256").digest(canonical.toString().getBytes(StandardCharsets.UTF_8));
            return HexFormat.of().formatHex(digest);
        } catch (NoSuchAlgorithmException ex) {
            throw new IllegalStateException(ex);
        }
    }

    private static void field(StringBuilder out, String value) {
        if (value == null) {
            out.append("-1:;");
        } else {
            out.append(value.length()).append(':').append(value).append(';');
        }
    }

    /** Outcome of a verification: intact, or the first broken link and what is wrong with it. */
    public record Verification(boolean intact, long entriesChecked, String headHash, Long firstBrokenSequenceNo,
                               String problem) {
    }

    /** Checks entries fed in ascending sequence order; stops at the first problem. Not thread-safe. */
    public static final class Verifier {
        private long expectedSequence;
        private String previousHash;
        private long checked;
        private Long brokenAt;
        private String problem;

        /** A verifier of the whole chain, from entry 1. */
        public Verifier() {
            this(0, GENESIS);
        }

        /**
         * A verifier that carries on after entry {@code verifiedTo}, already found intact with hash
         * {@code verifiedHash} (a checkpoint; 0 and {@link #GENESIS} for the start of the chain).
         */
        public Verifier(long verifiedTo, String verifiedHash) {
            this.expectedSequence = verifiedTo + 1;
            this.previousHash = verifiedHash;
        }

        /** The last entry found intact so far (0 before the first). */
        public long verifiedTo() {
            return expectedSequence - 1;
        }

        /** The hash of {@link #verifiedTo()} ({@link #GENESIS} before the first entry). */
        public String verifiedHash() {
            return previousHash;
        }

        /** @return false once a problem has been found (further entries are ignored) */
        public boolean accept(AuditEntry e) {
            if (brokenAt != null) {
                return false;
            }
            if (e.sequenceNo() != expectedSequence) {
                return fail(expectedSequence, e.sequenceNo() > expectedSequence
                        ? "entry " + expectedSequence + " is missing (next present is " + e.sequenceNo() + ")"
                        : "entry " + e.sequenceNo() + " is out of order or duplicated");
            }
            if (!Objects.equals(e.previousHash(), previousHash)) {
                return fail(e.sequenceNo(), "entry " + e.sequenceNo() + " does not link to the entry before it");
            }
            String recomputed = entryHash(e);
            if (!recomputed.equals(e.entryHash())) {
                return fail(e.sequenceNo(), "entry " + e.sequenceNo() + " was altered (its hash does not match its content)");
            }
            previousHash = e.entryHash();
            expectedSequence++;
            checked++;
            return true;
        }

        private boolean fail(long sequence, String what) {
            brokenAt = sequence;
            problem = what;
            return false;
        }

        /**
         * @param expectedHead the head hash recorded outside the database, or null; a mismatch means the tail
         *                     was cut off or rewritten
         */
        public Verification result(String expectedHead) {
            if (brokenAt == null && expectedHead != null && !expectedHead.isBlank() && !expectedHead.equals(previousHash)) {
                return new Verification(false, checked, previousHash, expectedSequence,
                        "the chain head differs from the expected head " + expectedHead
                                + " (entries cut off or rewritten at the end)");
            }
            return new Verification(brokenAt == null, checked, previousHash, brokenAt, problem);
        }
    }
}
