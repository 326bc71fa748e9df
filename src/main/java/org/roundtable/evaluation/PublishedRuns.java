package org.roundtable.evaluation;

import java.util.Optional;

/**
 * Which evaluation run of a round has been published, and to whom. The answer follows from the reports issued
 * (the report feature implements this); the evaluation's exports only ask, so that the evaluation does not depend
 * on the report feature.
 */
public interface PublishedRuns {

    /**
     * The run an issued round report made visible.
     *
     * @param reportId        the issued round report's number
     * @param status          its status: {@code PRELIMINARY}, {@code FINAL} or {@code AMENDED}
     * @param evaluationRunId the evaluation run's row id
     * @param version         the evaluation run's version within the round
     */
    record Published(String reportId, String status, long evaluationRunId, int version) {
    }

    /** What laboratories of the round may read: from the preliminary report on. */
    Optional<Published> forLaboratories(long roundId);

    /** What auditors may read: final and amended reports only. */
    Optional<Published> forAuditors(long roundId);
}
