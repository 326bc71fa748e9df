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
