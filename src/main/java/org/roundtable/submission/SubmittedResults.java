package org.roundtable.submission;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import org.roundtable.scheme.RoundResults;

/** Answers the round lifecycle's question whether a round holds results. */
@ApplicationScoped
public class SubmittedResults implements RoundResults {

    private final EntityManager entityManager;

    public SubmittedResults(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    @Override
    public long laboratoriesWithResults(long roundId) {
        Number n = (Number) entityManager.createNativeQuery(
                        "SELECT count(*) FROM submission WHERE round_id = :round AND current_revision > 0")
                .setParameter("round", roundId).getSingleResult();
        return n.longValue();
    }
}
