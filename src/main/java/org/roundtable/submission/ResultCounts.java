package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.util.Collection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** How many laboratories have reported in each of many rounds, in one query (the coordinator's overview). */
@ApplicationScoped
public class ResultCounts {

    private final EntityManager entityManager;

    public ResultCounts(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /** Round id → laboratories with at least one revision of results; rounds without any are left out. */
    @Transactional
    public Map<Long, Long> laboratoriesWithResults(Collection<Long> roundIds) {
        Map<Long, Long> counts = new HashMap<>();
        if (roundIds.isEmpty()) {
            return counts;
        }
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT round_id, count(*) FROM submission
                 WHERE round_id IN (:ids) AND current_revision > 0 GROUP BY round_id
                """).setParameter("ids", roundIds).getResultList();
        rows.forEach(r -> counts.put(((Number) r[0]).longValue(), ((Number) r[1]).longValue()));
        return counts;
    }
}
