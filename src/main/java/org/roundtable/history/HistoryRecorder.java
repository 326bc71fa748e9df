package org.roundtable.history;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.event.Observes;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.EvaluationViews;
import org.roundtable.notice.NoticeKind;
import org.roundtable.notice.NoticeService;
import org.roundtable.report.RoundReportIssued;
import org.roundtable.scheme.RoundService;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Map;
import java.util.TreeMap;

/**
 * Writes the history's own copy of a publication when a round report is issued: the publication, every
 * laboratory's scores in the reported run and the field's verdict counts per measurand and method group. Runs in
 * the issuing transaction, so a report is issued together with its history or not at all. Reads the run through
 * {@link EvaluationService#run(long, int)} (what the evaluation publishes), never its tables.
 */
@ApplicationScoped
public class HistoryRecorder {

    private final EntityManager entityManager;
    private final EvaluationService evaluations;
    private final RoundService rounds;
    private final HistoryService history;
    private final NoticeService notices;

    public HistoryRecorder(EntityManager entityManager, EvaluationService evaluations, RoundService rounds,
                           HistoryService history, NoticeService notices) {
        this.entityManager = entityManager;
        this.evaluations = evaluations;
        this.rounds = rounds;
        this.history = history;
        this.notices = notices;
    }

    @Transactional(Transactional.TxType.MANDATORY)
    void onRoundReportIssued(@Observes RoundReportIssued issued) {
        RoundService.RoundView round = rounds.get(issued.roundId());
        EvaluationViews.Run run = evaluations.run(issued.roundId(), issued.evaluationVersion());
        entityManager.createNativeQuery("""
                INSERT INTO history_publication (document_id, round_id, scheme_id, scheme_name, round_code, report_id,
                       status, report_sha256, evaluation_run_id, evaluation_version, issued_at, replaces_document_id)
                VALUES (:doc, :round, :scheme, :schemeName, :code, :report, :status, :sha, :run, :version, :at, :replaces)
                """)
                .setParameter("doc", issued.documentId()).setParameter("round", issued.roundId())
                .setParameter("scheme", round.schemeId()).setParameter("schemeName", round.schemeName())
                .setParameter("code", round.code()).setParameter("report", issued.reportId())
                .setParameter("status", issued.status()).setParameter("sha", issued.sha256())
                .setParameter("run", issued.evaluationRunId()).setParameter("version", issued.evaluationVersion())
                .setParameter("at", OffsetDateTime.ofInstant(issued.issuedAt(), ZoneOffset.UTC))
                .setParameter("replaces", issued.replacesDocumentId())
                .executeUpdate();
        // per element and method group over all items of the round
        Map<String, int[]> field = new TreeMap<>();
        for (EvaluationViews.MeasurandOutcome m : run.measurands()) {
            for (EvaluationViews.Score s : m.scores()) {
                insertScore(issued, m, s);
                field.computeIfAbsent(m.element() + "\u0000" + s.methodGroup(), g -> new int[4])[verdictIndex(s)]++;
            }
        }
        for (Map.Entry<String, int[]> e : field.entrySet()) {
            String[] key = e.getKey().split("\u0000", 2);
            int[] c = e.getValue();
            entityManager.createNativeQuery("""
                    INSERT INTO history_field_summary (document_id, element, method_group, satisfactory,
                           questionable, unsatisfactory, not_scored)
                    VALUES (:doc, :element, :group, :s, :q, :u, :n)
                    """)
                    .setParameter("doc", issued.documentId()).setParameter("element", key[0])
                    .setParameter("group", key[1]).setParameter("s", c[0]).setParameter("q", c[1])
                    .setParameter("u", c[2]).setParameter("n", c[3])
                    .executeUpdate();
        }
        tellEarlyWarnings(round.code(), run);
    }

    /**
     * Tells each scored laboratory of the early warnings this round's results fired in its history, through the
     * notices service (once per laboratory, round, rule and measurand: the notice key makes a later final or amended
     * report of the same round tell nobody twice). Only the laboratory's own results are named.
     */
    private void tellEarlyWarnings(String roundCode, EvaluationViews.Run run) {
        java.util.Set<Long> laboratories = new java.util.TreeSet<>();
        for (EvaluationViews.MeasurandOutcome m : run.measurands()) {
            for (EvaluationViews.Score s : m.scores()) {
                laboratories.add(s.laboratoryId());
            }
        }
        for (long laboratoryId : laboratories) {
            for (EarlyWarnings.Warning w : history.earlyWarnings(laboratoryId)) {
                if (!roundCode.equals(w.roundCode())) {
                    continue;
                }
                notices.notifyLaboratory(NoticeKind.PERFORMANCE_WARNING,
                        "history:" + laboratoryId + ":" + roundCode + ":" + w.kind().name() + ":" + w.measurand(),
                        laboratoryId, Map.of("summary", w.message(), "link", "/my-laboratory/history"));
            }
        }
    }

    private void insertScore(RoundReportIssued issued, EvaluationViews.MeasurandOutcome m, EvaluationViews.Score s) {
        entityManager.createNativeQuery("""
                INSERT INTO history_score (document_id, laboratory_id, round_id, element, item_label, unit, reported,
                       method_group, value, assigned_value, assigned_value_uncertainty, sigma_pt, score_used, z, z_prime,
                       zeta, en, classification, excluded_reason, information_only)
                VALUES (:doc, :lab, :round, :element, :item, :unit, :reported, :group, :value, :xpt, :uxpt, :sigma,
                        :used, :z, :zp, :zeta, :en, :class, :excluded, :info)
                """)
                .setParameter("doc", issued.documentId()).setParameter("lab", s.laboratoryId())
                .setParameter("round", issued.roundId()).setParameter("element", m.element())
                .setParameter("item", m.itemLabel()).setParameter("unit", m.unit())
                .setParameter("reported", s.reported()).setParameter("group", s.methodGroup())
                .setParameter("value", s.value()).setParameter("xpt", m.assignedValue())
                .setParameter("uxpt", m.assignedValueUncertainty()).setParameter("sigma", m.sigmaPt())
                .setParameter("used", m.scoreUsed()).setParameter("z", s.z()).setParameter("zp", s.zPrime())
                .setParameter("zeta", s.zeta()).setParameter("en", s.en())
                .setParameter("class", s.classification()).setParameter("excluded", s.excludedReason())
                .setParameter("info", informationOnly(m, s))
                .executeUpdate();
    }

    /**
     * Whether the published score is for information only (a consensus or data-derived σpt below the plan's
     * minimum: no classification). THE one place where that flag enters the history; combined scores and warnings
     * leave such scores out (they filter on {@code history_score.information_only}).
     */
    static boolean informationOnly(EvaluationViews.MeasurandOutcome m, EvaluationViews.Score s) {
        return m.rules() != null && m.rules().informationOnly();
    }

    /** 0 satisfactory, 1 questionable, 2 unsatisfactory, 3 not scored. */
    private static int verdictIndex(EvaluationViews.Score s) {
        Verdict v = Verdict.of(s.classification());
        return v == null ? 3 : v.ordinal();
    }
}
