package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.notice.NoticeKind;
import org.roundtable.notice.NoticeService;
import org.roundtable.platform.DomainException;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;

/**
 * A laboratory's grants to auditors: time-limited, revocable, audited. A grant lets one auditor see the
 * laboratory's identity, history and per-laboratory reports; nothing else.
 */
@ApplicationScoped
public class AuditorGrantService {

    static final int MAX_GRANT_DAYS = 730;

    private final AuditorGrantRepository grants;
    private final UserAccountRepository users;
    private final LaboratoryRepository laboratories;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final Clock clock;
    private final NoticeService notices;

    public AuditorGrantService(AuditorGrantRepository grants, UserAccountRepository users,
                               LaboratoryRepository laboratories, AuditTrail audit, CurrentUser currentUser,
                               Clock clock, NoticeService notices) {
        this.grants = grants;
        this.users = users;
        this.laboratories = laboratories;
        this.audit = audit;
        this.currentUser = currentUser;
        this.clock = clock;
        this.notices = notices;
    }

    /** A grant as listed: active, revoked (ended by the laboratory) or expired (its end date passed). */
    public record GrantView(long id, long laboratoryId, String auditorUsername, String auditorName,
                            OffsetDateTime grantedAt, OffsetDateTime validUntil, OffsetDateTime revokedAt, boolean active) {

        public boolean revoked() {
            return revokedAt != null;
        }

        public boolean expired() {
            return !active && revokedAt == null;
        }
    }

    /**
     * A second active grant to the same auditor: refused (409); the existing grant is named so that the page and
     * the problem body can point to extending it instead.
     */
    public static class GrantExists extends DomainException {
        private final long existingGrantId;

        public GrantExists(long existingGrantId, String auditorUsername, OffsetDateTime validUntil) {
            super(409, "Conflict", "The auditor " + auditorUsername + " already has access until "
                    + validUntil.toLocalDate() + ". Extend that access instead of granting it twice: POST "
                    + "/api/v1/my-laboratory/auditor-grants/" + existingGrantId + "/extend.");
            this.existingGrantId = existingGrantId;
        }

        public long existingGrantId() {
            return existingGrantId;
        }
    }

    /** A laboratory as an auditor sees it through a grant. */
    public record GrantedLaboratory(long laboratoryId, String name, String organisation, String country,
                                    OffsetDateTime validUntil) {
    }

    /**
     * The data window of an auditor's valid grant from a laboratory: the auditor may see rounds whose final report
     * was first issued from {@code from} to {@code until} (UTC days, both included; null = open).
     */
    public record DataWindow(java.time.LocalDate from, java.time.LocalDate until) {
        public boolean contains(java.time.LocalDate day) {
            return (from == null || !day.isBefore(from)) && (until == null || !day.isAfter(until));
        }
    }

    /**
     * The data windows of the auditor's currently valid grants from the laboratory (one per grant; a round is
     * visible when any window contains it); empty without a valid grant.
     */
    @Transactional
    public List<DataWindow> activeDataWindows(long auditorId, long laboratoryId) {
        return grants.list("auditorId = ?1 and laboratoryId = ?2 and revokedAt is null and validUntil > ?3",
                auditorId, laboratoryId, now()).stream().map(g -> new DataWindow(g.dataFrom, g.dataUntil)).toList();
    }

    @Transactional
    public GrantView grant(String auditorUsername, OffsetDateTime validUntil) {
        return grant(auditorUsername, validUntil, null, null);
    }

    /** A grant with a data window (either end may be open); see {@link DataWindow}. */
    @Transactional
    public GrantView grant(String auditorUsername, OffsetDateTime validUntil, java.time.LocalDate dataFrom,
                           java.time.LocalDate dataUntil) {
        if (dataFrom != null && dataUntil != null && dataFrom.isAfter(dataUntil)) {
            throw new DomainException.BadRequest("The data window starts on or before the day it ends.");
        }
        long laboratoryId = currentUser.requireLaboratoryId();
        UserAccount auditor = users.find("username", auditorUsername == null ? "" : auditorUsername.strip().toLowerCase())
                .firstResultOptional()
                .filter(u -> Role.AUDITOR.roleName().equals(u.role) && u.enabled)
                .orElseThrow(() -> new DomainException.Unprocessable("There is no active auditor with this username."));
        OffsetDateTime now = now();
        if (validUntil == null || !validUntil.isAfter(now) || validUntil.isAfter(now.plusDays(MAX_GRANT_DAYS))) {
            throw new DomainException.BadRequest("A grant ends in the future, within " + MAX_GRANT_DAYS + " days.");
        }
        // one active grant per auditor and laboratory: concurrent grants of one laboratory queue on its row
        grants.getEntityManager().createNativeQuery("SELECT id FROM laboratory WHERE id = :id FOR UPDATE")
                .setParameter("id", laboratoryId).getResultList();
        java.util.Optional<AuditorGrant> existing = grants.find(
                "laboratoryId = ?1 and auditorId = ?2 and revokedAt is null and validUntil > ?3 order by validUntil desc",
                laboratoryId, auditor.id, now).firstResultOptional();
        if (existing.isPresent()) {
            throw new GrantExists(existing.get().id, auditor.username, existing.get().validUntil);
        }
        AuditorGrant grant = new AuditorGrant();
        grant.laboratoryId = laboratoryId;
        grant.auditorId = auditor.id;
        grant.grantedBy = currentUser.requireUserId();
        grant.grantedAt = now;
        grant.validUntil = validUntil.withOffsetSameInstant(ZoneOffset.UTC);
        grant.dataFrom = dataFrom;
        grant.dataUntil = dataUntil;
        grants.persist(grant);
        audit.record(new AuditTrail.Event(currentUser.actor(), "auditor-grant.created", "auditor-grant",
                grant.id.toString(), null, hash(grant), "auditor=" + auditor.username + " until=" + grant.validUntil
                + (dataFrom == null && dataUntil == null ? "" : " data=" + dataFrom + ".." + dataUntil)));
        notices.notify(NoticeKind.GRANT_GIVEN, "grant:" + grant.id, auditor.id,
                Map.of("laboratory", laboratories.findById(laboratoryId).name, "until", grant.validUntil));
        return view(grant, auditor, now);
    }

    @Transactional
    public GrantView revoke(long grantId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        AuditorGrant grant = grants.findByIdOptional(grantId).filter(g -> g.laboratoryId == laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The grant"));
        OffsetDateTime now = now();
        if (grant.revokedAt == null) {
            String before = hash(grant);
            grant.revokedAt = now;
            grant.revokedBy = currentUser.requireUserId();
            audit.record(new AuditTrail.Event(currentUser.actor(), "auditor-grant.revoked", "auditor-grant",
                    grant.id.toString(), before, hash(grant), null));
        }
        return view(grant, users.findById(grant.auditorId), now);
    }

    /** Moves the end of an active grant of the caller's laboratory later (within {@value #MAX_GRANT_DAYS} days). */
    @Transactional
    public GrantView extend(long grantId, OffsetDateTime validUntil) {
        long laboratoryId = currentUser.requireLaboratoryId();
        AuditorGrant grant = grants.findByIdOptional(grantId).filter(g -> g.laboratoryId == laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The grant"));
        OffsetDateTime now = now();
        if (!grant.activeAt(now)) {
            throw new DomainException.Conflict(grant.revokedAt != null
                    ? "This access was revoked; grant access anew instead."
                    : "This access has expired; grant access anew instead.");
        }
        if (validUntil == null || !validUntil.isAfter(grant.validUntil) || validUntil.isAfter(now.plusDays(MAX_GRANT_DAYS))) {
            throw new DomainException.BadRequest("The new end lies after the current one ("
                    + grant.validUntil.toLocalDate() + "), within " + MAX_GRANT_DAYS + " days from today.");
        }
        String before = hash(grant);
        grant.validUntil = validUntil.withOffsetSameInstant(ZoneOffset.UTC);
        UserAccount auditor = users.findById(grant.auditorId);
        audit.record(new AuditTrail.Event(currentUser.actor(), "auditor-grant.extended", "auditor-grant",
                grant.id.toString(), before, hash(grant), "auditor=" + auditor.username + " until=" + grant.validUntil));
        return view(grant, auditor, now);
    }

    @Transactional
    public List<GrantView> listOwnLaboratory() {
        OffsetDateTime now = now();
        return grants.list("laboratoryId = ?1 order by grantedAt desc", currentUser.requireLaboratoryId()).stream()
                .map(g -> view(g, users.findById(g.auditorId), now)).toList();
    }

    /** The laboratories that currently grant the signed-in auditor access. */
    @Transactional
    public List<GrantedLaboratory> listGrantedToMe() {
        long auditorId = currentUser.requireUserId();
        OffsetDateTime now = now();
        return grants.list("auditorId = ?1 and revokedAt is null and validUntil > ?2 order by laboratoryId", auditorId, now)
                .stream()
                .map(g -> {
                    Laboratory lab = laboratories.findById(g.laboratoryId);
                    return new GrantedLaboratory(lab.id, lab.name, lab.organisation, lab.country, g.validUntil);
                })
                .toList();
    }

    @Transactional
    public boolean hasActiveGrant(long auditorId, long laboratoryId) {
        return grants.count("auditorId = ?1 and laboratoryId = ?2 and revokedAt is null and validUntil > ?3",
                auditorId, laboratoryId, now()) > 0;
    }

    private static GrantView view(AuditorGrant g, UserAccount auditor, OffsetDateTime now) {
        return new GrantView(g.id, g.laboratoryId, auditor.username, auditor.displayName, g.grantedAt, g.validUntil,
                g.revokedAt, g.activeAt(now));
    }

    private static String hash(AuditorGrant g) {
        return ObjectHash.of(Map.of("id", g.id, "laboratoryId", g.laboratoryId, "auditorId", g.auditorId,
                "validUntil", g.validUntil.toString(), "revoked", String.valueOf(g.revokedAt)));
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
