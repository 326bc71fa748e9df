package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;
import org.roundtable.account.CurrentUser;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundAccess;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Reading submissions back. A laboratory reads only its own (the laboratory comes from the caller); a round it is
 * not enrolled in answers "not found" like a missing round. Coordinators read every laboratory's, with codes.
 */
@ApplicationScoped
public class SubmissionQueries {

    private final RoundAccess rounds;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;

    public SubmissionQueries(RoundAccess rounds, CurrentUser currentUser, EntityManager entityManager) {
        this.rounds = rounds;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
    }

    @Transactional
    public SubmissionViews.MySubmission mine(long roundId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        String code = rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The round"));
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        List<SubmissionViews.RevisionSummary> revisions = summaries(roundId, laboratoryId);
        SubmissionViews.Revision current = revisions.isEmpty() ? null
                : revision(roundId, laboratoryId, revisions.get(revisions.size() - 1).revision());
        return new SubmissionViews.MySubmission(roundId, window.roundCode(), code, window.state(), window.resultDeadline(),
                window.deadlineTimeZone(), window.latePolicy(), current, revisions);
    }

    /** The own laboratory's current revision number in each of its rounds with a submission, in one query. */
    @Transactional
    public Map<Long, Integer> myCurrentRevisions() {
        long laboratoryId = currentUser.requireLaboratoryId();
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT s.round_id, s.current_revision FROM submission s
                  JOIN round_participant p ON p.round_id = s.round_id AND p.laboratory_id = s.laboratory_id
                 WHERE s.laboratory_id = :l AND s.current_revision > 0
                """).setParameter("l", laboratoryId).getResultList();
        Map<Long, Integer> out = new java.util.HashMap<>();
        rows.forEach(r -> out.put(((Number) r[0]).longValue(), ((Number) r[1]).intValue()));
        return out;
    }

    @Transactional
    public SubmissionViews.Revision myRevision(long roundId, int revision) {
        long laboratoryId = currentUser.requireLaboratoryId();
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The round"));
        return revision(roundId, laboratoryId, revision);
    }

    /** Coordinators: one line per enrolled laboratory, submitted or not. */
    @Transactional
    public List<SubmissionViews.Participation> participations(long roundId) {
        rounds.window(roundId);
        Map<Long, String> codes = rounds.participantCodes(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT s.laboratory_id, s.current_revision, v.submitted_at, v.late, v.channel
                  FROM submission s JOIN submission_revision v ON v.submission_id = s.id AND v.revision = s.current_revision
                 WHERE s.round_id = :r
                """).setParameter("r", roundId).getResultList();
        Map<Long, Object[]> byLab = new LinkedHashMap<>();
        rows.forEach(row -> byLab.put(((Number) row[0]).longValue(), row));
        List<SubmissionViews.Participation> out = new ArrayList<>();
        codes.forEach((lab, code) -> {
            Object[] row = byLab.get(lab);
            out.add(row == null ? new SubmissionViews.Participation(lab, code, 0, null, false, null)
                    : new SubmissionViews.Participation(lab, code, ((Number) row[1]).intValue(), Timestamps.utc(row[2]),
                    (Boolean) row[3], (String) row[4]));
        });
        return out;
    }

    /**
     * Coordinators: one page of the laboratories enrolled in a round with where they stand (submitted, late,
     * missing), filtered by status (null: all) and by part of the laboratory's name, organisation or participant
     * code; missing first, then late, then submitted, each by laboratory name. One query for the rows, one for the
     * counts, whatever the number of laboratories.
     */
    @Transactional
    public SubmissionViews.StatusPage statusPage(long roundId, SubmissionStatus status, String query, int offset,
                                                 int limit) {
        rounds.window(roundId);
        String like = like(query);
        String filter = status == null ? "" : status.name();
        // one statement: the rows are gathered once (a CTE named twice is computed once), counted, and one page of
        // the matching ones read; a page past the end comes back as the counts alone
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(STATUS_ROWS + """
                , counts AS (
                  SELECT count(*) FILTER (WHERE (:status = '' OR status = :status)
                           AND (lower(laboratory_name) LIKE :q ESCAPE '\\' OR lower(organisation) LIKE :q ESCAPE '\\'
                                OR lower(participant_code) LIKE :q ESCAPE '\\')) AS matching,
                         count(*) FILTER (WHERE status = 'SUBMITTED') AS submitted,
                         count(*) FILTER (WHERE status = 'LATE') AS late,
                         count(*) FILTER (WHERE status = 'MISSING') AS missing
                    FROM rows)
                SELECT c.matching, c.submitted, c.late, c.missing, p.laboratory_id, p.laboratory_name, p.organisation,
                       p.participant_code, p.current_revision, p.submitted_at, p.channel, p.status, p.revisions
                  FROM counts c LEFT JOIN LATERAL (
                       SELECT * FROM rows
                        WHERE (:status = '' OR status = :status)
                          AND (lower(laboratory_name) LIKE :q ESCAPE '\\' OR lower(organisation) LIKE :q ESCAPE '\\'
                               OR lower(participant_code) LIKE :q ESCAPE '\\')
                        ORDER BY CASE status WHEN 'MISSING' THEN 0 WHEN 'LATE' THEN 1 ELSE 2 END, lower(laboratory_name),
                                 participant_code
                        LIMIT :limit OFFSET :offset) p ON true
                """).setParameter("r", roundId).setParameter("status", filter).setParameter("q", like)
                .setParameter("limit", limit).setParameter("offset", offset).getResultList();
        Object[] counts = rows.get(0);
        List<SubmissionViews.StatusRow> items = rows.stream().filter(r -> r[4] != null).map(r -> new SubmissionViews.StatusRow(
                ((Number) r[4]).longValue(), (String) r[5], (String) r[6], (String) r[7], ((Number) r[8]).intValue(),
                r[9] == null ? null : Timestamps.utc(r[9]), (String) r[10], SubmissionStatus.valueOf((String) r[11]),
                ((Number) r[12]).intValue())).toList();
        return new SubmissionViews.StatusPage(items, ((Number) counts[0]).longValue(), ((Number) counts[1]).longValue(),
                ((Number) counts[2]).longValue(), ((Number) counts[3]).longValue());
    }

    /**
     * Each enrolled laboratory of round {@code :r} with its current revision and status: MISSING without a revision,
     * LATE when its first revision came after the deadline, SUBMITTED otherwise.
     */
    private static final String STATUS_ROWS = """
            WITH rows AS (
              SELECT p.laboratory_id, l.name AS laboratory_name, l.organisation, p.participant_code,
                     COALESCE(s.current_revision, 0) AS current_revision, v.submitted_at, v.channel,
                     CASE WHEN COALESCE(s.current_revision, 0) = 0 THEN 'MISSING'
                          WHEN first.late THEN 'LATE' ELSE 'SUBMITTED' END AS status,
                     COALESCE(s.current_revision, 0) AS revisions
                FROM round_participant p
                JOIN laboratory l ON l.id = p.laboratory_id
                LEFT JOIN submission s ON s.round_id = p.round_id AND s.laboratory_id = p.laboratory_id
                LEFT JOIN submission_revision v ON v.submission_id = s.id AND v.revision = s.current_revision
                LEFT JOIN submission_revision first ON first.submission_id = s.id AND first.revision = 1
               WHERE p.round_id = :r
            )
            """;

    private static String like(String query) {
        String clean = query == null ? "" : query.strip().toLowerCase(java.util.Locale.ROOT);
        if (clean.length() > 100) {
            clean = clean.substring(0, 100);
        }
        return org.roundtable.platform.LikePatterns.containing(clean);
    }

    /** Coordinators: every revision of one laboratory's submission, oldest first. */
    @Transactional
    public List<SubmissionViews.Revision> revisionsOf(long roundId, long laboratoryId) {
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The laboratory's submission"));
        return summaries(roundId, laboratoryId).stream().map(s -> revision(roundId, laboratoryId, s.revision())).toList();
    }

    @Transactional
    public List<SubmissionViews.Flag> flags(long roundId) {
        rounds.window(roundId);
        Map<Long, String> codes = rounds.participantCodes(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT kind, laboratory_id, other_laboratory_id, detail, raised_at FROM review_flag
                 WHERE round_id = :r ORDER BY id
                """).setParameter("r", roundId).getResultList();
        return rows.stream().map(row -> new SubmissionViews.Flag((String) row[0], ((Number) row[1]).longValue(),
                codes.get(((Number) row[1]).longValue()), ((Number) row[2]).longValue(),
                codes.get(((Number) row[2]).longValue()), (String) row[3], Timestamps.utc(row[4]))).toList();
    }

    /**
     * The newest {@code limit} review flags of a round with the participant codes they concern (joined, not a map of
     * every code), and the count of all.
     */
    @Transactional
    public SubmissionViews.Latest<SubmissionViews.Flag> latestFlags(long roundId, int limit) {
        rounds.window(roundId);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT f.kind, f.laboratory_id, p.participant_code, f.other_laboratory_id, o.participant_code, f.detail,
                       f.raised_at
                  FROM review_flag f
                  LEFT JOIN round_participant p ON p.round_id = f.round_id AND p.laboratory_id = f.laboratory_id
                  LEFT JOIN round_participant o ON o.round_id = f.round_id AND o.laboratory_id = f.other_laboratory_id
                 WHERE f.round_id = :r ORDER BY f.id DESC LIMIT :limit
                """).setParameter("r", roundId).setParameter("limit", limit).getResultList();
        long total = ((Number) entityManager.createNativeQuery("SELECT count(*) FROM review_flag WHERE round_id = :r")
                .setParameter("r", roundId).getSingleResult()).longValue();
        List<SubmissionViews.Flag> flags = new java.util.ArrayList<>(rows.stream().map(row -> new SubmissionViews.Flag(
                (String) row[0], ((Number) row[1]).longValue(), (String) row[2], ((Number) row[3]).longValue(),
                (String) row[4], (String) row[5], Timestamps.utc(row[6]))).toList());
        java.util.Collections.reverse(flags);
        return new SubmissionViews.Latest<>(flags, total);
    }

    private List<SubmissionViews.RevisionSummary> summaries(long roundId, long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT v.revision, v.receipt_id, v.payload_sha256, v.channel, v.submitted_at, v.submitted_by, v.late
                  FROM submission s JOIN submission_revision v ON v.submission_id = s.id
                 WHERE s.round_id = :r AND s.laboratory_id = :l ORDER BY v.revision
                """).setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        return rows.stream().map(row -> new SubmissionViews.RevisionSummary(((Number) row[0]).intValue(), (String) row[1],
                row[2].toString().strip(), (String) row[3], Timestamps.utc(row[4]), (String) row[5], (Boolean) row[6])).toList();
    }

    private SubmissionViews.Revision revision(long roundId, long laboratoryId, int revision) {
        @SuppressWarnings("unchecked")
        List<Object[]> heads = entityManager.createNativeQuery("""
                SELECT v.id, v.receipt_id, v.payload_sha256, v.channel, v.submitted_at, v.submitted_by, v.late, v.correction_reason
                  FROM submission s JOIN submission_revision v ON v.submission_id = s.id
                 WHERE s.round_id = :r AND s.laboratory_id = :l AND v.revision = :n
                """).setParameter("r", roundId).setParameter("l", laboratoryId).setParameter("n", revision).getResultList();
        if (heads.isEmpty()) {
            throw new DomainException.NotFound("The revision");
        }
        Object[] head = heads.get(0);
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT element, item_label, value_as_reported, unit_as_reported, less_than, value_in_measurand_unit,
                       expanded_uncertainty_as_reported, expanded_uncertainty, coverage_factor, method_group, replicates,
                       replicate_values
                  FROM reported_result WHERE revision_id = :id ORDER BY element, item_label
                """).setParameter("id", ((Number) head[0]).longValue()).getResultList();
        List<SubmissionViews.Result> results = rows.stream().map(r -> new SubmissionViews.Result((String) r[0], (String) r[1],
                (String) r[2], (String) r[3], (Boolean) r[4], (BigDecimal) r[5], (String) r[6], (BigDecimal) r[7],
                (BigDecimal) r[8], (String) r[9], r[10] == null ? null : ((Number) r[10]).intValue(), (String) r[11])).toList();
        return new SubmissionViews.Revision(revision, (String) head[1], head[2].toString().strip(), (String) head[3],
                Timestamps.utc(head[4]), (String) head[5], (Boolean) head[6], (String) head[7], results);
    }

    /**
     * A replicate result of a precision experiment in a laboratory's current revision.
     *
     * @param value the number in the measurand's unit
     */
    public record ReplicateRow(long laboratoryId, int revision, String element, String level, int replicate,
                               String valueAsReported, String unitAsReported, BigDecimal value) {
    }

    /**
     * Every laboratory's replicate results of a precision experiment, from its current revision (for the
     * evaluation and the coordinator's pages; the caller checks the role), ordered by laboratory, element, level and
     * replicate.
     */
    @Transactional
    public List<ReplicateRow> currentReplicates(long roundId) {
        return replicates(roundId, null);
    }

    /** The calling laboratory's own replicate results of its current revision. */
    @Transactional
    public List<ReplicateRow> myReplicates(long roundId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        rounds.participantCode(roundId, laboratoryId).orElseThrow(() -> new DomainException.NotFound("The round"));
        return replicates(roundId, laboratoryId);
    }

    private List<ReplicateRow> replicates(long roundId, Long laboratoryId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT s.laboratory_id, v.revision, p.element, p.level_label, p.replicate, p.value_as_reported,
                       p.unit_as_reported, p.value
                  FROM submission s
                  JOIN submission_revision v ON v.submission_id = s.id AND v.revision = s.current_revision
                  JOIN precision_replicate p ON p.revision_id = v.id
                 WHERE s.round_id = :r AND (CAST(:l AS bigint) IS NULL OR s.laboratory_id = :l)
                 ORDER BY s.laboratory_id, p.element, p.level_label, p.replicate
                """).setParameter("r", roundId).setParameter("l", laboratoryId).getResultList();
        return rows.stream().map(r -> new ReplicateRow(((Number) r[0]).longValue(), ((Number) r[1]).intValue(),
                (String) r[2], (String) r[3], ((Number) r[4]).intValue(), (String) r[5], (String) r[6],
                (BigDecimal) r[7])).toList();
    }
}
