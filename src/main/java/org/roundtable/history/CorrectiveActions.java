package org.roundtable.history;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.platform.Timestamps;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * A laboratory's corrective-action record for its unsatisfactory or questionable published results. Members
 * create and edit open entries; the manager closes them; a closed entry is frozen (here and by the database
 * trigger of V36) and a correction is a new entry naming it. Every change is audited in the same transaction.
 * Another laboratory's entry answers exactly like a missing one (404).
 */
@ApplicationScoped
public class CorrectiveActions {

    /** Largest attachment: 10 MiB. */
    public static final int MAX_ATTACHMENT_BYTES = 10 * 1024 * 1024;
    static final int MAX_TEXT = 4000;
    private static final String WHAT = "The corrective action";

    /** Fields a member writes. {@code effectivenessRoundId}: the later round that showed the action worked. */
    public record Draft(String cause, String actionTaken, String evidence, Long effectivenessRoundId,
                        String effectivenessNote) {
    }

    /** An attachment without its bytes. */
    public record Attachment(long id, String fileName, String contentType, int size, String sha256,
                             String addedBy, OffsetDateTime addedAt) {
    }

    /** An entry as shown. */
    public record Entry(long id, long laboratoryId, long roundId, String roundCode, String element,
                        String itemLabel, String verdict, String cause, String actionTaken, String evidence,
                        Long effectivenessRoundId, String effectivenessRoundCode, String effectivenessNote,
                        Long correctsId, Long correctedById, String createdBy, OffsetDateTime createdAt,
                        String updatedBy, OffsetDateTime updatedAt, String closedBy, OffsetDateTime closedAt,
                        int version, List<Attachment> attachments) {
        public boolean closed() {
            return closedAt != null;
        }

        /** The verdict in words. */
        public String verdictWord() {
            Verdict v = Verdict.of(verdict);
            return v == null ? verdict : v.word();
        }
    }

    private final EntityManager entityManager;
    private final CurrentUser currentUser;
    private final AuditTrail audit;
    private final HistoryService history;
    private final Clock clock;

    public CorrectiveActions(EntityManager entityManager, CurrentUser currentUser, AuditTrail audit,
                             HistoryService history, Clock clock) {
        this.entityManager = entityManager;
        this.currentUser = currentUser;
        this.audit = audit;
        this.history = history;
        this.clock = clock;
    }

    // ---- reading ----------------------------------------------------------------------------------------------

    /** The calling laboratory's entries, newest first. */
    @Transactional
    public List<Entry> own() {
        return ofLaboratory(currentUser.requireLaboratoryId());
    }

    /**
     * A laboratory's entries for whoever may read its history (an auditor: only entries of rounds inside the
     * grant's data window); 404 otherwise.
     */
    @Transactional
    public List<Entry> forReader(long laboratoryId) {
        java.util.Set<Long> rounds = history.visibleRounds(laboratoryId);
        return ofLaboratory(laboratoryId).stream().filter(e -> rounds.contains(e.roundId())).toList();
    }

    /** One of the calling laboratory's entries. */
    @Transactional
    public Entry get(long id) {
        return find(id, currentUser.requireLaboratoryId(), false).orElseThrow(() -> new DomainException.NotFound(WHAT));
    }

    /** An attachment's bytes (the calling laboratory's). */
    @Transactional
    public Map.Entry<Attachment, byte[]> attachment(long actionId, long attachmentId) {
        get(actionId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, file_name, content_type, octet_length(bytes), sha256, added_by, added_at, bytes
                  FROM corrective_action_attachment WHERE id = :id AND action_id = :action
                """).setParameter("id", attachmentId).setParameter("action", actionId).getResultList();
        Object[] r = rows.stream().findFirst().orElseThrow(() -> new DomainException.NotFound("The attachment"));
        return Map.entry(attachment(r), (byte[]) r[7]);
    }

    /**
     * A laboratory's entries for a reader who may see the rounds {@code visibleRounds} of its history (the set the
     * history page has already read, so that the page does not read the history twice).
     */
    @Transactional
    public List<Entry> forReader(long laboratoryId, java.util.Set<Long> visibleRounds) {
        return ofLaboratory(laboratoryId).stream().filter(e -> visibleRounds.contains(e.roundId())).toList();
    }

    /**
     * Every entry of a laboratory, newest first: two queries (the entries, then all their attachments), not two per
     * entry ({@code corrective_action_lab_idx}, {@code corrective_action_attachment_action_idx}).
     */
    List<Entry> ofLaboratory(long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(SELECT_ENTRY
                        + " WHERE a.laboratory_id = :lab ORDER BY a.created_at DESC, a.id DESC")
                .setParameter("lab", laboratoryId).getResultList();
        if (rows.isEmpty()) {
            return List.of();
        }
        @SuppressWarnings("unchecked")
        List<Object[]> files = entityManager.createNativeQuery("""
                SELECT f.id, f.file_name, f.content_type, octet_length(f.bytes), f.sha256, f.added_by, f.added_at,
                       f.action_id
                  FROM corrective_action_attachment f JOIN corrective_action a ON a.id = f.action_id
                 WHERE a.laboratory_id = :lab ORDER BY f.action_id, f.id
                """).setParameter("lab", laboratoryId).getResultList();
        Map<Long, List<Attachment>> byAction = new java.util.HashMap<>();
        for (Object[] f : files) {
            byAction.computeIfAbsent(num(f[7]), k -> new java.util.ArrayList<>()).add(attachment(f));
        }
        return rows.stream().map(r -> entry(r, byAction.getOrDefault(num(r[0]), List.of()))).toList();
    }

    // ---- writing ----------------------------------------------------------------------------------------------

    /** Opens an entry for one of the laboratory's questionable or unsatisfactory published results. */
    @Transactional
    public Entry create(long roundId, String element, String itemLabel, Draft draft) {
        return createFor(currentUser.requireLaboratoryId(), currentUser.username(), currentUser.actor(), roundId,
                element, itemLabel, draft);
    }

    /** As {@link #create}, for a laboratory and its member named by the caller: only the demo loader. */
    @Transactional
    public Entry createFor(long lab, String who, org.roundtable.audit.Actor actor, long roundId, String element,
                           String itemLabel, Draft draft) {
        HistoryService.Entry result = history.entries(lab, new HistoryService.Reader(HistoryService.TO_LABORATORIES, null))
                .stream().filter(e -> e.roundId() == roundId && e.element().equalsIgnoreCase(String.valueOf(element))
                        && e.itemLabel().equalsIgnoreCase(itemLabel == null ? "A" : itemLabel))
                .findFirst()
                .orElseThrow(() -> new DomainException.Unprocessable("Choose one of your published results."));
        if (result.verdict() != Verdict.UNSATISFACTORY && result.verdict() != Verdict.QUESTIONABLE) {
            throw new DomainException.Unprocessable("A corrective action is recorded for a questionable or unsatisfactory result.");
        }
        Draft d = checked(lab, draft);
        OffsetDateTime now = Timestamps.now(clock);
        Number id = (Number) entityManager.createNativeQuery("""
                INSERT INTO corrective_action (laboratory_id, round_id, element, item_label, round_code, verdict, cause,
                       action_taken, evidence, effectiveness_round_id, effectiveness_note, created_by, created_at,
                       updated_by, updated_at)
                VALUES (:lab, :round, :element, :item, :code, :verdict, :cause, :action, :evidence, :eff, :note,
                        :who, :at, :who, :at)
                RETURNING id
                """).setParameter("lab", lab).setParameter("round", roundId).setParameter("element", result.element())
                .setParameter("item", result.itemLabel()).setParameter("code", result.roundCode())
                .setParameter("verdict", result.verdict().name()).setParameter("cause", d.cause())
                .setParameter("action", d.actionTaken()).setParameter("evidence", d.evidence())
                .setParameter("eff", d.effectivenessRoundId()).setParameter("note", d.effectivenessNote())
                .setParameter("who", who).setParameter("at", now).getSingleResult();
        Entry created = find(id.longValue(), lab, false).orElseThrow();
        audit.record(new AuditTrail.Event(actor, "corrective-action.created", "corrective-action",
                id.toString(), null, hash(created), created.roundCode() + " " + created.element()));
        return created;
    }

    /** Saves a member's changes to an open entry; {@code version} is the one the member read (409 if stale). */
    @Transactional
    public Entry edit(long id, int version, Draft draft) {
        long lab = currentUser.requireLaboratoryId();
        Entry before = lockOpen(id, lab);
        if (before.version() != version) {
            throw new DomainException.Conflict("Someone changed this entry meanwhile; reload it and make your change again.");
        }
        Draft d = checked(lab, draft);
        entityManager.createNativeQuery("""
                UPDATE corrective_action SET cause = :cause, action_taken = :action, evidence = :evidence,
                       effectiveness_round_id = :eff, effectiveness_note = :note, updated_by = :who, updated_at = :at,
                       version = version + 1
                 WHERE id = :id
                """).setParameter("cause", d.cause()).setParameter("action", d.actionTaken())
                .setParameter("evidence", d.evidence()).setParameter("eff", d.effectivenessRoundId())
                .setParameter("note", d.effectivenessNote()).setParameter("who", currentUser.username())
                .setParameter("at", Timestamps.now(clock)).setParameter("id", id).executeUpdate();
        Entry after = find(id, lab, false).orElseThrow();
        audit.record(new AuditTrail.Event(currentUser.actor(), "corrective-action.edited", "corrective-action",
                Long.toString(id), hash(before), hash(after), null));
        return after;
    }

    /** Adds a PDF, PNG or JPEG (≤ 10 MiB, by its signature) to an open entry. */
    @Transactional
    public Attachment attach(long id, String fileName, byte[] bytes) {
        long lab = currentUser.requireLaboratoryId();
        Entry before = lockOpen(id, lab);
        if (bytes == null || bytes.length == 0) {
            throw new DomainException.BadRequest("Choose a file to attach.");
        }
        if (bytes.length > MAX_ATTACHMENT_BYTES) {
            throw new DomainException(413, "Too large", "An attachment may be at most 10 MiB.");
        }
        String type = contentType(bytes).orElseThrow(() -> new DomainException.Unprocessable(
                "Attach a PDF, PNG or JPEG file; this file is none of these."));
        String name = fileName == null || fileName.isBlank() ? "attachment" : fileName.strip();
        name = name.replaceAll("[\\\\/\\p{Cntrl}]", "_");
        name = name.length() > 200 ? name.substring(0, 200) : name;
        String sha = Secrets.sha256Hex(bytes);
        Number attachment = (Number) entityManager.createNativeQuery("""
                INSERT INTO corrective_action_attachment (action_id, file_name, content_type, bytes, sha256, added_by, added_at)
                VALUES (:id, :name, :type, :bytes, :sha, :who, :at) RETURNING id
                """).setParameter("id", id).setParameter("name", name).setParameter("type", type)
                .setParameter("bytes", bytes).setParameter("sha", sha).setParameter("who", currentUser.username())
                .setParameter("at", Timestamps.now(clock)).getSingleResult();
        audit.record(new AuditTrail.Event(currentUser.actor(), "corrective-action.attachment-added", "corrective-action",
                Long.toString(id), hash(before), sha, name + " " + type + " " + bytes.length + " bytes"));
        return find(id, lab, false).orElseThrow().attachments().stream()
                .filter(a -> a.id() == attachment.longValue()).findFirst().orElseThrow();
    }

    /** Closes an open entry (the laboratory's manager); it is frozen from then on. */
    @Transactional
    public Entry close(long id, boolean confirmed) {
        long lab = currentUser.requireLaboratoryId();
        if (!currentUser.is(Role.LAB_MANAGER)) {
            throw new DomainException.Forbidden();
        }
        Entry before = lockOpen(id, lab);
        if (!confirmed) {
            throw new DomainException.BadRequest("Confirm that the entry is complete: once closed it cannot be changed.");
        }
        if (before.cause().isBlank() || before.actionTaken().isBlank()) {
            throw new DomainException.Unprocessable("Record the cause found and the action taken before closing.");
        }
        entityManager.createNativeQuery("""
                UPDATE corrective_action SET closed_by = :who, closed_at = :at, version = version + 1 WHERE id = :id
                """).setParameter("who", currentUser.username()).setParameter("at", Timestamps.now(clock))
                .setParameter("id", id).executeUpdate();
        Entry after = find(id, lab, false).orElseThrow();
        audit.record(new AuditTrail.Event(currentUser.actor(), "corrective-action.closed", "corrective-action",
                Long.toString(id), hash(before), hash(after), null));
        return after;
    }

    /** A correction of a closed entry: a new open entry naming it, with its text to start from. */
    @Transactional
    public Entry correct(long id) {
        long lab = currentUser.requireLaboratoryId();
        Entry closed = find(id, lab, true).orElseThrow(() -> new DomainException.NotFound(WHAT));
        if (!closed.closed()) {
            throw new DomainException.Conflict("This entry is still open: change it directly.");
        }
        if (closed.correctedById() != null) {
            throw new DomainException.Conflict("This entry has been corrected already by entry " + closed.correctedById() + ".");
        }
        OffsetDateTime now = Timestamps.now(clock);
        Number newId = (Number) entityManager.createNativeQuery("""
                INSERT INTO corrective_action (laboratory_id, round_id, element, item_label, round_code, verdict, cause,
                       action_taken, evidence, effectiveness_round_id, effectiveness_note, corrects_id, created_by,
                       created_at, updated_by, updated_at)
                SELECT laboratory_id, round_id, element, item_label, round_code, verdict, cause, action_taken, evidence,
                       effectiveness_round_id, effectiveness_note, id, :who, :at, :who, :at
                  FROM corrective_action WHERE id = :id
                RETURNING id
                """).setParameter("who", currentUser.username()).setParameter("at", now).setParameter("id", id)
                .getSingleResult();
        Entry created = find(newId.longValue(), lab, false).orElseThrow();
        audit.record(new AuditTrail.Event(currentUser.actor(), "corrective-action.corrected", "corrective-action",
                newId.toString(), hash(closed), hash(created), "corrects " + id));
        return created;
    }

    // ---- helpers ---------------------------------------------------------------------------------------------

    /** The file's type by its signature: PDF ({@code %PDF-}), PNG (8-byte signature) or JPEG ({@code FF D8 FF}). */
    static Optional<String> contentType(byte[] b) {
        if (starts(b, new byte[]{'%', 'P', 'D', 'F', '-'})) {
            return Optional.of("application/pdf");
        }
        if (starts(b, new byte[]{(byte) 0x89, 'P', 'N', 'G', 0x0D, 0x0A, 0x1A, 0x0A})) {
            return Optional.of("image/png");
        }
        if (starts(b, new byte[]{(byte) 0xFF, (byte) 0xD8, (byte) 0xFF})) {
            return Optional.of("image/jpeg");
        }
        return Optional.empty();
    }

    private static boolean starts(byte[] b, byte[] signature) {
        return b.length >= signature.length && Arrays.equals(b, 0, signature.length, signature, 0, signature.length);
    }

    private Draft checked(long lab, Draft draft) {
        Draft d = draft == null ? new Draft(null, null, null, null, null) : draft;
        String cause = text(d.cause(), "cause");
        String action = text(d.actionTaken(), "action taken");
        String evidence = text(d.evidence(), "evidence");
        String note = text(d.effectivenessNote(), "verification of effectiveness");
        if (d.effectivenessRoundId() != null && history.entries(lab, new HistoryService.Reader(HistoryService.TO_LABORATORIES, null))
                .stream().noneMatch(e -> e.roundId() == d.effectivenessRoundId())) {
            throw new DomainException.Unprocessable("The round that showed the action worked is one of your published rounds.");
        }
        return new Draft(cause, action, evidence, d.effectivenessRoundId(), note);
    }

    private static String text(String s, String field) {
        String t = s == null ? "" : s.strip();
        if (t.length() > MAX_TEXT) {
            throw new DomainException.BadRequest("The " + field + " is at most " + MAX_TEXT + " characters.");
        }
        return t;
    }

    /** The entry, locked for update; 404 for another laboratory's, 409 when closed. */
    private Entry lockOpen(long id, long lab) {
        Entry e = find(id, lab, true).orElseThrow(() -> new DomainException.NotFound(WHAT));
        if (e.closed()) {
            throw new DomainException.Conflict("This entry is closed and cannot be changed; record a correction instead.");
        }
        return e;
    }

    /** The columns of an entry, as {@link #entry} reads them. */
    private static final String SELECT_ENTRY = """
            SELECT a.id, a.laboratory_id, a.round_id, a.round_code, a.element, a.item_label, a.verdict, a.cause,
                   a.action_taken, a.evidence, a.effectiveness_round_id,
                   (SELECT p.round_code FROM history_publication p WHERE p.round_id = a.effectiveness_round_id LIMIT 1),
                   a.effectiveness_note, a.corrects_id,
                   (SELECT c.id FROM corrective_action c WHERE c.corrects_id = a.id),
                   a.created_by, a.created_at, a.updated_by, a.updated_at, a.closed_by, a.closed_at, a.version
              FROM corrective_action a""";

    private Optional<Entry> find(long id, long lab, boolean lock) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(SELECT_ENTRY + " WHERE a.id = :id AND a.laboratory_id = :lab"
                + (lock ? " FOR UPDATE OF a" : "")).setParameter("id", id).setParameter("lab", lab).getResultList();
        if (rows.isEmpty()) {
            return Optional.empty();
        }
        @SuppressWarnings("unchecked")
        List<Object[]> files = entityManager.createNativeQuery("""
                SELECT id, file_name, content_type, octet_length(bytes), sha256, added_by, added_at
                  FROM corrective_action_attachment WHERE action_id = :id ORDER BY id
                """).setParameter("id", id).getResultList();
        return Optional.of(entry(rows.get(0), files.stream().map(CorrectiveActions::attachment).toList()));
    }

    private static Entry entry(Object[] r, List<Attachment> files) {
        return new Entry(num(r[0]), num(r[1]), num(r[2]), (String) r[3], (String) r[4], (String) r[5],
                (String) r[6], (String) r[7], (String) r[8], (String) r[9], r[10] == null ? null : num(r[10]),
                (String) r[11], (String) r[12], r[13] == null ? null : num(r[13]), r[14] == null ? null : num(r[14]),
                (String) r[15], Timestamps.utc(r[16]), (String) r[17], Timestamps.utc(r[18]), (String) r[19],
                r[20] == null ? null : Timestamps.utc(r[20]), ((Number) r[21]).intValue(), files);
    }

    private static Attachment attachment(Object[] r) {
        return new Attachment(num(r[0]), (String) r[1], (String) r[2], ((Number) r[3]).intValue(),
                ((String) r[4]).strip(), (String) r[5], Timestamps.utc(r[6]));
    }

    private static long num(Object o) {
        return ((Number) o).longValue();
    }

    private static String hash(Entry e) {
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("id", e.id());
        f.put("cause", e.cause());
        f.put("actionTaken", e.actionTaken());
        f.put("evidence", e.evidence());
        f.put("effectivenessRoundId", String.valueOf(e.effectivenessRoundId()));
        f.put("effectivenessNote", e.effectivenessNote());
        f.put("closedAt", String.valueOf(e.closedAt()));
        f.put("attachments", e.attachments().stream().map(Attachment::sha256).toList());
        return ObjectHash.of(f);
    }
}
