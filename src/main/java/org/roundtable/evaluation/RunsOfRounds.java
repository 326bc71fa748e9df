package org.roundtable.evaluation;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.platform.Timestamps;

import java.time.OffsetDateTime;
import java.util.Collection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** The latest evaluation run of each of many rounds, in one query (the coordinator's overview). */
@ApplicationScoped
public class RunsOfRounds {

    private final EntityManager entityManager;

    public RunsOfRounds(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /** The latest run of a round that is not a preview (a run reports may be issued from). */
    public record LatestRun(int version, OffsetDateTime createdAt) {
    }

    /** Round id → its latest non-preview run; rounds without one are left out. */
    @Transactional
    public Map<Long, LatestRun> latest(Collection<Long> roundIds) {
        Map<Long, LatestRun> runs = new HashMap<>();
        if (roundIds.isEmpty()) {
            return runs;
        }
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT DISTINCT ON (round_id) round_id, version, created_at FROM evaluation_run
                 WHERE round_id IN (:ids) AND NOT preview ORDER BY round_id, version DESC
                """).setParameter("ids", roundIds).getResultList();
        rows.forEach(r -> runs.put(((Number) r[0]).longValue(),
                new LatestRun(((Number) r[1]).intValue(), Timestamps.utc(r[2]))));
        return runs;
    }
}
