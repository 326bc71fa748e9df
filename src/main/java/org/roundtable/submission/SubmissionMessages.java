package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;
import org.roundtable.account.CurrentUser;
import org.roundtable.audit.AuditTrail;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundAccess;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/** Comments and queries between a laboratory and the coordinator about a round's submission; all are kept. */
@ApplicationScoped
public class SubmissionMessages {

    static final int MAX_LENGTH = 4000;

    private final RoundAccess rounds;
    private final CurrentUser currentUser;
    private final AuditTrail audit;
    private final EntityManager entityManager;
    private final Clock clock;

    public SubmissionMessages(RoundAccess rounds, CurrentUser currentUser, AuditTrail audit, EntityManager entityManager,
                              Clock clock) {
        this.rounds = rounds;
        this.currentUser = currentUser;
        this.audit = audit;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    @Transactional
    public SubmissionViews.Message postAsLaboratory(long roundId, String body) {
        long laboratoryId = currentUser.requireLaboratoryId();
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The round"));
        return post(roundId, laboratoryId, false, body);
    }

    @Transactional
    public SubmissionViews.Message replyAsCoordinator(long roundId, long laboratoryId, String body) {
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The laboratory's submission"));
        return post(roundId, laboratoryId, true, body);
    }

    @Transactional
    public List<SubmissionViews.Message> ownThread(long roundId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The round"));
        return list(roundId, laboratoryId);
    }

    /**
     * The own laboratory's rounds whose message thread ends with a coordinator's answer, in one query over all its
     * rounds (the laboratory's home page).
     */
    @Transactional
    public java.util.Set<Long> roundsAnsweredLast() {
        long laboratoryId = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Object> rows = entityManager.createNativeQuery("""
                SELECT round_id FROM (
                    SELECT DISTINCT ON (m.round_id) m.round_id, m.from_coordinator FROM submission_message m
                      JOIN round_participant p ON p.round_id = m.round_id AND p.laboratory_id = m.laboratory_id
                     WHERE m.laboratory_id = :l ORDER BY m.round_id, m.id DESC) last
                 WHERE from_coordinator
                """).setParameter("l", laboratoryId).getResultList();
        java.util.Set<Long> out = new java.util.HashSet<>();
        rows.forEach(r -> out.add(((Number) r).longValue()));
        return out;
    }

    /** Coordinators: every laboratory's messages in the round. */
    @Transactional
    public List<SubmissionViews.Message> allOfRound(long roundId) {
        rounds.window(roundId);
        return list(roundId, null);
    }

    /** The newest {@code limit} messages of a round, oldest of them first, and the count of all (coordinators). */
    @Transactional
    public SubmissionViews.Latest<SubmissionViews.Message> latestOfRound(long roundId, int limit) {
        rounds.window(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, laboratory_id, from_coordinator, author, body, posted_at FROM submission_message
                 WHERE round_id = :r ORDER BY id DESC LIMIT :limit
                """).setParameter("r", roundId).setParameter("limit", limit).getResultList();
        long total = ((Number) entityManager.createNativeQuery(
                "SELECT count(*) FROM submission_message WHERE round_id = :r").setParameter("r", roundId)
                .getSingleResult()).longValue();
        List<SubmissionViews.Message> messages = new java.util.ArrayList<>(rows.stream().map(r -> new SubmissionViews.Message(
                ((Number) r[0]).longValue(), ((Number) r[1]).longValue(), (Boolean) r[2], (String) r[3], (String) r[4],
                Timestamps.utc(r[5]))).toList());
        java.util.Collections.reverse(messages);
        return new SubmissionViews.Latest<>(messages, total);
    }

    private SubmissionViews.Message post(long roundId, long laboratoryId, boolean fromCoordinator, String body) {
        String text = body == null ? "" : body.strip();
        if (text.isEmpty() || text.length() > MAX_LENGTH) {
            throw new DomainException.BadRequest("A message has 1 to " + MAX_LENGTH + " characters.");
        }
        OffsetDateTime now = OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
        long id = ((Number) entityManager.createNativeQuery("""
                INSERT INTO submission_message (round_id, laboratory_id, from_coordinator, author, body, posted_at)
                VALUES (:r, :l, :coordinator, :author, :body, :now) RETURNING id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("coordinator", fromCoordinator)
                .setParameter("author", currentUser.username()).setParameter("body", text).setParameter("now", now)
                .getSingleResult()).longValue();
        audit.record(new AuditTrail.Event(currentUser.actor(), "submission.message-posted", "submission-message",
                Long.toString(id), null, null, "round=" + roundId + " laboratory=" + laboratoryId));
        return new SubmissionViews.Message(id, laboratoryId, fromCoordinator, currentUser.username(), text, now);
    }

    private List<SubmissionViews.Message> list(long roundId, Long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT id, laboratory_id, from_coordinator, author, body, posted_at FROM submission_message
                 WHERE round_id = :r AND (CAST(:l AS bigint) IS NULL OR laboratory_id = :l) ORDER BY id
                """).setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        return rows.stream().map(r -> new SubmissionViews.Message(((Number) r[0]).longValue(), ((Number) r[1]).longValue(),
                (Boolean) r[2], (String) r[3], (String) r[4], Timestamps.utc(r[5]))).toList();
    }
}
