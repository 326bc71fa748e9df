package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;

import java.time.OffsetDateTime;
import java.util.Collection;
import java.util.List;

/**
 * Rounds in one query each, for pages that look at many rounds at once (the coordinator's home) or at a round's
 * neighbours (the plans of earlier rounds of its scheme): never one query per round.
 */
@ApplicationScoped
public class RoundSummaries {

    private final EntityManager entityManager;

    public RoundSummaries(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /**
     * A round as the coordinator's overview needs it: its scheme, state, deadline, whether a draft plan is
     * saved, whether the scheme asks for a second reviewer, and how many laboratories are enrolled.
     */
    public record Summary(long id, String code, long schemeId, String schemeName, RoundKind kind, RoundState state,
                          OffsetDateTime resultDeadline, String timeZone, Round.LatePolicy latePolicy,
                          boolean hasDraftPlan, boolean secondReviewerRequired, long enrolled) {
    }

    /** A round of the same scheme whose plan can be copied: its latest frozen version or its draft. */
    public record PlanSource(long roundId, String code, RoundState state, Integer planVersion,
                             OffsetDateTime createdAt) {
    }

    private static final String SUMMARY = """
            SELECT r.id, r.code, r.scheme_id, s.name, r.kind, r.state, r.result_deadline, r.deadline_time_zone,
                   r.late_policy, r.draft_plan IS NOT NULL, s.second_reviewer_required,
                   (SELECT count(*) FROM round_participant p WHERE p.round_id = r.id)
              FROM round r JOIN scheme s ON s.id = r.scheme_id
            """;

    /** Every round that is not finished (not final, amended, archived or cancelled), newest first. */
    @Transactional
    public List<Summary> unfinished() {
        return rows(entityManager.createNativeQuery(SUMMARY
                + " WHERE r.state NOT IN ('FINAL_ISSUED', 'AMENDED', 'ARCHIVED', 'CANCELLED') ORDER BY r.created_at DESC, r.id DESC")
                .getResultList());
    }

    /** The given rounds (missing ids are left out). */
    @Transactional
    public List<Summary> of(Collection<Long> roundIds) {
        if (roundIds.isEmpty()) {
            return List.of();
        }
        return rows(entityManager.createNativeQuery(SUMMARY + " WHERE r.id IN (:ids) ORDER BY r.id")
                .setParameter("ids", roundIds).getResultList());
    }

    /**
     * Other rounds of the round's scheme that have a plan (frozen or draft), newest first: the plans a coordinator
     * may copy. Proficiency rounds only (a precision experiment's plan is of another kind).
     */
    @Transactional
    public List<PlanSource> planSources(long roundId) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT o.id, o.code, o.state, (SELECT max(p.plan_version) FROM evaluation_plan p WHERE p.round_id = o.id),
                       o.created_at
                  FROM round r JOIN round o ON o.scheme_id = r.scheme_id AND o.id <> r.id
                 WHERE r.id = :round AND o.kind = 'PROFICIENCY_TEST'
                   AND (o.draft_plan IS NOT NULL OR EXISTS (SELECT 1 FROM evaluation_plan p WHERE p.round_id = o.id))
                 ORDER BY o.created_at DESC, o.id DESC
                 LIMIT 100
                """).setParameter("round", roundId).getResultList();
        return rows.stream().map(r -> new PlanSource(((Number) r[0]).longValue(), (String) r[1],
                RoundState.valueOf((String) r[2]), r[3] == null ? null : ((Number) r[3]).intValue(),
                Timestamps.utc(r[4]))).toList();
    }

    @SuppressWarnings("unchecked")
    private static List<Summary> rows(List<?> result) {
        return ((List<Object[]>) result).stream().map(r -> new Summary(((Number) r[0]).longValue(), (String) r[1],
                ((Number) r[2]).longValue(), (String) r[3], RoundKind.valueOf((String) r[4]),
                RoundState.valueOf((String) r[5]), Timestamps.utc(r[6]), (String) r[7],
                Round.LatePolicy.valueOf((String) r[8]), (Boolean) r[9], (Boolean) r[10],
                ((Number) r[11]).longValue())).toList();
    }
}
