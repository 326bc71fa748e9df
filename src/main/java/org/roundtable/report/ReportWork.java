package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.util.Collection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * What is open in the reports of many rounds at once, in one query (the coordinator's overview): reports being
 * issued, comments without an answer, and the sign-offs the next final or amended report has so far.
 */
@ApplicationScoped
public class ReportWork {

    private final EntityManager entityManager;

    public ReportWork(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /**
     * The reports of one round.
     *
     * @param issuing            an issue request whose round report is not stored yet (its job is queued, running or failed)
     * @param unansweredComments laboratories' comments that have no answer yet
     * @param signOffs           sign-offs of the next final or amended report
     * @param preliminaryIssued  whether a preliminary round report is stored
     */
    public record Open(boolean issuing, long unansweredComments, int signOffs, boolean preliminaryIssued) {
        public static final Open NONE = new Open(false, 0, 0, false);
    }

    /** Round id → its open report work; rounds with nothing at all are left out. */
    @Transactional
    public Map<Long, Open> of(Collection<Long> roundIds) {
        Map<Long, Open> open = new HashMap<>();
        if (roundIds.isEmpty()) {
            return open;
        }
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                WITH finals AS (SELECT round_id, count(*) AS n FROM issued_document
                                 WHERE round_id IN (:ids) AND kind = 'ROUND' AND status IN ('FINAL', 'AMENDED')
                                 GROUP BY round_id)
                SELECT r.id,
                       EXISTS (SELECT 1 FROM report_issue i WHERE i.round_id = r.id
                                 AND NOT EXISTS (SELECT 1 FROM issued_document d WHERE d.report_id = i.round_report_id)),
                       (SELECT count(*) FROM report_comment c WHERE c.round_id = r.id
                                 AND NOT EXISTS (SELECT 1 FROM report_comment_answer a WHERE a.comment_id = c.id)),
                       (SELECT count(*) FROM report_sign_off s WHERE s.round_id = r.id
                                 AND s.sequence = coalesce((SELECT n FROM finals f WHERE f.round_id = r.id), 0)),
                       EXISTS (SELECT 1 FROM issued_document d WHERE d.round_id = r.id AND d.kind = 'ROUND'
                                 AND d.status = 'PRELIMINARY')
                  FROM round r WHERE r.id IN (:ids)
                """).setParameter("ids", roundIds).getResultList();
        for (Object[] row : rows) {
            Open o = new Open((Boolean) row[1], ((Number) row[2]).longValue(), ((Number) row[3]).intValue(),
                    (Boolean) row[4]);
            if (!o.equals(Open.NONE)) {
                open.put(((Number) row[0]).longValue(), o);
            }
        }
        return open;
    }
}
