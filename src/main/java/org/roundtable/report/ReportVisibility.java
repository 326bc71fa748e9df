package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.evaluation.PublishedRuns;
import org.roundtable.report.model.ReportStatus;

import java.util.List;
import java.util.Optional;

/**
 * Which evaluation of a round laboratories and auditors may read, derived only from what has been issued:
 * <ul>
 *   <li>laboratories: the run reported by the round's latest issued round report, from the preliminary issue
 *       on (preliminary, final or amended);</li>
 *   <li>auditors: the run reported by the round's latest final or amended round report; a preliminary report
 *       is not for them.</li>
 * </ul>
 * "Latest" is the round report no other document has replaced; with several such lines (which issuing does not
 * produce) the most recently issued one wins. Nothing here says who may see which laboratory: callers combine
 * it with the laboratory's own identity or an auditor's grant.
 */
@ApplicationScoped
public class ReportVisibility implements PublishedRuns {

    /**
     * The evaluation run an issued round report made visible.
     *
     * @param documentId      the issued round report's row id
     * @param reportId        its report number
     * @param status          its status
     * @param evaluationRunId the evaluation run's row id
     * @param version         the evaluation run's version within the round
     */
    public record PublishedEvaluation(long documentId, String reportId, ReportStatus status, long evaluationRunId,
                                      int version) {
    }

    private final EntityManager entityManager;

    public ReportVisibility(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    /** What laboratories of the round may read: scores and reports from the preliminary issue on. */
    @Transactional
    public Optional<PublishedEvaluation> latestForLaboratories(long roundId) {
        return latest(roundId, List.of(ReportStatus.PRELIMINARY, ReportStatus.FINAL, ReportStatus.AMENDED));
    }

    /** What auditors may read: final and amended reports only. */
    @Transactional
    public Optional<PublishedEvaluation> latestForAuditors(long roundId) {
        return latest(roundId, List.of(ReportStatus.FINAL, ReportStatus.AMENDED));
    }

    @Override
    @Transactional
    public Optional<Published> forLaboratories(long roundId) {
        return latestForLaboratories(roundId).map(ReportVisibility::published);
    }

    @Override
    @Transactional
    public Optional<Published> forAuditors(long roundId) {
        return latestForAuditors(roundId).map(ReportVisibility::published);
    }

    private static Published published(PublishedEvaluation p) {
        return new Published(p.reportId(), p.status().name(), p.evaluationRunId(), p.version());
    }

    private Optional<PublishedEvaluation> latest(long roundId, List<ReportStatus> statuses) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery("""
                SELECT d.id, d.report_id, d.status, d.evaluation_run_id, e.version
                  FROM issued_document d
                  JOIN evaluation_run e ON e.id = d.evaluation_run_id
                 WHERE d.round_id = :round AND d.kind = 'ROUND' AND d.status IN (:statuses)
                   AND NOT EXISTS (SELECT 1 FROM issued_document n
                                    WHERE n.replaces_document_id = d.id AND n.status IN (:statuses))
                 ORDER BY d.issued_at DESC, d.id DESC
                 LIMIT 1
                """).setParameter("round", roundId)
                .setParameter("statuses", statuses.stream().map(Enum::name).toList())
                .getResultList();
        return rows.stream().findFirst().map(r -> new PublishedEvaluation(((Number) r[0]).longValue(),
                (String) r[1], ReportStatus.valueOf((String) r[2]), ((Number) r[3]).longValue(),
                ((Number) r[4]).intValue()));
    }
}
