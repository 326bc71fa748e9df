package org.roundtable.evaluation;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.Query;
import jakarta.transaction.Transactional;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Paging;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * What a coordinator reads to review an evaluation run before a report is issued, in pieces that stay small
 * however many laboratories the round has: a summary per measurand (no per-laboratory rows; the verdicts counted
 * once per run in the database and kept, V54), one measurand's statistics without its scores, and that measurand's scores one page at a time
 * (by participant code, searched by code, filtered by verdict).
 *
 * <p>A measurand of a run is named by its key {@code <element>-<item label>} ({@code Cr-A}); elements never
 * contain a hyphen, so the first one separates the two.
 */
@ApplicationScoped
public class EvaluationReview {

    /** The verdict filters of the score table: a classification, not classified, or left out of the statistics. */
    public enum ScoreFilter {
        SATISFACTORY, QUESTIONABLE, UNSATISFACTORY, NOT_CLASSIFIED, EXCLUDED;

        /** The filter named by a query parameter (its name in any case); null for none or an unknown one. */
        public static ScoreFilter of(String text) {
            if (text == null || text.isBlank()) {
                return null;
            }
            for (ScoreFilter f : values()) {
                if (f.name().equalsIgnoreCase(text.strip().replace('-', '_'))) {
                    return f;
                }
            }
            return null;
        }
    }

    /**
     * One measurand of a run in the summary: the outcome without scores, the measurand's reporting digits, and the
     * results counted by verdict ({@code unclassified}: scored for information only, censored or not scored;
     * {@code excluded}: late results not scored and blunders, counted also under their verdict when scored).
     */
    public record MeasurandSummary(String key, EvaluationViews.MeasurandOutcome outcome, int digits, long results,
                                   long satisfactory, long questionable, long unsatisfactory, long unclassified,
                                   long excluded) {
    }

    /** A run with one summary row per measurand. */
    public record Overview(EvaluationViews.RunSummary run, List<MeasurandSummary> measurands) {
    }

    /** One page of a measurand's scores and the page's place in all rows that match the filter. */
    public record ScorePage(Paging paging, List<EvaluationViews.Score> rows) {
    }

    private static final ObjectMapper JSON = new ObjectMapper();

    private final EntityManager entityManager;
    private final EvaluationService evaluations;

    public EvaluationReview(EntityManager entityManager, EvaluationService evaluations) {
        this.entityManager = entityManager;
        this.evaluations = evaluations;
    }

    /** The key of a measurand of a run: {@code Cr-A}. */
    public static String key(String element, String itemLabel) {
        return element + "-" + itemLabel;
    }

    /** Element and item label of a key; 404 for a key that names none. */
    static String[] split(String key) {
        int dash = key == null ? -1 : key.indexOf('-');
        if (dash < 1 || dash == key.length() - 1) {
            throw new DomainException.NotFound("The measurand");
        }
        return new String[] {key.substring(0, dash), key.substring(dash + 1)};
    }

    /** The run's summary: one row per measurand in plan order, verdicts counted set-based. */
    @Transactional
    public Overview overview(long roundId, int version) {
        EvaluationViews.RunSummary run = summaryOf(roundId, version);
        long runId = runId(roundId, version);
        Map<String, Integer> digits = evaluations.reportingDigits(roundId);
        List<Object[]> counts = verdictCounts(runId);
        Map<String, long[]> byKey = new HashMap<>();
        for (Object[] c : counts) {
            long[] n = new long[6];
            for (int i = 0; i < 6; i++) {
                n[i] = ((Number) c[i + 2]).longValue();
            }
            byKey.put(key((String) c[0], (String) c[1]), n);
        }
        List<MeasurandSummary> rows = new ArrayList<>();
        for (EvaluationViews.MeasurandOutcome o : outcomes(runId, null, null)) {
            String key = key(o.element(), o.itemLabel());
            long[] n = byKey.getOrDefault(key, new long[6]);
            rows.add(new MeasurandSummary(key, o, digits.getOrDefault(o.element(), 3), n[0], n[1], n[2], n[3], n[4],
                    n[5]));
        }
        return new Overview(run, rows);
    }

    /**
     * The run's results counted by verdict per measurand: taken once, on the first call for the run (runs never
     * change), and read from {@code measurand_verdict_count} afterwards. Two first calls at once both count; the
     * second insert is skipped.
     */
    @SuppressWarnings("unchecked")
    private List<Object[]> verdictCounts(long runId) {
        String read = """
                SELECT element, item_label, results, satisfactory, questionable, unsatisfactory, unclassified, excluded
                  FROM measurand_verdict_count WHERE run_id = :run
                """;
        List<Object[]> counts = entityManager.createNativeQuery(read).setParameter("run", runId).getResultList();
        if (!counts.isEmpty()) {
            return counts;
        }
        entityManager.createNativeQuery("""
                INSERT INTO measurand_verdict_count (run_id, element, item_label, results, satisfactory, questionable,
                       unsatisfactory, unclassified, excluded)
                SELECT m.run_id, m.element, m.item_label, coalesce(c.results, 0), coalesce(c.satisfactory, 0),
                       coalesce(c.questionable, 0), coalesce(c.unsatisfactory, 0), coalesce(c.unclassified, 0),
                       coalesce(c.excluded, 0)
                  FROM measurand_evaluation m
                  LEFT JOIN (SELECT element, item_label, count(*) AS results,
                                    count(*) FILTER (WHERE classification = 'satisfactory') AS satisfactory,
                                    count(*) FILTER (WHERE classification = 'questionable') AS questionable,
                                    count(*) FILTER (WHERE classification = 'unsatisfactory') AS unsatisfactory,
                                    count(*) FILTER (WHERE classification IS NULL OR classification NOT IN
                                                     ('satisfactory', 'questionable', 'unsatisfactory')) AS unclassified,
                                    count(*) FILTER (WHERE excluded_reason IS NOT NULL) AS excluded
                               FROM participant_score WHERE run_id = :run GROUP BY element, item_label) c
                         ON c.element = m.element AND c.item_label = m.item_label
                 WHERE m.run_id = :run
                ON CONFLICT DO NOTHING
                """).setParameter("run", runId).executeUpdate();
        return entityManager.createNativeQuery(read).setParameter("run", runId).getResultList();
    }

    /** The run's summary without its measurands (for a page's heading). */
    @Transactional
    public EvaluationViews.RunSummary summaryOf(long roundId, int version) {
        return evaluations.runs(roundId).stream().filter(r -> r.version() == version).findFirst()
                .orElseThrow(() -> new DomainException.NotFound("The evaluation run"));
    }

    /** One measurand of the run without its scores; 404 when the run or the measurand does not exist. */
    @Transactional
    public EvaluationViews.MeasurandOutcome measurand(long roundId, int version, String key) {
        String[] ei = split(key);
        List<EvaluationViews.MeasurandOutcome> found = outcomes(runId(roundId, version), ei[0], ei[1]);
        if (found.isEmpty()) {
            throw new DomainException.NotFound("The measurand");
        }
        return found.get(0);
    }

    /** The reporting digits of a measurand's element (3 when the catalogue does not have it). */
    @Transactional
    public int digits(long roundId, String element) {
        return evaluations.reportingDigits(roundId).getOrDefault(element, 3);
    }

    /**
     * One page of a measurand's scores in participant-code order.
     *
     * @param code   part of a participant code to look for (any case), or null
     * @param filter the verdict to show, or null for all
     */
    @Transactional
    public ScorePage scores(long roundId, int version, String key, String code, ScoreFilter filter, Integer page,
                            int pageSize) {
        String[] ei = split(key);
        long runId = runId(roundId, version);
        StringBuilder where = new StringBuilder(" WHERE run_id = :run AND element = :e AND item_label = :i");
        String like = code == null || code.isBlank() ? null
                : org.roundtable.platform.LikePatterns.containing(code.strip().toUpperCase(Locale.ROOT));
        if (like != null) {
            where.append(" AND upper(participant_code) LIKE :code");
        }
        if (filter != null) {
            where.append(switch (filter) {
                case SATISFACTORY -> " AND classification = 'satisfactory'";
                case QUESTIONABLE -> " AND classification = 'questionable'";
                case UNSATISFACTORY -> " AND classification = 'unsatisfactory'";
                case NOT_CLASSIFIED -> " AND (classification IS NULL OR classification NOT IN"
                        + " ('satisfactory', 'questionable', 'unsatisfactory'))";
                case EXCLUDED -> " AND excluded_reason IS NOT NULL";
            });
        }
        Query count = entityManager.createNativeQuery("SELECT count(*) FROM participant_score" + where);
        bind(count, runId, ei, like);
        Paging paging = Paging.of(page, pageSize, ((Number) count.getSingleResult()).longValue());
        Query rows = entityManager.createNativeQuery("""
                SELECT laboratory_id, participant_code, reported, method_group, value, z, z_prime, zeta, en,
                       classification, excluded_reason FROM participant_score""" + where
                + " ORDER BY participant_code, laboratory_id LIMIT :limit OFFSET :offset");
        bind(rows, runId, ei, like);
        rows.setParameter("limit", paging.size()).setParameter("offset", paging.offset());
        @SuppressWarnings("unchecked")
        List<Object[]> found = rows.getResultList();
        return new ScorePage(paging, found.stream().map(s -> new EvaluationViews.Score(((Number) s[0]).longValue(),
                (String) s[1], (String) s[2], (String) s[3], dbl(s[4]), dbl(s[5]), dbl(s[6]), dbl(s[7]), dbl(s[8]),
                (String) s[9], (String) s[10])).toList());
    }

    /** Every score of one measurand of the run, as scored (for its charts). */
    @Transactional
    public EvaluationViews.MeasurandOutcome measurandWithScores(long roundId, int version, String key) {
        EvaluationViews.MeasurandOutcome o = measurand(roundId, version, key);
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT laboratory_id, participant_code, reported, method_group, value, z, z_prime, zeta, en,
                       classification, excluded_reason
                  FROM participant_score WHERE run_id = :run AND element = :e AND item_label = :i ORDER BY position
                """).setParameter("run", runId(roundId, version)).setParameter("e", o.element())
                .setParameter("i", o.itemLabel()).getResultList();
        List<EvaluationViews.Score> scores = found.stream().map(s -> new EvaluationViews.Score(
                ((Number) s[0]).longValue(), (String) s[1], (String) s[2], (String) s[3], dbl(s[4]), dbl(s[5]),
                dbl(s[6]), dbl(s[7]), dbl(s[8]), (String) s[9], (String) s[10])).toList();
        return new EvaluationViews.MeasurandOutcome(o.element(), o.itemLabel(), o.unit(), o.n(), o.censored(),
                o.excluded(), o.assignedValueMethod(), o.assignedValue(), o.assignedValueUncertainty(), o.sigmaPt(),
                o.sigmaPtMethod(), o.sigmaPtSource(), o.scoreUsed(), o.scoreUsedReason(), o.median(), o.madE(),
                o.nIqr(), o.robustMean(), o.robustSd(), o.iterations(), o.converged(), o.warnings(),
                o.methodGroups(), scores, o.rules());
    }

    /** The keys of the run's measurands in plan order ({@code Cr-A}, {@code Mn-A}, …). */
    @Transactional
    public List<String> keys(long roundId, int version) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery(
                        "SELECT element, item_label FROM measurand_evaluation WHERE run_id = :run ORDER BY position")
                .setParameter("run", runId(roundId, version)).getResultList();
        return found.stream().map(f -> key((String) f[0], (String) f[1])).toList();
    }

    /** Whether the run has more than one item (report sections are then named element-item). */
    @Transactional
    public boolean manyItems(long roundId, int version) {
        return ((Number) entityManager.createNativeQuery(
                        "SELECT count(DISTINCT item_label) FROM measurand_evaluation WHERE run_id = :run")
                .setParameter("run", runId(roundId, version)).getSingleResult()).longValue() > 1;
    }

    /** The row id of a run; 404 when the round has no such version. */
    @Transactional
    public long runId(long roundId, int version) {
        @SuppressWarnings("unchecked")
        List<Object> found = entityManager.createNativeQuery(
                        "SELECT id FROM evaluation_run WHERE round_id = :r AND version = :v")
                .setParameter("r", roundId).setParameter("v", version).getResultList();
        if (found.isEmpty()) {
            throw new DomainException.NotFound("The evaluation run");
        }
        return ((Number) found.get(0)).longValue();
    }

    private static void bind(Query query, long runId, String[] ei, String like) {
        query.setParameter("run", runId).setParameter("e", ei[0]).setParameter("i", ei[1]);
        if (like != null) {
            query.setParameter("code", like);
        }
    }

    /** The run's measurands (all, or the one of element and item) without scores, in plan order. */
    private List<EvaluationViews.MeasurandOutcome> outcomes(long runId, String element, String item) {
        Query query = entityManager.createNativeQuery("""
                SELECT element, item_label, unit, n, censored, excluded, assigned_value_method, assigned_value,
                       assigned_value_uncertainty, sigma_pt, sigma_pt_method, sigma_pt_source, score_used,
                       score_used_reason, median, made, niqr, robust_mean, robust_sd, iterations, converged,
                       warnings_json, method_groups_json, rules_json
                  FROM measurand_evaluation WHERE run_id = :run""" + (element == null ? ""
                : " AND element = :e AND item_label = :i") + " ORDER BY position").setParameter("run", runId);
        if (element != null) {
            query.setParameter("e", element).setParameter("i", item);
        }
        @SuppressWarnings("unchecked")
        List<Object[]> found = query.getResultList();
        List<EvaluationViews.MeasurandOutcome> outcomes = new ArrayList<>();
        for (Object[] f : found) {
            try {
                outcomes.add(new EvaluationViews.MeasurandOutcome((String) f[0], (String) f[1], (String) f[2],
                        ((Number) f[3]).intValue(), ((Number) f[4]).intValue(), ((Number) f[5]).intValue(),
                        (String) f[6], dbl(f[7]), dbl(f[8]), dbl(f[9]), (String) f[10], (String) f[11],
                        (String) f[12], (String) f[13], dbl(f[14]), dbl(f[15]), dbl(f[16]), dbl(f[17]), dbl(f[18]),
                        f[19] == null ? null : ((Number) f[19]).intValue(), (Boolean) f[20],
                        JSON.readValue((String) f[21], new TypeReference<List<EvaluationViews.Warning>>() { }),
                        JSON.readValue((String) f[22],
                                new TypeReference<List<EvaluationViews.MethodGroupStatistics>>() { }),
                        List.of(), f[23] == null ? null : JSON.readValue((String) f[23], EvaluationViews.Rules.class)));
            } catch (JsonProcessingException e) {
                throw new IllegalStateException(e);
            }
        }
        return outcomes;
    }

    private static Double dbl(Object value) {
        return value == null ? null : ((Number) value).doubleValue();
    }
}
