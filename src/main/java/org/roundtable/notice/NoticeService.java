package org.roundtable.notice;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.audit.Actor;
import org.roundtable.audit.AuditTrail;
import org.roundtable.job.JobService;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;
import org.roundtable.platform.Timestamps;

import java.time.Clock;
import java.time.DateTimeException;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneId;
import java.time.ZonedDateTime;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The one notice service every feature calls (see the package documentation). Creating a notice happens in the
 * caller's transaction and only inserts two rows (the notice, its e-mail job): nothing is sent while the request
 * runs, so a failing SMTP server can neither block nor fail it.
 */
@ApplicationScoped
public class NoticeService {

    /** Job kind of a notice's e-mail. */
    public static final String JOB_KIND = "notice-mail";
    /** Notices on one page of the list. */
    public static final int PAGE_SIZE = 30;

    private static final TypeReference<Map<String, String>> PARAMS = new TypeReference<>() {
    };

    private final EntityManager entityManager;
    private final JobService jobs;
    private final AuditTrail audit;
    private final ObjectMapper mapper;
    private final NoticeSettings settings;
    private final Clock clock;
    private final ZoneId installationZone;

    public NoticeService(EntityManager entityManager, JobService jobs, AuditTrail audit, ObjectMapper mapper,
                         NoticeSettings settings, Clock clock,
                         @ConfigProperty(name = "roundtable.display.time-zone") String installationZone) {
        this.entityManager = entityManager;
        this.jobs = jobs;
        this.audit = audit;
        this.mapper = mapper;
        this.settings = settings;
        this.clock = clock;
        this.installationZone = ZoneId.of(installationZone);
    }

    // ---- creating notices --------------------------------------------------------------------------------

    /**
     * Tells one person about something, once: in the application at once (when the caller's transaction commits),
     * and by e-mail soon after, unless they opted out of the kind. A notice of the same kind about the same object
     * to the same person that exists already makes this a no-op.
     *
     * @param kind            what the notice is about
     * @param objectKey       the object it is about, e.g. {@code round:42} or {@code report:R-2027-1-R-F}; with the
     *                        kind and the recipient it makes the notice unique (at most 200 characters)
     * @param recipientUserId the person ({@code app_user.id}); a missing or disabled account gets nothing
     * @param params          the facts the words are made from: strings, numbers, or instants ({@link Instant},
     *                        {@link OffsetDateTime}; keys {@code deadline} and {@code until} are shown in the
     *                        reader's zone). {@code roundId} chooses the page linked to; {@code link} (a path) names
     *                        it outright. Pass only what the recipient may see.
     * @return whether this call created the notice
     */
    @Transactional
    public boolean notify(NoticeKind kind, String objectKey, long recipientUserId, Map<String, ?> params) {
        if (objectKey == null || objectKey.isBlank() || objectKey.length() > 200) {
            throw new IllegalArgumentException("a notice's object key has 1 to 200 characters: " + objectKey);
        }
        Number enabled = (Number) entityManager.createNativeQuery(
                        "SELECT count(*) FROM app_user WHERE id = :u AND enabled")
                .setParameter("u", recipientUserId).getSingleResult();
        if (enabled.intValue() == 0) {
            return false;
        }
        Map<String, String> facts = strings(params);
        @SuppressWarnings("unchecked")
        List<Number> created = entityManager.createNativeQuery("""
                INSERT INTO notice (kind, object_key, recipient_id, params, link, created_at)
                VALUES (:kind, :key, :u, :params, :link, :at)
                ON CONFLICT (kind, object_key, recipient_id) DO NOTHING
                RETURNING id
                """)
                .setParameter("kind", kind.code())
                .setParameter("key", objectKey)
                .setParameter("u", recipientUserId)
                .setParameter("params", json(facts))
                .setParameter("link", NoticeTexts.link(kind, facts))
                .setParameter("at", now())
                .getResultList();
        if (created.isEmpty()) {
            return false;
        }
        long id = created.get(0).longValue();
        jobs.enqueueOnce(JOB_KIND, "notice:" + kind.code() + ":" + objectKey + ":" + recipientUserId,
                "{\"notice\":" + id + "}", settings.mailAttempts(), "notices");
        return true;
    }

    /** {@link #notify} for every active member of a laboratory; returns how many notices this call created. */
    @Transactional
    public int notifyLaboratory(NoticeKind kind, String objectKey, long laboratoryId, Map<String, ?> params) {
        return notifyAll(kind, objectKey, ids("""
                SELECT id FROM app_user WHERE laboratory_id = :x AND enabled AND role IN ('lab-manager', 'lab-member')
                 ORDER BY id
                """, laboratoryId), params);
    }

    /**
     * {@link #notify} for every active member of the laboratories enrolled in a round, or only of those that have
     * sent no results when {@code onlyMissingResults}. Returns how many notices this call created.
     */
    @Transactional
    public int notifyLaboratoriesOfRound(NoticeKind kind, String objectKey, long roundId, boolean onlyMissingResults,
                                         Map<String, ?> params) {
        int created = 0;
        for (long laboratory : laboratoriesOfRound(roundId, onlyMissingResults)) {
            created += notifyLaboratory(kind, objectKey, laboratory, params);
        }
        return created;
    }

    /** {@link #notify} for every active coordinator except {@code exceptUsername} (may be null). */
    @Transactional
    public int notifyCoordinators(NoticeKind kind, String objectKey, String exceptUsername, Map<String, ?> params) {
        @SuppressWarnings("unchecked")
        List<Number> ids = entityManager.createNativeQuery("""
                SELECT id FROM app_user WHERE role = 'coordinator' AND enabled AND username <> :except ORDER BY id
                """).setParameter("except", exceptUsername == null ? "" : exceptUsername).getResultList();
        return notifyAll(kind, objectKey, ids.stream().map(Number::longValue).toList(), params);
    }

    /** {@link #notify} for every active auditor holding an active grant from one of {@code laboratoryIds}. */
    @Transactional
    public int notifyAuditorsGrantedBy(NoticeKind kind, String objectKey, Collection<Long> laboratoryIds,
                                       Map<String, ?> params) {
        if (laboratoryIds.isEmpty()) {
            return 0;
        }
        @SuppressWarnings("unchecked")
        List<Number> ids = entityManager.createNativeQuery("""
                SELECT DISTINCT g.auditor_id FROM auditor_grant g JOIN app_user u ON u.id = g.auditor_id
                 WHERE g.laboratory_id IN (:labs) AND g.revoked_at IS NULL AND g.valid_until > :now
                   AND u.enabled AND u.role = 'auditor'
                 ORDER BY g.auditor_id
                """).setParameter("labs", laboratoryIds).setParameter("now", now()).getResultList();
        return notifyAll(kind, objectKey, ids.stream().map(Number::longValue).toList(), params);
    }

    /**
     * A coordinator's reminder to the laboratories of a round (all enrolled, or those without results), with a
     * message of their own. Recorded and audited; returns how many people it reached.
     */
    @Transactional
    public int remind(long roundId, String message, boolean onlyMissingResults, Actor actor) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(
                "SELECT code, result_deadline FROM round WHERE id = :r").setParameter("r", roundId).getResultList();
        if (rows.isEmpty()) {
            throw new DomainException.NotFound("The round");
        }
        String text = message == null ? "" : message.strip();
        if (text.isEmpty()) {
            throw new DomainException.BadRequest("Write the reminder's message.");
        }
        if (text.length() > 2000) {
            throw new DomainException.BadRequest("A reminder has at most 2000 characters.");
        }
        long id = ((Number) entityManager.createNativeQuery("""
                INSERT INTO notice_reminder (round_id, message, sent_by, sent_at) VALUES (:r, :m, :by, :at) RETURNING id
                """).setParameter("r", roundId).setParameter("m", text).setParameter("by", actor.name())
                .setParameter("at", now()).getSingleResult()).longValue();
        Map<String, Object> params = new LinkedHashMap<>();
        params.put("round", rows.get(0)[0]);
        params.put("roundId", roundId);
        params.put("deadline", Timestamps.utc(rows.get(0)[1]));
        params.put("message", text);
        int reached = notifyLaboratoriesOfRound(NoticeKind.REMINDER, "reminder:" + id, roundId, onlyMissingResults,
                params);
        audit.record(new AuditTrail.Event(actor, "notice.reminder-sent", "notice_reminder", Long.toString(id), null,
                Secrets.sha256Hex(text), "round=" + roundId + " recipients=" + reached
                + (onlyMissingResults ? " only-missing-results" : "")));
        return reached;
    }

    /** The laboratories enrolled in a round; only those without results when {@code onlyMissingResults}. */
    List<Long> laboratoriesOfRound(long roundId, boolean onlyMissingResults) {
        return ids("""
                SELECT p.laboratory_id FROM round_participant p
                 WHERE p.round_id = :x
                   AND (NOT CAST(:missing AS boolean) OR NOT EXISTS (SELECT 1 FROM submission s
                         WHERE s.round_id = p.round_id AND s.laboratory_id = p.laboratory_id AND s.current_revision > 0))
                 ORDER BY p.laboratory_id
                """.replace(":missing", onlyMissingResults ? "true" : "false"), roundId);
    }

    // ---- reading notices ---------------------------------------------------------------------------------

    /** A notice as its recipient reads it; times already in the reader's zone. */
    public record NoticeView(long id, String kind, String kindLabel, String subject, List<String> paragraphs,
                             String link, String createdAt, boolean read) {
    }

    /** One page of a person's notices, newest first. */
    public record NoticePage(List<NoticeView> notices, long unread, long total, int page, boolean hasNext,
                             String zone) {
    }

    /** A kind the reader can choose to receive by e-mail or not. */
    public record Preference(String kind, String label, boolean byEmail) {
    }

    @Transactional
    public NoticePage page(long userId, int page) {
        int p = Math.max(1, page);
        ZoneId zone = zoneOf(userId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, kind, params, link, created_at, read_at FROM notice
                 WHERE recipient_id = :u ORDER BY created_at DESC, id DESC LIMIT :n OFFSET :o
                """).setParameter("u", userId).setParameter("n", PAGE_SIZE + 1)
                .setParameter("o", (p - 1) * PAGE_SIZE).getResultList();
        List<NoticeView> views = new ArrayList<>();
        for (Object[] r : rows.subList(0, Math.min(rows.size(), PAGE_SIZE))) {
            views.add(view(((Number) r[0]).longValue(), (String) r[1], (String) r[2], (String) r[3],
                    Timestamps.utc(r[4]), r[5] != null, zone));
        }
        Number total = (Number) entityManager.createNativeQuery("SELECT count(*) FROM notice WHERE recipient_id = :u")
                .setParameter("u", userId).getSingleResult();
        return new NoticePage(views, unreadCount(userId), total.longValue(), p, rows.size() > PAGE_SIZE, zone.getId());
    }

    @Transactional
    public long unreadCount(long userId) {
        return ((Number) entityManager.createNativeQuery(
                        "SELECT count(*) FROM notice WHERE recipient_id = :u AND read_at IS NULL")
                .setParameter("u", userId).getSingleResult()).longValue();
    }

    /** Marks one of the reader's notices read; returns the page it leads to. Another person's is "not found". */
    @Transactional
    public String markRead(long userId, long noticeId) {
        @SuppressWarnings("unchecked")
        List<String> links = entityManager.createNativeQuery("""
                UPDATE notice SET read_at = COALESCE(read_at, :at) WHERE id = :id AND recipient_id = :u RETURNING link
                """).setParameter("at", now()).setParameter("id", noticeId).setParameter("u", userId).getResultList();
        if (links.isEmpty()) {
            throw new DomainException.NotFound("The notice");
        }
        return links.get(0) == null ? "/notices" : links.get(0);
    }

    @Transactional
    public int markAllRead(long userId) {
        return entityManager.createNativeQuery(
                        "UPDATE notice SET read_at = :at WHERE recipient_id = :u AND read_at IS NULL")
                .setParameter("at", now()).setParameter("u", userId).executeUpdate();
    }

    // ---- e-mail choices ----------------------------------------------------------------------------------

    /** The kinds the reader's role can receive, each with whether it comes by e-mail. */
    @Transactional
    public List<Preference> preferences(long userId) {
        String role = roleOf(userId);
        Set<String> optedOut = optedOut(userId);
        return java.util.Arrays.stream(NoticeKind.values()).filter(k -> k.reaches(role))
                .map(k -> new Preference(k.code(), k.label(), !optedOut.contains(k.code()))).toList();
    }

    /** Sets which of the reader's kinds come by e-mail: every kind of their role not named is opted out. */
    @Transactional
    public List<Preference> setPreferences(long userId, Collection<String> byEmail, Actor actor) {
        String role = roleOf(userId);
        Set<String> before = optedOut(userId);
        List<String> out = java.util.Arrays.stream(NoticeKind.values()).filter(k -> k.reaches(role))
                .map(NoticeKind::code).filter(c -> byEmail == null || !byEmail.contains(c)).sorted().toList();
        entityManager.createNativeQuery("DELETE FROM notice_opt_out WHERE user_id = :u")
                .setParameter("u", userId).executeUpdate();
        for (String kind : out) {
            entityManager.createNativeQuery(
                            "INSERT INTO notice_opt_out (user_id, kind, chosen_at) VALUES (:u, :k, :at)")
                    .setParameter("u", userId).setParameter("k", kind).setParameter("at", now()).executeUpdate();
        }
        if (!new java.util.TreeSet<>(before).equals(new java.util.TreeSet<>(out))) {
            audit.record(new AuditTrail.Event(actor, "notice.e-mail-choices", "app_user", Long.toString(userId),
                    Secrets.sha256Hex(String.join(",", new java.util.TreeSet<>(before))),
                    Secrets.sha256Hex(String.join(",", out)), "not-by-email=" + String.join(",", out)));
        }
        return preferences(userId);
    }

    // ---- the e-mail job's side ---------------------------------------------------------------------------

    /** An e-mail ready to go; {@code null} parts never occur. */
    record Mail(long noticeId, String to, String subject, String text, String html) {
    }

    /** What the e-mail job finds: a mail to send, or the reason none is sent (already recorded on the notice). */
    record MailDecision(Mail mail, String skipped) {
    }

    /**
     * Decides a notice's e-mail in one transaction: none when it went already, the recipient opted out of its kind,
     * has no address or is disabled (recorded on the notice); otherwise the message in the recipient's zone.
     */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    MailDecision mailFor(long noticeId, NoticeMails mails) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT n.kind, n.params, n.link, n.mail_status, u.id, u.email, u.display_name, u.time_zone, u.enabled,
                       EXISTS (SELECT 1 FROM notice_opt_out o WHERE o.user_id = u.id AND o.kind = n.kind)
                  FROM notice n JOIN app_user u ON u.id = n.recipient_id
                 WHERE n.id = :id FOR UPDATE OF n
                """).setParameter("id", noticeId).getResultList();
        if (rows.isEmpty()) {
            return new MailDecision(null, "notice gone");
        }
        Object[] r = rows.get(0);
        String status = (String) r[3];
        if (!"QUEUED".equals(status) && !"FAILED".equals(status)) {
            return new MailDecision(null, "already " + status);
        }
        String skip = null;
        if (Boolean.TRUE.equals(r[9])) {
            skip = "OPTED_OUT";
        } else if (r[5] == null || ((String) r[5]).isBlank() || !Boolean.TRUE.equals(r[8])) {
            skip = "NO_ADDRESS";
        } else if (!mails.sending()) {
            skip = "MAIL_OFF";
        }
        if (skip != null) {
            updateMailStatus(noticeId, skip);
            return new MailDecision(null, skip);
        }
        NoticeKind kind = NoticeKind.fromCode((String) r[0]).orElseThrow();
        ZoneId zone = zone((String) r[7]);
        NoticeTexts.Text text = NoticeTexts.render(kind, params((String) r[1]), zone);
        return new MailDecision(mails.compose(noticeId, (String) r[5], (String) r[6], text, (String) r[2], zone), null);
    }

    @Transactional(Transactional.TxType.REQUIRES_NEW)
    void setMailStatus(long noticeId, String status) {
        updateMailStatus(noticeId, status);
    }

    /** In the current transaction (a self-call of an intercepted method would open a new one). */
    private void updateMailStatus(long noticeId, String status) {
        entityManager.createNativeQuery("UPDATE notice SET mail_status = :s, mailed_at = :at WHERE id = :id")
                .setParameter("s", status).setParameter("at", "SENT".equals(status) ? now() : null)
                .setParameter("id", noticeId).executeUpdate();
    }

    // ---- the outbox (demo mode) ---------------------------------------------------------------------------

    /** A message kept in the outbox, its time in the admin's zone. */
    public record OutboxMessage(String to, String subject, String text, String writtenAt) {
    }

    /** One page of the outbox, newest first, with one message more than a page when there is a next page. */
    @Transactional
    public List<OutboxMessage> outbox(long viewerId, int page) {
        ZoneId zone = zoneOf(viewerId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT to_address, subject, text_body, written_at FROM mail_outbox
                 ORDER BY written_at DESC, id DESC LIMIT :n OFFSET :o
                """).setParameter("n", PAGE_SIZE + 1).setParameter("o", (Math.max(1, page) - 1) * PAGE_SIZE)
                .getResultList();
        return rows.stream().map(r -> new OutboxMessage((String) r[0], (String) r[1], (String) r[2],
                NoticeTexts.format(Timestamps.utc(r[3]).toInstant(), zone))).toList();
    }

    // ---- scheduled: purge ----------------------------------------------------------------------------------

    /** Deletes notices (and outbox messages) older than the kept months; returns how many notices went. */
    @Transactional
    public int purge() {
        OffsetDateTime before = ZonedDateTime.now(clock).minusMonths(settings.keepMonths()).toOffsetDateTime();
        entityManager.createNativeQuery("DELETE FROM mail_outbox WHERE written_at < :b").setParameter("b", before)
                .executeUpdate();
        return entityManager.createNativeQuery("DELETE FROM notice WHERE created_at < :b").setParameter("b", before)
                .executeUpdate();
    }

    // ---- helpers -------------------------------------------------------------------------------------------

    /** The user's own time zone, or the installation's where they chose none (or an unknown one). */
    ZoneId zoneOf(long userId) {
        @SuppressWarnings("unchecked")
        List<String> zones = entityManager.createNativeQuery("SELECT time_zone FROM app_user WHERE id = :u")
                .setParameter("u", userId).getResultList();
        return zone(zones.isEmpty() ? null : zones.get(0));
    }

    private ZoneId zone(String name) {
        if (name == null || name.isBlank()) {
            return installationZone;
        }
        try {
            return ZoneId.of(name);
        } catch (DateTimeException e) {
            return installationZone;
        }
    }

    private NoticeView view(long id, String kindCode, String params, String link, OffsetDateTime createdAt,
                            boolean read, ZoneId zone) {
        NoticeKind kind = NoticeKind.fromCode(kindCode).orElse(NoticeKind.REMINDER);
        NoticeTexts.Text text = NoticeTexts.render(kind, params(params), zone);
        return new NoticeView(id, kind.code(), kind.label(), text.subject(), text.paragraphs(), link,
                NoticeTexts.format(createdAt.toInstant(), zone), read);
    }

    private int notifyAll(NoticeKind kind, String objectKey, List<Long> users, Map<String, ?> params) {
        int created = 0;
        for (long user : users) {
            if (notify(kind, objectKey, user, params)) {
                created++;
            }
        }
        return created;
    }

    private List<Long> ids(String sql, long parameter) {
        @SuppressWarnings("unchecked")
        List<Number> rows = entityManager.createNativeQuery(sql).setParameter("x", parameter).getResultList();
        return rows.stream().map(Number::longValue).toList();
    }

    private String roleOf(long userId) {
        @SuppressWarnings("unchecked")
        List<String> roles = entityManager.createNativeQuery("SELECT role FROM app_user WHERE id = :u")
                .setParameter("u", userId).getResultList();
        return roles.isEmpty() ? "" : roles.get(0);
    }

    private Set<String> optedOut(long userId) {
        @SuppressWarnings("unchecked")
        List<String> kinds = entityManager.createNativeQuery("SELECT kind FROM notice_opt_out WHERE user_id = :u")
                .setParameter("u", userId).getResultList();
        return Set.copyOf(kinds);
    }

    private static Map<String, String> strings(Map<String, ?> params) {
        Map<String, String> out = new LinkedHashMap<>();
        if (params != null) {
            params.forEach((k, v) -> {
                if (v instanceof OffsetDateTime odt) {
                    out.put(k, odt.toInstant().truncatedTo(ChronoUnit.SECONDS).toString());
                } else if (v instanceof Instant instant) {
                    out.put(k, instant.truncatedTo(ChronoUnit.SECONDS).toString());
                } else if (v != null) {
                    out.put(k, v.toString());
                }
            });
        }
        return out;
    }

    private String json(Map<String, String> facts) {
        try {
            return mapper.writeValueAsString(facts);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private Map<String, String> params(String json) {
        try {
            return mapper.readValue(json == null ? "{}" : json, PARAMS);
        } catch (JsonProcessingException e) {
            return Map.of();
        }
    }

    private OffsetDateTime now() {
        return Timestamps.now(clock).truncatedTo(ChronoUnit.MICROS);
    }
}
