package org.roundtable.audit;

import org.roundtable.platform.CsvText;

import java.time.format.DateTimeFormatter;

/** CSV form of audit entries (RFC 4180), with text cells made safe for spreadsheets by {@link CsvText}. */
public final class AuditCsv {

    public static final String HEADER = "sequence_no,occurred_at,actor,actor_role,laboratory_id,action,object_type,"
            + "object_id,before_hash,after_hash,detail,request_id,previous_hash,entry_hash";

    private AuditCsv() {
    }

    public static String row(AuditEntry e) {
        return String.join(",",
                Long.toString(e.sequenceNo()),
                DateTimeFormatter.ISO_INSTANT.format(e.occurredAt()),
                cell(e.actor()), cell(e.actorRole()),
                e.laboratoryId() == null ? "" : e.laboratoryId().toString(),
                cell(e.action()), cell(e.objectType()), cell(e.objectId()),
                cell(e.beforeHash()), cell(e.afterHash()), cell(e.detail()), cell(e.requestId()),
                cell(e.previousHash()), cell(e.entryHash()));
    }

    private static String cell(String value) {
        return CsvText.cell(value);
    }
}
