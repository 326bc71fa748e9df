package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.hibernate.Session;
import org.roundtable.platform.Timestamps;
import org.roundtable.account.AccountService;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.LaboratoryBulkService;
import org.roundtable.account.LaboratoryService;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Enrolment, participant codes, items and notices.
 *
 * <p>Confidentiality: the code table ({@code round_participant}: which laboratory is behind which code) is
 * read only through the coordinator methods here. Laboratory methods take the laboratory from
 * {@link CurrentUser}, never from the request, and return only that laboratory's own code and items; a
 * round the laboratory is not enrolled in answers "not found", exactly like a round that does not exist.
 *
 * <p>Codes are per round by default; when the round's code scope is {@code SCHEME}, a laboratory keeps the
 * code it first got in the scheme ({@code scheme_participant_code}).
 */
@ApplicationScoped
public class EnrolmentService {

    private final RoundGate gate;
    private final LaboratoryService laboratories;
    private final LaboratoryBulkService bulk;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final Clock clock;

    public EnrolmentService(RoundGate gate, LaboratoryService laboratories, LaboratoryBulkService bulk,
                            AuditTrail audit, CurrentUser currentUser, EntityManager entityManager, Clock clock) {
        this.gate = gate;
        this.laboratories = laboratories;
        this.bulk = bulk;
        this.audit = audit;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    /**
     * Enrols an existing laboratory ({@code laboratoryId}) or a new one (the other fields, with its first lab
     * manager, who gets a one-time link).
     */
    public record Enrolment(Long laboratoryId, String organisation, String name, String country, String contactName,
                            String contactEmail, String managerUsername) {
    }

    public record Participant(long laboratoryId, String organisation, String laboratoryName, String country,
                              String participantCode, OffsetDateTime enrolledAt) {
    }

    public record Enrolled(Participant participant, String managerUsername, String passwordLinkPath,
                           OffsetDateTime linkExpiresAt) {
    }

    public record BulkEnrolled(int count, OffsetDateTime linksExpireAt, List<BulkRow> laboratories) {
    }

    public record BulkRow(long laboratoryId, String organisation, String name, String managerUsername,
                          String participantCode, String passwordLinkPath) {
    }

    public record ItemView(long id, long laboratoryId, String participantCode, String itemLabel, String status,
                           OffsetDateTime dispatchedAt, OffsetDateTime receivedAt, String condition, String conditionNote,
                           Long replacesId) {
    }

    public record Notice(String body, OffsetDateTime postedAt) {
    }

    public record Receipt(String itemLabel, String condition, String note) {
    }

    public record Replacement(String reason) {
    }

    public record Withdrawal(String itemLabel, String reason) {
    }

    /** What a laboratory sees of a round it is enrolled in. */
    public record MyRound(long roundId, String roundCode, String schemeName, String itemDescription, String state,
                          String participantCode, java.time.LocalDate dispatchDate, OffsetDateTime resultDeadline,
                          String resultDeadlineLocal, String timeZone, String latePolicy, String instructions,
                          String cautionsHeading, List<String> cautions, String cautionsDeference,
                          List<MyItem> items, List<Notice> notices, boolean receiptOpen) {

        /** Whether the laboratory's scores have been issued to it (from the preliminary report on). */
        public boolean scoresIssued() {
            return RoundState.valueOf(state).resultsVisibleBeyondOwnLab();
        }
    }

    public record MyItem(String itemLabel, String status, OffsetDateTime dispatchedAt, OffsetDateTime receivedAt,
                         String condition, String conditionNote, boolean replacement) {
    }

    public record MyRoundSummary(long roundId, String roundCode, String schemeName, String state,
                                 String participantCode, OffsetDateTime resultDeadline, String timeZone) {
    }

    // ---- coordinators ------------------------------------------------------------------------------

    @Transactional
    public Enrolled enrol(long roundId, Enrolment request) {
        Round round = gate.enter(roundId, RoundAction.ENROL);
        if (request == null) {
            throw new DomainException.BadRequest("Name an enrolled laboratory by its id, or give a new laboratory's details.");
        }
        long laboratoryId;
        String managerUsername = null;
        String link = null;
        OffsetDateTime expires = null;
        if (request.laboratoryId() != null) {
            // coordinators (and the demo loader, which runs as the system) may name any laboratory
            long found = ((Number) entityManager.createNativeQuery("SELECT count(*) FROM laboratory WHERE id = :l")
                    .setParameter("l", request.laboratoryId()).getSingleResult()).longValue();
            if (found == 0) {
                throw new DomainException.NotFound("The laboratory");
            }
            laboratoryId = request.laboratoryId();
        } else {
            LaboratoryService.CreatedLaboratory created = laboratories.create(new LaboratoryService.NewLaboratory(
                    request.name(), request.organisation(), request.country(), request.contactName(),
                    request.contactEmail(), request.managerUsername(), null));
            laboratoryId = created.laboratory().id();
            AccountService.UserWithLink manager = created.firstManager();
            managerUsername = manager.user().username();
            link = manager.passwordLinkPath();
            expires = manager.linkExpiresAt();
        }
        long already = ((Number) entityManager.createNativeQuery(
                "SELECT count(*) FROM round_participant WHERE round_id = :r AND laboratory_id = :l")
                .setParameter("r", roundId).setParameter("l", laboratoryId).getSingleResult()).longValue();
        if (already > 0) {
            throw new DomainException.Conflict("This laboratory is enrolled in the round already.");
        }
        entityManager.flush();
        Map<Long, String> codes = assignCodes(round, List.of(laboratoryId));
        insertParticipants(round.id, codes);
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.enrolled", "round-participant",
                roundId + "/" + laboratoryId, null, ObjectHash.of(Map.of("round", roundId, "laboratory", laboratoryId,
                        "code", codes.get(laboratoryId))), null));
        Participant participant = participants(roundId, laboratoryId).get(0);
        return new Enrolled(participant, managerUsername, link, expires);
    }

    /**
     * Enrols many new laboratories with their first managers in one transaction: set-based inserts, codes
     * drawn in memory, one audit event for the batch (after-hash over laboratory ids and codes).
     */
    @Transactional
    public BulkEnrolled enrolInBulk(long roundId, List<LaboratoryService.NewLaboratory> rows) {
        Round round = gate.enter(roundId, RoundAction.ENROL);
        LaboratoryBulkService.Batch batch = bulk.create(rows);
        List<Long> ids = batch.laboratories().stream().map(LaboratoryBulkService.Created::laboratoryId).toList();
        Map<Long, String> codes = assignCodes(round, ids);
        insertParticipants(round.id, codes);
        StringBuilder digest = new StringBuilder();
        List<BulkRow> out = new ArrayList<>(ids.size());
        for (LaboratoryBulkService.Created c : batch.laboratories()) {
            String code = codes.get(c.laboratoryId());
            digest.append(c.laboratoryId()).append(':').append(code).append('\n');
            out.add(new BulkRow(c.laboratoryId(), c.organisation(), c.name(), c.managerUsername(), code, c.passwordLinkPath()));
        }
        audit.record(new AuditTrail.Event(currentUser.actor(), "round.bulk-enrolled", "round", Long.toString(roundId),
                null, Secrets.sha256Hex(digest.toString()), "laboratories=" + out.size()));
        return new BulkEnrolled(out.size(), batch.linksExpireAt(), out);
    }

    /** The code table of a round (coordinators only). */
    @Transactional
    public List<Participant> participants(long roundId) {
        gate.find(roundId);
        return participants(roundId, null);
    }

    /** One page of a round's code table, by participant code, with the count of all (coordinators only). */
    public record ParticipantPage(List<Participant> participants, org.roundtable.platform.Paging paging) {
    }

    /** One page of a round's items, by participant code and label, with the count of all (coordinators only). */
    public record ItemPage(List<ItemView> items, org.roundtable.platform.Paging paging) {
    }

    /**
     * Page {@code page} (null: the first; past the end: the last) of the code table, {@code size} rows a page: a
     * count and one LIMIT/OFFSET read along the (round, participant code) index, never the whole table.
     */
    @Transactional
    public ParticipantPage participants(long roundId, Integer page, int size) {
        gate.find(roundId);
        long total = ((Number) entityManager.createNativeQuery(
                "SELECT count(*) FROM round_participant WHERE round_id = :r").setParameter("r", roundId)
                .getSingleResult()).longValue();
        org.roundtable.platform.Paging paging = org.roundtable.platform.Paging.of(page, size, total);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT l.id, l.organisation, l.name, l.country, p.participant_code, p.enrolled_at
                  FROM round_participant p JOIN laboratory l ON l.id = p.laboratory_id
                 WHERE p.round_id = :r
                 ORDER BY p.participant_code
                 LIMIT :limit OFFSET :offset
                """).setParameter("r", roundId).setParameter("limit", paging.size())
                .setParameter("offset", paging.offset()).getResultList();
        return new ParticipantPage(rows.stream().map(r -> new Participant(((Number) r[0]).longValue(), (String) r[1],
                (String) r[2], r[3].toString(), (String) r[4], Timestamps.utc(r[5]))).toList(), paging);
    }

    private List<Participant> participants(long roundId, Long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT l.id, l.organisation, l.name, l.country, p.participant_code, p.enrolled_at
                  FROM round_participant p JOIN laboratory l ON l.id = p.laboratory_id
                 WHERE p.round_id = :r AND (CAST(:l AS bigint) IS NULL OR p.laboratory_id = CAST(:l AS bigint))
                 ORDER BY p.participant_code
                """).setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        return rows.stream().map(r -> new Participant(((Number) r[0]).longValue(), (String) r[1], (String) r[2],
                r[3].toString(), (String) r[4], Timestamps.utc(r[5]))).toList();
    }

    /** Creates one item record per enrolled laboratory and item label; returns how many. Called by DISPATCH_ITEMS. */
    @Transactional(Transactional.TxType.MANDATORY)
    int dispatchAll(Round round) {
        return entityManager.createNativeQuery("""
                INSERT INTO item_dispatch (round_id, laboratory_id, item_label, status, dispatched_at)
                SELECT p.round_id, p.laboratory_id, label, 'DISPATCHED', :now
                  FROM round_participant p CROSS JOIN unnest(string_to_array(:labels, ',')) AS label
                 WHERE p.round_id = :r
                """).setParameter("now", now()).setParameter("labels", round.itemLabels).setParameter("r", round.id)
                .executeUpdate();
    }

    @Transactional
    public List<ItemView> items(long roundId) {
        gate.find(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT d.id, d.laboratory_id, p.participant_code, d.item_label, d.status, d.dispatched_at, d.received_at,
                       d.item_condition, d.condition_note, d.replaces_id
                  FROM item_dispatch d JOIN round_participant p ON p.round_id = d.round_id AND p.laboratory_id = d.laboratory_id
                 WHERE d.round_id = :r ORDER BY p.participant_code, d.item_label, d.id
                """).setParameter("r", roundId).getResultList();
        return rows.stream().map(EnrolmentService::itemView).toList();
    }

    /**
     * Page {@code page} (null: the first; past the end: the last) of the round's items, {@code size} rows a page: a
     * count and one LIMIT/OFFSET read, never every item.
     */
    @Transactional
    public ItemPage items(long roundId, Integer page, int size) {
        gate.find(roundId);
        long total = ((Number) entityManager.createNativeQuery(
                "SELECT count(*) FROM item_dispatch WHERE round_id = :r").setParameter("r", roundId)
                .getSingleResult()).longValue();
        org.roundtable.platform.Paging paging = org.roundtable.platform.Paging.of(page, size, total);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT d.id, d.laboratory_id, p.participant_code, d.item_label, d.status, d.dispatched_at, d.received_at,
                       d.item_condition, d.condition_note, d.replaces_id
                  FROM item_dispatch d JOIN round_participant p ON p.round_id = d.round_id AND p.laboratory_id = d.laboratory_id
                 WHERE d.round_id = :r ORDER BY p.participant_code, d.item_label, d.id
                 LIMIT :limit OFFSET :offset
                """).setParameter("r", roundId).setParameter("limit", paging.size())
                .setParameter("offset", paging.offset()).getResultList();
        return new ItemPage(rows.stream().map(EnrolmentService::itemView).toList(), paging);
    }

    private static ItemView itemView(Object[] r) {
        return new ItemView(((Number) r[0]).longValue(), ((Number) r[1]).longValue(),
                (String) r[2], (String) r[3], (String) r[4], Timestamps.utc(r[5]), Timestamps.utc(r[6]),
                (String) r[7], (String) r[8], r[9] == null ? null : ((Number) r[9]).longValue());
    }

    /** Sends a replacement for a damaged or unsuitable item; the old record is kept, marked replaced. */
    @Transactional
    public ItemView replace(long roundId, long itemId, Replacement replacement) {
        gate.enter(roundId, RoundAction.REPLACE_ITEM);
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT laboratory_id, item_label, status FROM item_dispatch WHERE id = :id AND round_id = :r FOR UPDATE
                """).setParameter("id", itemId).setParameter("r", roundId).getResultList();
        if (found.isEmpty()) {
            throw new DomainException.NotFound("The item");
        }
        String reason = reason(replacement == null ? null : replacement.reason());
        String status = (String) found.get(0)[2];
        if (!status.equals("DISPATCHED") && !status.equals("RECEIVED")) {
            throw new DomainException.Conflict("This item is " + status.toLowerCase(Locale.ROOT) + ": it cannot be replaced.");
        }
        long laboratoryId = ((Number) found.get(0)[0]).longValue();
        entityManager.createNativeQuery("UPDATE item_dispatch SET status = 'REPLACED', version = version + 1 WHERE id = :id")
                .setParameter("id", itemId).executeUpdate();
        long newId = ((Number) entityManager.createNativeQuery("""
                INSERT INTO item_dispatch (round_id, laboratory_id, item_label, status, dispatched_at, replaces_id)
                VALUES (:r, :l, :label, 'DISPATCHED', :now, :old) RETURNING id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("label", found.get(0)[1])
                .setParameter("now", now()).setParameter("old", itemId).getSingleResult()).longValue();
        audit.record(new AuditTrail.Event(currentUser.actor(), "item.replaced", "item-dispatch", Long.toString(itemId),
                null, null, "replacement=" + newId + " reason=" + reason));
        @SuppressWarnings("unchecked")
        List<Object[]> created = entityManager.createNativeQuery("""
                SELECT d.id, d.laboratory_id, p.participant_code, d.item_label, d.status, d.dispatched_at, d.received_at,
                       d.item_condition, d.condition_note, d.replaces_id
                  FROM item_dispatch d JOIN round_participant p ON p.round_id = d.round_id AND p.laboratory_id = d.laboratory_id
                 WHERE d.id = :id
                """).setParameter("id", newId).getResultList();
        return itemView(created.get(0));
    }

    /** Withdraws an item (by label, for every laboratory) and posts a notice to the round's participants. */
    @Transactional
    public Notice withdraw(long roundId, Withdrawal withdrawal) {
        Round round = gate.enter(roundId, RoundAction.WITHDRAW_ITEM);
        if (withdrawal == null || withdrawal.itemLabel() == null
                || !List.of(round.itemLabels.split(",")).contains(withdrawal.itemLabel().strip())) {
            throw new DomainException.BadRequest("Name the item to withdraw by its label: " + round.itemLabels + ".");
        }
        String label = withdrawal.itemLabel().strip();
        String reason = reason(withdrawal.reason());
        int changed = entityManager.createNativeQuery("""
                UPDATE item_dispatch SET status = 'WITHDRAWN', version = version + 1
                 WHERE round_id = :r AND item_label = :label AND status IN ('DISPATCHED', 'RECEIVED')
                """).setParameter("r", roundId).setParameter("label", label).executeUpdate();
        if (changed == 0) {
            throw new DomainException.Conflict("Item " + label + " has been withdrawn already.");
        }
        String body = "Item " + label + " of round " + round.code + " is withdrawn: " + reason
                + " Do not report results for it.";
        OffsetDateTime now = now();
        entityManager.createNativeQuery("""
                INSERT INTO round_notice (round_id, body, posted_by, posted_at) VALUES (:r, :body, :by, :at)
                """).setParameter("r", roundId).setParameter("body", body).setParameter("by", currentUser.actor().name())
                .setParameter("at", now).executeUpdate();
        audit.record(new AuditTrail.Event(currentUser.actor(), "item.withdrawn", "round", Long.toString(roundId),
                null, Secrets.sha256Hex(body), "label=" + label + " items=" + changed));
        return new Notice(body, now);
    }

    @Transactional
    public List<Notice> notices(long roundId) {
        gate.find(roundId);
        return noticesOf(roundId);
    }

    // ---- laboratories (own laboratory from CurrentUser only) ---------------------------------------------

    @Transactional
    public List<MyRoundSummary> myRounds() {
        long lab = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT r.id, r.code, s.name, r.state, p.participant_code, r.result_deadline, r.deadline_time_zone
                  FROM round_participant p JOIN round r ON r.id = p.round_id JOIN scheme s ON s.id = r.scheme_id
                 WHERE p.laboratory_id = :l ORDER BY r.result_deadline DESC, r.id DESC
                """).setParameter("l", lab).getResultList();
        return rows.stream().map(r -> new MyRoundSummary(((Number) r[0]).longValue(), (String) r[1], (String) r[2],
                (String) r[3], (String) r[4], Timestamps.utc(r[5]), (String) r[6])).toList();
    }

    /**
     * The own laboratory's items still waiting for their receipt (dispatched, not yet acknowledged), by round, in one
     * query over all its rounds (the laboratory's home page).
     */
    @Transactional
    public Map<Long, List<String>> myItemsAwaitingReceipt() {
        long lab = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT d.round_id, d.item_label FROM item_dispatch d
                  JOIN round_participant p ON p.round_id = d.round_id AND p.laboratory_id = d.laboratory_id
                 WHERE d.laboratory_id = :l AND d.status = 'DISPATCHED' ORDER BY d.round_id, d.item_label, d.id
                """).setParameter("l", lab).getResultList();
        Map<Long, List<String>> out = new HashMap<>();
        for (Object[] r : rows) {
            out.computeIfAbsent(((Number) r[0]).longValue(), k -> new ArrayList<>()).add((String) r[1]);
        }
        return out;
    }

    @Transactional
    public MyRound myRound(long roundId) {
        long lab = currentUser.requireLaboratoryId();
        String code = ownCode(roundId, lab);
        Round round = gate.find(roundId);
        String schemeName = (String) entityManager.createNativeQuery("SELECT name FROM scheme WHERE id = :s")
                .setParameter("s", round.schemeId).getSingleResult();
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT item_label, status, dispatched_at, received_at, item_condition, condition_note, replaces_id
                  FROM item_dispatch WHERE round_id = :r AND laboratory_id = :l ORDER BY item_label, id
                """).setParameter("r", roundId).setParameter("l", lab).getResultList();
        List<MyItem> items = rows.stream().map(r -> new MyItem((String) r[0], (String) r[1], Timestamps.utc(r[2]),
                Timestamps.utc(r[3]), (String) r[4], (String) r[5], r[6] != null)).toList();
        return new MyRound(round.id, round.code, schemeName, round.itemDescription, round.state.name(), code,
                round.dispatchDate, round.resultDeadline,
                java.time.format.DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm", Locale.ROOT)
                        .format(round.resultDeadline.atZoneSameInstant(java.time.ZoneId.of(round.deadlineTimeZone))),
                round.deadlineTimeZone, round.latePolicy.name(), round.instructions, SafetyCautions.HEADING,
                SafetyCautions.POINTS, SafetyCautions.DEFERENCE, items, noticesOf(roundId),
                RoundStateMachine.allows(round.state, RoundAction.ACKNOWLEDGE_RECEIPT));
    }

    /** The laboratory acknowledges receipt of one of its items and reports its condition. */
    @Transactional
    public MyRound acknowledgeReceipt(long roundId, Receipt receipt) {
        long lab = currentUser.requireLaboratoryId();
        acknowledgeReceiptFor(lab, currentUser.actor(), roundId, receipt);
        return myRound(roundId);
    }

    /** As {@link #acknowledgeReceipt}, for a laboratory named by the caller: only the demo loader. */
    @Transactional
    public void acknowledgeReceiptFor(long lab, org.roundtable.audit.Actor actor, long roundId, Receipt receipt) {
        ownCode(roundId, lab);
        gate.enterShared(roundId, RoundAction.ACKNOWLEDGE_RECEIPT);
        if (receipt == null || receipt.itemLabel() == null || receipt.itemLabel().isBlank()) {
            throw new DomainException.BadRequest("Name the item by its label.");
        }
        String condition = receipt.condition() == null ? "" : receipt.condition().strip().toUpperCase(Locale.ROOT);
        if (!Set.of("GOOD", "DAMAGED", "CONTAMINATED", "OTHER").contains(condition)) {
            throw new DomainException.BadRequest("The condition is GOOD, DAMAGED, CONTAMINATED or OTHER.");
        }
        String note = receipt.note() == null || receipt.note().isBlank() ? null : receipt.note().strip();
        if (note != null && note.length() > 1000) {
            throw new DomainException.BadRequest("The note has at most 1000 characters.");
        }
        if (!condition.equals("GOOD") && note == null) {
            throw new DomainException.BadRequest("Describe what is wrong with the item.");
        }
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT id, status FROM item_dispatch
                 WHERE round_id = :r AND laboratory_id = :l AND item_label = :label AND status <> 'REPLACED' FOR UPDATE
                """).setParameter("r", roundId).setParameter("l", lab).setParameter("label", receipt.itemLabel().strip())
                .getResultList();
        if (found.isEmpty()) {
            throw new DomainException.BadRequest("Your laboratory has no item labelled " + receipt.itemLabel().strip() + " in this round.");
        }
        String status = (String) found.get(0)[1];
        if (!status.equals("DISPATCHED")) {
            throw new DomainException.Conflict("This item is " + status.toLowerCase(Locale.ROOT) + " already.");
        }
        long itemId = ((Number) found.get(0)[0]).longValue();
        entityManager.createNativeQuery("""
                UPDATE item_dispatch SET status = 'RECEIVED', received_at = :now, received_by = :by,
                       item_condition = :c, condition_note = :note, version = version + 1 WHERE id = :id
                """).setParameter("now", now()).setParameter("by", actor.name()).setParameter("c", condition)
                .setParameter("note", note).setParameter("id", itemId).executeUpdate();
        audit.record(new AuditTrail.Event(actor, "item.received", "item-dispatch", Long.toString(itemId),
                null, ObjectHash.of(Map.of("condition", condition, "note", note == null ? "" : note)), "condition=" + condition));
    }

    // ---- internals ---------------------------------------------------------------------------------------

    /** The laboratory's own code in the round; "not found" — the same as a missing round — if not enrolled. */
    private String ownCode(long roundId, long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<String> codes = entityManager.createNativeQuery(
                "SELECT participant_code FROM round_participant WHERE round_id = :r AND laboratory_id = :l")
                .setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        if (codes.isEmpty()) {
            throw new DomainException.NotFound("The round");
        }
        return codes.get(0);
    }

    private List<Notice> noticesOf(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(
                "SELECT body, posted_at FROM round_notice WHERE round_id = :r ORDER BY id DESC")
                .setParameter("r", roundId).getResultList();
        return rows.stream().map(r -> new Notice((String) r[0], Timestamps.utc(r[1]))).toList();
    }

    /** Draws codes for the laboratories, reusing scheme-wide codes when the round's scope says so. */
    private Map<Long, String> assignCodes(Round round, List<Long> laboratoryIds) {
        Map<Long, String> codes = new HashMap<>();
        return entityManager.unwrap(Session.class).doReturningWork(connection -> {
            Set<String> taken = new HashSet<>();
            try (PreparedStatement s = connection.prepareStatement(
                    "SELECT participant_code FROM round_participant WHERE round_id = ?")) {
                s.setLong(1, round.id);
                try (ResultSet rs = s.executeQuery()) {
                    while (rs.next()) {
                        taken.add(rs.getString(1));
                    }
                }
            }
            if (round.codeScope == Round.CodeScope.SCHEME) {
                Map<Long, String> existing = new HashMap<>();
                try (PreparedStatement s = connection.prepareStatement(
                        "SELECT laboratory_id, participant_code FROM scheme_participant_code WHERE scheme_id = ?")) {
                    s.setLong(1, round.schemeId);
                    try (ResultSet rs = s.executeQuery()) {
                        while (rs.next()) {
                            existing.put(rs.getLong(1), rs.getString(2));
                            taken.add(rs.getString(2));
                        }
                    }
                }
                List<Long> fresh = new ArrayList<>();
                for (Long lab : laboratoryIds) {
                    if (existing.containsKey(lab)) {
                        codes.put(lab, existing.get(lab));
                    } else {
                        codes.put(lab, ParticipantCodes.draw(taken));
                        fresh.add(lab);
                    }
                }
                if (!fresh.isEmpty()) {
                    try (PreparedStatement s = connection.prepareStatement("""
                            INSERT INTO scheme_participant_code (scheme_id, laboratory_id, participant_code)
                            SELECT ?, l, c FROM unnest(?::bigint[], ?::text[]) AS t(l, c)
                            """)) {
                        s.setLong(1, round.schemeId);
                        s.setArray(2, connection.createArrayOf("bigint", fresh.toArray(new Long[0])));
                        s.setArray(3, connection.createArrayOf("text", fresh.stream().map(codes::get).toArray(String[]::new)));
                        s.executeUpdate();
                    }
                }
            } else {
                for (Long lab : laboratoryIds) {
                    codes.put(lab, ParticipantCodes.draw(taken));
                }
            }
            return codes;
        });
    }

    private void insertParticipants(long roundId, Map<Long, String> codes) {
        OffsetDateTime now = now();
        String actor = currentUser.actor().name();
        entityManager.unwrap(Session.class).doWork(connection -> {
            Long[] labs = codes.keySet().toArray(new Long[0]);
            String[] values = new String[labs.length];
            for (int i = 0; i < labs.length; i++) {
                values[i] = codes.get(labs[i]);
            }
            try (PreparedStatement s = connection.prepareStatement("""
                    INSERT INTO round_participant (round_id, laboratory_id, participant_code, enrolled_at, enrolled_by)
                    SELECT ?, l, c, ?, ? FROM unnest(?::bigint[], ?::text[]) AS t(l, c)
                    """)) {
                s.setLong(1, roundId);
                s.setObject(2, now);
                s.setString(3, actor);
                s.setArray(4, connection.createArrayOf("bigint", labs));
                s.setArray(5, connection.createArrayOf("text", values));
                s.executeUpdate();
            }
        });
    }

    private static String reason(String reason) {
        if (reason == null || reason.isBlank() || reason.length() > 1000) {
            throw new DomainException.BadRequest("Give a reason (1 to 1000 characters).");
        }
        return reason.strip();
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
