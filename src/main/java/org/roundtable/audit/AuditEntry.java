package org.roundtable.audit;

import java.time.Instant;

/**
 * One row of the audit trail as stored: what happened, to what, by whom and when, with the hashes of the
 * object before and after, linked to the previous row by {@code previousHash}.
 */
public record AuditEntry(long sequenceNo, Instant occurredAt, String actor, String actorRole, Long laboratoryId,
                         String action, String objectType, String objectId, String beforeHash, String afterHash,
                         String detail, String requestId, String previousHash, String entryHash) {
}
