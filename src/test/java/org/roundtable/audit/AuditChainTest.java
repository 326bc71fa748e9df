package org.roundtable.audit;

import org.junit.jupiter.api.Test;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import static org.assertj.core.api.Assertions.assertThat;

/** The hash chain on its own, without a database: random tampering is always detected. */
class AuditChainTest {

    private static List<AuditEntry> chain(int n) {
        List<AuditEntry> entries = new ArrayList<>();
        String previous = AuditChain.GENESIS;
        for (int i = 1; i <= n; i++) {
            AuditEntry e = AuditTrail.withHash(new AuditEntry(i, Instant.parse("2026-01-01T00:00:00Z").plusSeconds(i),
                    "user" + (i % 3), "coordinator", i % 2 == 0 ? null : (long) i, "action." + i, "thing", "id" + i,
                    null, "f".repeat(64), "detail " + i, "req" + i, previous, null));
            entries.add(e);
            previous = e.entryHash();
        }
        return entries;
    }

    private static AuditChain.Verification verify(List<AuditEntry> entries, String head) {
        AuditChain.Verifier verifier = new AuditChain.Verifier();
        for (AuditEntry e : entries) {
            if (!verifier.accept(e)) {
                break;
            }
        }
        return verifier.result(head);
    }

    @Test
    void anUntouchedChainVerifies() {
        List<AuditEntry> entries = chain(50);
        assertThat(verify(entries, entries.get(49).entryHash()).intact()).isTrue();
    }

    @Test
    void fiveHundredRandomTamperingsAreAllDetected() {
        Random random = new Random(20261201L); // seeded: the run is repeatable
        for (int trial = 0; trial < 500; trial++) {
            List<AuditEntry> entries = chain(30);
            String head = entries.get(29).entryHash();
            int at = random.nextInt(30);
            switch (trial % 5) {
                case 0 -> { // edit a field
                    AuditEntry e = entries.get(at);
                    entries.set(at, new AuditEntry(e.sequenceNo(), e.occurredAt(), e.actor() + "x", e.actorRole(),
                            e.laboratoryId(), e.action(), e.objectType(), e.objectId(), e.beforeHash(), e.afterHash(),
                            e.detail(), e.requestId(), e.previousHash(), e.entryHash()));
                }
                case 1 -> entries.remove(at); // delete
                case 2 -> { // swap two neighbours
                    int j = at == 29 ? 28 : at + 1;
                    AuditEntry a = entries.get(at);
                    entries.set(at, entries.get(j));
                    entries.set(j, a);
                }
                case 3 -> entries.add(at, AuditTrail.withHash(new AuditEntry(at + 1, Instant.now(), "forger", null, null,
                        "forged", "x", null, null, null, null, null, entries.get(Math.max(0, at - 1)).entryHash(), null)));
                default -> entries.subList(at, 30).clear(); // cut off the tail
            }
            assertThat(verify(entries, head).intact()).as("trial %d, kind %d at %d", trial, trial % 5, at).isFalse();
        }
    }
}
