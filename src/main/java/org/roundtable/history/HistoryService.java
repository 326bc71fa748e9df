package org.roundtable.history;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.AuditorGrantService;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.LaboratoryService;
import org.roundtable.account.Role;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Timestamps;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.RoundService;
import org.roundtable.statistics.score.CombinedScores;
import org.roundtable.statistics.score.ScoreKind;

import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeSet;

/**
 * A laboratory's record over rounds: every published score of the laboratory, from the round's latest report
 * issued to the reader, with per-measurand series, combined scores over a window and early warnings.
 *
 * <p>Who reads what (anything else answers as a missing laboratory, 404):
 * <ul>
 *   <li>the laboratory itself (members, managers, API tokens) and coordinators: rounds from the preliminary report
 *       on, each round as its latest report to laboratories shows it;</li>
 *   <li>an auditor with a valid grant from the laboratory: rounds with a final or amended report, as the latest
 *       of those shows it, and only rounds whose final report was first issued inside one of the grant's data
 *       windows.</li>
 * </ul>
 * A round's date in the history ("reported on") is the UTC day its first report visible to the reader was issued.
 */
@ApplicationScoped
public class HistoryService {

    static final List<String> TO_LABORATORIES = List.of("PRELIMINARY", "FINAL", "AMENDED");
    static final List<String> TO_AUDITORS = List.of("FINAL", "AMENDED");
    static final int DEFAULT_WINDOW_ROUNDS = 4;

    /**
     * Every result of a laboratory ({@code :lab}) in each round's latest publication with a status in
     * {@code :statuses}, oldest round first; columns as {@link #entry(Object[])} reads them. Public for the benchmark.
     */
    public static final String ENTRIES_SQL = """
                WITH rounds AS (
                    SELECT DISTINCT round_id FROM history_score WHERE laboratory_id = :lab
                ), visible AS (
                    SELECT DISTINCT ON (p.round_id) p.document_id, p.round_id, p.round_code, p.scheme_id,
                           p.scheme_name, p.report_id, p.status, p.report_sha256,
                           (SELECT min(f.issued_at) FROM history_publication f
                             WHERE f.round_id = p.round_id AND f.status IN (:statuses)) AS reported_at
                      FROM history_publication p
                     WHERE p.round_id IN (SELECT round_id FROM rounds)
                       AND p.status IN (:statuses)
                       AND NOT EXISTS (SELECT 1 FROM history_publication n
                                        WHERE n.replaces_document_id = p.document_id AND n.status IN (:statuses))
                     ORDER BY p.round_id, p.issued_at DESC, p.document_id DESC
                )
                SELECT v.round_id, v.round_code, v.scheme_id, v.scheme_name, v.document_id, v.report_id, v.status,
                       v.report_sha256, v.reported_at, s.element, s.item_label, s.unit, s.reported, s.method_group,
                       s.value, s.assigned_value, s.assigned_value_uncertainty, s.sigma_pt, s.score_used, s.z,
                       s.z_prime, s.zeta, s.en, s.classification, s.excluded_reason, s.information_only
                  FROM visible v
                  JOIN history_score s ON s.laboratory_id = :lab AND s.document_id = v.document_id
                 ORDER BY v.reported_at, v.round_id, s.element, s.item_label
                """;

    /**
     * What to show. All optional.
     *
     * @param schemeId      one scheme
     * @param element       one measurand (element symbol)
     * @param methodGroup   one method group (as reported)
     * @param from          rounds reported on or after this day
     * @param until         rounds reported on or before this day
     * @param windowRounds  combined scores over the last this many rounds of each measurand (default 4)
     * @param windowYears   or over the rounds reported in the last this many years (instead of a round count)
     */
    public record Filter(Long schemeId, String element, String methodGroup, LocalDate from, LocalDate until,
                         Integer windowRounds, Integer windowYears) {
        public static Filter none() {
            return new Filter(null, null, null, null, null, null, null);
        }
    }

    /** One published result of the laboratory with its scores and the report that published it. */
    public record Entry(long roundId, String roundCode, long schemeId, String schemeName, long documentId,
                        String reportId, String reportStatus, String reportSha256, LocalDate reportedOn,
                        String element, String itemLabel, String unit, String reported, String methodGroup,
                        Double value, Double assignedValue, Double assignedValueUncertainty, Double sigmaPt,
                        String scoreUsed, Double z, Double zPrime, Double zeta, Double en, Verdict verdict,
                        String excludedReason, boolean informationOnly) {

        /** The score used for this result: z′ where the round used it, else z; null when not scored. */
        public ScoreKind zLikeKind() {
            if (zPrime != null && scoreUsed != null && (scoreUsed.equalsIgnoreCase("Z_PRIME")
                    || scoreUsed.equalsIgnoreCase("Z'") || scoreUsed.equalsIgnoreCase("ZPRIME"))) {
                return ScoreKind.Z_PRIME; // without building new strings: called several times per result
            }
            return z != null ? ScoreKind.Z : zPrime != null ? ScoreKind.Z_PRIME : null;
        }

        /** The value of {@link #zLikeKind()}. */
        public Double zLike() {
            ScoreKind k = zLikeKind();
            return k == null ? null : k == ScoreKind.Z ? z : zPrime;
        }

        /** The round's id as text (form values). */
        public String roundIdText() {
            return Long.toString(roundId);
        }

        /** The result's key in forms: round, element and item. */
        public String resultKey() {
            return roundId + ":" + element + ":" + itemLabel;
        }

        /** Measurand key: scheme and element (item labels of one round are separate points). */
        public String seriesKey() {
            return schemeId + ":" + element;
        }
    }

    /**
     * RSZ and SSZ of one measurand over the window, judged; shown beside the individual scores.
     *
     * @param firstRound first round in the window
     * @param lastRound  last round in the window
     * @param count      m, the scores combined
     * @param kind       "z" or "z and z′" (scores used per result)
     */
    public record Combined(String firstRound, String lastRound, int count, String kind, double rescaledSum,
                           double sumOfSquares, double chiSquared95, double chiSquared99, Verdict rescaledSumVerdict,
                           Verdict sumOfSquaresVerdict, String caveat) {
    }

    /** One measurand's results over rounds, oldest first. */
    public record Series(String key, long schemeId, String schemeName, String element, String unit,
                         List<Entry> entries, Combined combined, List<EarlyWarnings.Warning> warnings) {
    }

    /** The filter's choices (what the laboratory's visible history holds). */
    public record Options(Map<Long, String> schemes, List<String> elements, List<String> methodGroups) {
    }

    /** The history as the reader may see it. */
    /**
     * The history as the reader may see it; {@code visibleRounds} are the rounds of the whole history before the
     * filter (for the page's corrective actions; not part of the JSON).
     */
    public record History(long laboratoryId, String laboratoryName, String organisation, Filter filter,
                          List<Entry> entries, List<Series> series, List<EarlyWarnings.Warning> warnings,
                          Options options, String windowNote,
                          @com.fasterxml.jackson.annotation.JsonIgnore java.util.Set<Long> visibleRounds) {
    }

    private final EntityManager entityManager;
    private final CurrentUser currentUser;
    private final AuditorGrantService grants;
    private final LaboratoryService laboratories;
    private final HistorySettings settings;
    private final RoundService rounds;
    private final java.time.Clock clock;

    public HistoryService(EntityManager entityManager, CurrentUser currentUser, AuditorGrantService grants,
                          LaboratoryService laboratories, HistorySettings settings, RoundService rounds,
                          java.time.Clock clock) {
        this.rounds = rounds;
        this.entityManager = entityManager;
        this.currentUser = currentUser;
        this.grants = grants;
        this.laboratories = laboratories;
        this.settings = settings;
        this.clock = clock;
    }

    /** The calling laboratory's own history. */
    @Transactional
    public History own(Filter filter) {
        return history(currentUser.requireLaboratoryId(), filter);
    }

    /** A laboratory's history as the caller may see it (see class comment); 404 otherwise. */
    @Transactional
    public History history(long laboratoryId, Filter filter) {
        Filter f = filter == null ? Filter.none() : filter;
        Reader reader = reader(laboratoryId);
        LaboratoryService.LaboratoryView lab = laboratories.get(laboratoryId);
        List<Entry> all = entries(laboratoryId, reader);
        Options options = options(all);
        List<Entry> shown = all.stream().filter(e -> matches(e, f)).toList();
        List<Series> series = series(shown, f, warningRules(all));
        List<EarlyWarnings.Warning> warnings = series.stream().flatMap(s -> s.warnings().stream()).toList();
        String windowNote = reader.windows == null ? null : reader.windows.stream()
                .map(w -> (w.from() == null ? "the start" : w.from().toString()) + " to "
                        + (w.until() == null ? "today" : w.until().toString()))
                .reduce((a, b) -> a + "; " + b).orElse("");
        java.util.Set<Long> visibleRounds = new java.util.HashSet<>();
        all.forEach(e -> visibleRounds.add(e.roundId()));
        return new History(laboratoryId, lab.name(), lab.organisation(), f, shown, series, warnings, options,
                windowNote, java.util.Set.copyOf(visibleRounds));
    }

    /**
     * The early warnings of a laboratory's history (all its published results, the laboratories' view), for the
     * notices service and the laboratory's home: call from a context that may read the laboratory's history.
     */
    @Transactional
    public List<EarlyWarnings.Warning> earlyWarnings(long laboratoryId) {
        List<Entry> all = entries(laboratoryId, new Reader(TO_LABORATORIES, null));
        return series(all, Filter.none(), warningRules(all)).stream().flatMap(s -> s.warnings().stream()).toList();
    }

    /** The rounds of the laboratory's history the caller may see (404 as in {@link #history}). */
    @Transactional
    public java.util.Set<Long> visibleRounds(long laboratoryId) {
        return entries(laboratoryId, reader(laboratoryId)).stream().map(Entry::roundId)
                .collect(java.util.stream.Collectors.toSet());
    }

    // ---- who reads ---------------------------------------------------------------------------------------------

    /** Which reports the caller reads and, for an auditor, the data windows. */
    record Reader(List<String> statuses, List<AuditorGrantService.DataWindow> windows) {
    }

    Reader reader(long laboratoryId) {
        if (currentUser.is(Role.COORDINATOR)) {
            return new Reader(TO_LABORATORIES, null);
        }
        if ((currentUser.is(Role.LAB_MANAGER) || currentUser.is(Role.LAB_MEMBER))
                && currentUser.laboratoryId().map(own -> own == laboratoryId).orElse(false)) {
            return new Reader(TO_LABORATORIES, null);
        }
        if (currentUser.is(Role.AUDITOR) && currentUser.userId().isPresent()) {
            List<AuditorGrantService.DataWindow> windows = grants.activeDataWindows(currentUser.requireUserId(),
                    laboratoryId);
            if (!windows.isEmpty()) {
                return new Reader(TO_AUDITORS, windows);
            }
        }
        throw new DomainException.NotFound("The laboratory");
    }

    // ---- the query -----------------------------------------------------------------------------------------

    /**
     * Every result of the laboratory in each round's latest publication visible to the reader, oldest round first.
     * Plan: {@code history_score_lab_round_idx} finds the laboratory's rounds, {@code history_publication_round_idx}
     * their publications, the primary key of {@code history_score} (laboratory first) the scores.
     */
    List<Entry> entries(long laboratoryId, Reader reader) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(ENTRIES_SQL).setParameter("lab", laboratoryId)
                .setParameter("statuses", reader.statuses()).getResultList();
        List<Entry> out = new ArrayList<>(rows.size());
        for (Object[] r : rows) {
            Entry e = entry(r);
            if (reader.windows() != null && reader.windows().stream().noneMatch(w -> w.contains(e.reportedOn()))) {
                continue;
            }
            out.add(e);
        }
        return out;
    }

    /** One row of {@link #ENTRIES_SQL}. */
    public static Entry entry(Object[] r) {
        LocalDate reportedOn = Timestamps.utc(r[8]).withOffsetSameInstant(ZoneOffset.UTC).toLocalDate();
        {
            return new Entry(((Number) r[0]).longValue(), (String) r[1], ((Number) r[2]).longValue(), (String) r[3],
                    ((Number) r[4]).longValue(), (String) r[5], (String) r[6], ((String) r[7]).strip(), reportedOn,
                    (String) r[9], (String) r[10], (String) r[11], (String) r[12], (String) r[13], dbl(r[14]),
                    dbl(r[15]), dbl(r[16]), dbl(r[17]), (String) r[18], dbl(r[19]), dbl(r[20]), dbl(r[21]),
                    dbl(r[22]), Verdict.of((String) r[23]), (String) r[24], Boolean.TRUE.equals(r[25]));
        }
    }

    private static Double dbl(Object o) {
        return o == null ? null : ((Number) o).doubleValue();
    }

    private static boolean matches(Entry e, Filter f) {
        return (f.schemeId() == null || f.schemeId() == e.schemeId())
                && (blank(f.element()) || f.element().strip().equalsIgnoreCase(e.element()))
                && (blank(f.methodGroup()) || f.methodGroup().strip().equalsIgnoreCase(e.methodGroup()))
                && (f.from() == null || !e.reportedOn().isBefore(f.from()))
                && (f.until() == null || !e.reportedOn().isAfter(f.until()));
    }

    private static boolean blank(String s) {
        return s == null || s.isBlank();
    }

    static Options options(List<Entry> all) {
        Map<Long, String> schemes = new LinkedHashMap<>();
        TreeSet<String> elements = new TreeSet<>();
        TreeSet<String> groups = new TreeSet<>();
        for (Entry e : all) {
            schemes.putIfAbsent(e.schemeId(), e.schemeName());
            elements.add(e.element());
            groups.add(e.methodGroup());
        }
        return new Options(schemes, List.copyOf(elements), List.copyOf(groups));
    }

    // ---- series, combined scores, warnings ----------------------------------------------------------------------

    List<Series> series(List<Entry> entries, Filter f, Map<Long, EarlyWarnings.Rules> rulesByScheme) {
        EarlyWarnings.Rules fallback = settings.warningRules();
        return series(entries, f, scheme -> rulesByScheme.getOrDefault(scheme, fallback),
                LocalDate.now(clock.withZone(ZoneOffset.UTC)));
    }

    /**
     * The early-warning rules of each scheme in {@code all} (the reader's whole history, before any filter): those
     * of the plan in force of the scheme's latest round in it (the last reported), so one set of rules judges the
     * whole series and a filter does not change them. A plan that names no early warnings (stored before plans
     * did) takes the installation's settings ({@link HistorySettings}, by default {@link EarlyWarnings#DEFAULTS}).
     * One query for all schemes.
     */
    Map<Long, EarlyWarnings.Rules> warningRules(List<Entry> all) {
        Map<Long, Long> latestRound = new LinkedHashMap<>();
        for (Entry e : all) {
            latestRound.put(e.schemeId(), e.roundId()); // oldest first: the last one stays
        }
        Map<Long, EvaluationPlan.EarlyWarningPlan> plans = rounds.earlyWarningPlans(new TreeSet<>(latestRound.values()));
        EarlyWarnings.Rules fallback = settings.warningRules();
        Map<Long, EarlyWarnings.Rules> out = new java.util.HashMap<>();
        latestRound.forEach((scheme, round) -> out.put(scheme, rules(plans.get(round), fallback)));
        return out;
    }

    /** The rules a plan's early warnings state; {@code fallback} for a plan without them or a value left out. */
    static EarlyWarnings.Rules rules(EvaluationPlan.EarlyWarningPlan w, EarlyWarnings.Rules fallback) {
        if (w == null) {
            return fallback;
        }
        return new EarlyWarnings.Rules(on(w.unsatisfactory(), fallback.unsatisfactory()),
                on(w.questionable(), fallback.questionable()), whole(w.questionableInARow(), fallback.questionableInARow()),
                on(w.bias(), fallback.bias()), whole(w.sameSignRun(), fallback.sameSignRun()),
                on(w.drift(), fallback.drift()), whole(w.driftRounds(), fallback.driftRounds()),
                w.driftLimit() == null ? fallback.driftLimit() : Double.parseDouble(w.driftLimit()));
    }

    private static boolean on(String value, boolean fallback) {
        return value == null ? fallback : Boolean.parseBoolean(value);
    }

    private static int whole(String value, int fallback) {
        return value == null ? fallback : Integer.parseInt(value);
    }

    /** As {@link #series(List, Filter, java.util.function.Function, LocalDate)} with one set of rules for all. */
    public static List<Series> series(List<Entry> entries, Filter f, EarlyWarnings.Rules warningRules, LocalDate today) {
        return series(entries, f, scheme -> warningRules, today);
    }

    /**
     * Groups entries into per-measurand series with combined scores and warnings, judged by the rules of the
     * series' scheme (pure; public for the benchmark).
     */
    public static List<Series> series(List<Entry> entries, Filter f,
                                      java.util.function.Function<Long, EarlyWarnings.Rules> rulesOfScheme,
                                      LocalDate today) {
        Map<String, List<Entry>> byKey = new LinkedHashMap<>();
        for (Entry e : entries) {
            byKey.computeIfAbsent(e.seriesKey(), k -> new ArrayList<>()).add(e);
        }
        Map<Long, EarlyWarnings> rulesBySchemeId = new java.util.HashMap<>();
        List<Series> out = new ArrayList<>();
        for (List<Entry> list : byKey.values()) {
            Entry first = list.get(0);
            EarlyWarnings rules = rulesBySchemeId.computeIfAbsent(first.schemeId(),
                    id -> new EarlyWarnings(rulesOfScheme.apply(id)));
            String label = first.element() + " (" + first.schemeName() + ")";
            List<EarlyWarnings.Point> points = list.stream().map(e -> new EarlyWarnings.Point(e.roundCode(),
                    e.zLike(), e.verdict(), e.informationOnly())).toList();
            out.add(new Series(first.seriesKey(), first.schemeId(), first.schemeName(), first.element(), first.unit(),
                    list, combined(list, f, today), rules.evaluate(label, points)));
        }
        out.sort(java.util.Comparator.comparing(Series::element).thenComparing(Series::schemeName));
        return out;
    }

    /**
     * RSZ and SSZ of the series' z-like scores (the score used per result) over the window; ζ and En never,
     * scores for information only left out. Null when the window holds no such score.
     */
    static Combined combined(List<Entry> list, Filter f, LocalDate today) {
        List<Entry> usable = list.stream().filter(e -> !e.informationOnly() && e.zLike() != null
                && Double.isFinite(e.zLike())).toList();
        List<Entry> window;
        if (f.windowYears() != null && f.windowYears() > 0) {
            LocalDate since = today.minusYears(f.windowYears());
            window = usable.stream().filter(e -> !e.reportedOn().isBefore(since)).toList();
        } else {
            int n = f.windowRounds() == null || f.windowRounds() < 1 ? DEFAULT_WINDOW_ROUNDS : f.windowRounds();
            List<Long> rounds = usable.stream().map(Entry::roundId).distinct().toList();
            java.util.Set<Long> last = new java.util.HashSet<>(rounds.subList(Math.max(0, rounds.size() - n), rounds.size()));
            window = usable.stream().filter(e -> last.contains(e.roundId())).toList();
        }
        if (window.isEmpty()) {
            return null;
        }
        CombinedScores.Result r = CombinedScores.combine(window.stream()
                .map(e -> new CombinedScores.Score(e.zLikeKind(), e.zLike())).toList());
        boolean mixed = window.stream().map(Entry::zLikeKind).distinct().count() > 1;
        String kind = mixed ? "z and z′" : window.get(0).zLikeKind() == ScoreKind.Z ? "z" : "z′";
        return new Combined(window.get(0).roundCode(), window.get(window.size() - 1).roundCode(), r.count(), kind,
                r.rescaledSum(), r.sumOfSquares(), r.chiSquared95(), r.chiSquared99(),
                Verdict.valueOf(r.rescaledSumClass().name()), Verdict.valueOf(r.sumOfSquaresClass().name()),
                CombinedScores.CORRELATION_CAVEAT + " Scores of several items of one round come from one sample"
                        + " and are correlated.");
    }
}
