package org.roundtable.evaluation;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.account.CurrentUser;
import org.roundtable.account.Role;
import org.roundtable.platform.CsvText;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.NumberFormats;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.RoundAccess;

import java.math.BigDecimal;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.function.Function;

/**
 * Exports of evaluation runs: every measurand's figures and every participant's scores (CSV and JSON), the
 * inputs of a run in the offline {@code evaluate} command's CSV format, and a laboratory's own scores for its LIMS.
 *
 * <p>Who reads what:
 * <ul>
 *   <li>coordinators: any run, previews included ({@link #runResults}, {@link #runEvaluateInput}), and the
 *       published run;</li>
 *   <li>laboratories enrolled in the round: the run of the latest issued round report, from the preliminary
 *       issue on ({@link PublishedRuns#forLaboratories}), everyone's results under participant codes only;</li>
 *   <li>auditors: the run of the latest final or amended round report ({@link PublishedRuns#forAuditors}).</li>
 * </ul>
 * Anything a caller may not read answers exactly like a missing round (404). No export carries a laboratory's
 * identity: participants appear by participant code.
 *
 * <p>The {@code evaluate} input of a run is rebuilt from the submission revisions that were current when the run
 * was made (each laboratory's latest revision submitted at or before the run's {@code created_at}; submits and runs
 * both lock the round row, and a submit takes its timestamp after the lock, so a revision the run did not read has a
 * later timestamp). The rebuilt results are proved by recomputing the run's inputs hash with the text format of
 * {@link EvaluationService#inputsText}; when the hash differs the export is refused (409) rather than wrong.
 */
@ApplicationScoped
public class EvaluationExports {

    /** Header of the offline {@code evaluate} command's CSV. */
    public static final String EVALUATE_HEADER = "participant,measurand,unit,value,expanded_uncertainty,coverage_factor,method";

    /** Columns of {@code results.csv}: one row per participant and measurand (a measurand without results: one row). */
    public static final List<String> RESULTS_COLUMNS = List.of("round", "evaluation_version", "preview", "report_id",
            "report_status", "element", "item", "unit", "n", "censored", "excluded", "assigned_value_method",
            "assigned_value", "assigned_value_uncertainty", "sigma_pt", "sigma_pt_method", "sigma_pt_source", "median",
            "made", "niqr", "robust_mean", "robust_sd", "iterations", "converged", "score_used", "score_used_reason",
            "warnings", "participant_code", "reported", "method_group", "value", "z", "z_prime", "zeta", "en",
            "classification", "excluded_reason", "information_only", "score_decimals", "en_coverage_factor");

    /** Columns of a laboratory's {@code scores.csv}: one row per measurand and item it reported. */
    public static final List<String> OWN_SCORES_COLUMNS = List.of("round", "participant_code", "evaluation_version",
            "report_id", "report_status", "element", "item", "unit", "reported", "method_group", "value",
            "assigned_value", "assigned_value_uncertainty", "sigma_pt", "score_used", "z", "z_prime", "zeta", "en",
            "classification", "excluded_reason", "information_only");

    private static final String HIDDEN = "The round's published evaluation";

    /** The issued round report that made a run readable. */
    public record Publication(String reportId, String status) {
    }

    /** A run's results as exported (JSON); participants by code only. */
    public record ResultsExport(long roundId, String roundCode, int evaluationVersion, boolean preview,
                                String roundState, OffsetDateTime createdAt, int planVersion, String planSha256,
                                String inputsSha256, String outputsSha256, String codeVersion, Publication publication,
                                List<String> evaluateArguments, List<MeasurandExport> measurands) {
    }

    /** One measurand of one item: its figures, warnings, method-group statistics and every participant's scores. */
    public record MeasurandExport(String element, String itemLabel, String unit, int n, int censored, int excluded,
                                  String assignedValueMethod, Double assignedValue, Double assignedValueUncertainty,
                                  Double sigmaPt, String sigmaPtMethod, String sigmaPtSource, String scoreUsed,
                                  String scoreUsedReason, Double median, Double madE, Double nIqr, Double robustMean,
                                  Double robustSd, Integer iterations, Boolean converged,
                                  List<EvaluationViews.Warning> warnings,
                                  List<EvaluationViews.MethodGroupStatistics> methodGroups,
                                  List<ParticipantExport> scores, int reportingDigits, int scoreDecimals,
                                  Double enCoverageFactor, boolean informationOnly, Printed printed) {
    }

    /**
     * A measurand's figures as printed ({@link NumberFormats}: statistics and uncertainties at reporting digits + 1,
     * no exponent), beside the full-precision numbers of the export.
     */
    public record Printed(String assignedValue, String assignedValueUncertainty, String sigmaPt, String median,
                          String madE, String nIqr, String robustMean, String robustSd) {

        static Printed of(EvaluationViews.MeasurandOutcome m, int digits) {
            return new Printed(NumberFormats.plainStatistic(m.assignedValue(), digits),
                    NumberFormats.plainStatistic(m.assignedValueUncertainty(), digits),
                    NumberFormats.plainStatistic(m.sigmaPt(), digits), NumberFormats.plainStatistic(m.median(), digits),
                    NumberFormats.plainStatistic(m.madE(), digits), NumberFormats.plainStatistic(m.nIqr(), digits),
                    NumberFormats.plainStatistic(m.robustMean(), digits),
                    NumberFormats.plainStatistic(m.robustSd(), digits));
        }
    }

    /** A participant's value (reporting digits) and scores (score decimals) as printed. */
    public record PrintedScores(String value, String z, String zPrime, String zeta, String en) {

        static PrintedScores of(Double value, Double z, Double zPrime, Double zeta, Double en, int digits,
                                int scoreDecimals) {
            return new PrintedScores(NumberFormats.plainResult(value, digits),
                    NumberFormats.plainScore(z, scoreDecimals), NumberFormats.plainScore(zPrime, scoreDecimals),
                    NumberFormats.plainScore(zeta, scoreDecimals), NumberFormats.plainScore(en, scoreDecimals));
        }
    }

    /**
     * One participant's result as reported and its scores; {@code excludedReason} when it was left out;
     * {@code informationOnly} when its scores are for information only (then {@code classification} is null).
     */
    public record ParticipantExport(String participantCode, String reported, String methodGroup, Double value,
                                    Double z, Double zPrime, Double zeta, Double en, String classification,
                                    String excludedReason, boolean informationOnly, PrintedScores printed) {
    }

    /** A laboratory's own scores in the published run. */
    public record OwnScores(long roundId, String roundCode, String participantCode, int evaluationVersion,
                            String reportId, String reportStatus, List<OwnScore> scores) {
    }

    /** The laboratory's result for one measurand and item, with the figures it was scored against. */
    public record OwnScore(String element, String itemLabel, String unit, String reported, String methodGroup,
                           Double value, Double assignedValue, Double assignedValueUncertainty, Double sigmaPt,
                           String scoreUsed, Double z, Double zPrime, Double zeta, Double en, String classification,
                           String excludedReason, boolean informationOnly, int reportingDigits, int scoreDecimals,
                           PrintedScores printed) {
    }

    /**
     * The inputs of a run in the {@code evaluate} command's CSV format, and the command-line arguments that give
     * it the run's x_pt and σpt where the plan did not take them from the data.
     */
    public record EvaluateInput(String roundCode, int evaluationVersion, String csv, List<String> arguments) {
    }

    private final EntityManager entityManager;
    private final EvaluationService evaluations;
    private final RoundAccess rounds;
    private final PublishedRuns visibility;
    private final CurrentUser currentUser;

    public EvaluationExports(EntityManager entityManager, EvaluationService evaluations, RoundAccess rounds,
                             PublishedRuns visibility, CurrentUser currentUser) {
        this.entityManager = entityManager;
        this.evaluations = evaluations;
        this.rounds = rounds;
        this.visibility = visibility;
        this.currentUser = currentUser;
    }

    // ---- coordinators: any run ------------------------------------------------------------------------------

    /** Results of any run of the round (coordinators; previews included). */
    @Transactional
    public ResultsExport runResults(long roundId, int version) {
        return results(roundId, evaluations.run(roundId, version), null);
    }

    /** The inputs of any run in the {@code evaluate} format (coordinators). */
    @Transactional
    public EvaluateInput runEvaluateInput(long roundId, int version) {
        return evaluateInput(roundId, evaluations.run(roundId, version));
    }

    // ---- the published run, for whoever may read it ---------------------------------------------------------

    /** Results of the published run, as the caller may read them (else 404 as for a missing round). */
    @Transactional
    public ResultsExport publishedResults(long roundId) {
        PublishedRuns.Published published = readable(roundId);
        return results(roundId, evaluations.run(roundId, published.version()),
                new Publication(published.reportId(), published.status()));
    }

    /** The inputs of the published run in the {@code evaluate} format, as the caller may read them. */
    @Transactional
    public EvaluateInput publishedEvaluateInput(long roundId) {
        PublishedRuns.Published published = readable(roundId);
        return evaluateInput(roundId, evaluations.run(roundId, published.version()));
    }

    /**
     * The calling laboratory's own scores in the published run (from the preliminary issue on); 404 as for a
     * missing round when the laboratory is not enrolled or nothing is published yet.
     */
    @Transactional
    public OwnScores ownScores(long roundId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        String code = rounds.participantCode(roundId, laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound(HIDDEN));
        PublishedRuns.Published published = visibility.forLaboratories(roundId)
                .orElseThrow(() -> new DomainException.NotFound(HIDDEN));
        EvaluationViews.Run run = evaluations.run(roundId, published.version());
        Map<String, Integer> digitsOf = evaluations.reportingDigits(roundId);
        List<OwnScore> scores = new ArrayList<>();
        for (EvaluationViews.MeasurandOutcome m : run.measurands()) {
            int digits = digitsOf.getOrDefault(m.element(), DEFAULT_DIGITS);
            int decimals = m.rules() == null ? NumberFormats.DEFAULT_SCORE_DECIMALS : m.rules().decimalsOfScores();
            boolean informationOnly = m.rules() != null && m.rules().informationOnly();
            for (EvaluationViews.Score s : m.scores()) {
                if (s.laboratoryId() == laboratoryId) {
                    scores.add(new OwnScore(m.element(), m.itemLabel(), m.unit(), s.reported(), s.methodGroup(),
                            s.value(), m.assignedValue(), m.assignedValueUncertainty(), m.sigmaPt(), m.scoreUsed(),
                            s.z(), s.zPrime(), s.zeta(), s.en(), s.classification(), s.excludedReason(),
                            informationOnly && scored(s), digits, decimals,
                            PrintedScores.of(s.value(), s.z(), s.zPrime(), s.zeta(), s.en(), digits, decimals)));
                }
            }
        }
        return new OwnScores(roundId, rounds.window(roundId).roundCode(), code, published.version(),
                published.reportId(), published.status(), scores);
    }

    /** Which published run the caller may read; everything else is "not found", like a missing round. */
    private PublishedRuns.Published readable(long roundId) {
        Optional<PublishedRuns.Published> published;
        if (currentUser.is(Role.COORDINATOR)) {
            published = visibility.forLaboratories(roundId);
        } else if (currentUser.is(Role.AUDITOR)) {
            published = visibility.forAuditors(roundId);
        } else if (currentUser.is(Role.LAB_MANAGER) || currentUser.is(Role.LAB_MEMBER)) {
            Optional<Long> laboratory = currentUser.laboratoryId();
            published = laboratory.isPresent() && rounds.participantCode(roundId, laboratory.get()).isPresent()
                    ? visibility.forLaboratories(roundId) : Optional.empty();
        } else {
            throw new DomainException.Forbidden();
        }
        return published.orElseThrow(() -> new DomainException.NotFound(HIDDEN));
    }

    // ---- results ----------------------------------------------------------------------------------------------

    private ResultsExport results(long roundId, EvaluationViews.Run run, Publication publication) {
        EvaluationViews.RunSummary r = run.run();
        Map<String, Integer> digitsOf = evaluations.reportingDigits(roundId);
        List<MeasurandExport> measurands = new ArrayList<>();
        for (EvaluationViews.MeasurandOutcome m : run.measurands()) {
            int digits = digitsOf.getOrDefault(m.element(), DEFAULT_DIGITS);
            int decimals = m.rules() == null ? NumberFormats.DEFAULT_SCORE_DECIMALS : m.rules().decimalsOfScores();
            boolean informationOnly = m.rules() != null && m.rules().informationOnly();
            measurands.add(new MeasurandExport(m.element(),
                m.itemLabel(), m.unit(), m.n(), m.censored(), m.excluded(), m.assignedValueMethod(), m.assignedValue(),
                m.assignedValueUncertainty(), m.sigmaPt(), m.sigmaPtMethod(), m.sigmaPtSource(), m.scoreUsed(),
                m.scoreUsedReason(), m.median(), m.madE(), m.nIqr(), m.robustMean(), m.robustSd(), m.iterations(),
                m.converged(), m.warnings(), m.methodGroups(), m.scores().stream().map(s -> new ParticipantExport(
                        s.participantCode(), s.reported(), s.methodGroup(), s.value(), s.z(), s.zPrime(), s.zeta(),
                        s.en(), s.classification(), s.excludedReason(), informationOnly && scored(s),
                        PrintedScores.of(s.value(), s.z(), s.zPrime(), s.zeta(), s.en(), digits, decimals))).toList(),
                digits, decimals, m.rules() == null ? null : m.rules().scoreCoverageFactor(), informationOnly,
                Printed.of(m, digits)));
        }
        return new ResultsExport(roundId, rounds.window(roundId).roundCode(), r.version(), r.preview(), r.roundState(),
                r.createdAt(), r.planVersion(), r.planSha256(), r.inputsSha256(), r.outputsSha256(), r.codeVersion(),
                publication, arguments(run.measurands(), measurandNames(run.measurands())), measurands);
    }

    /** {@code results.csv}: RFC 4180, a header row, CRLF line ends; see {@link #RESULTS_COLUMNS}. */
    public static String resultsCsv(ResultsExport export) {
        StringBuilder csv = new StringBuilder(String.join(",", RESULTS_COLUMNS)).append("\r\n");
        Publication p = export.publication();
        for (MeasurandExport m : export.measurands()) {
            List<String> measurand = List.of(CsvText.cell(export.roundCode()),
                    CsvText.number(export.evaluationVersion()), Boolean.toString(export.preview()),
                    CsvText.cell(p == null ? null : p.reportId()), CsvText.cell(p == null ? null : p.status()),
                    CsvText.cell(m.element()), CsvText.cell(m.itemLabel()), CsvText.cell(m.unit()),
                    CsvText.number(m.n()), CsvText.number(m.censored()), CsvText.number(m.excluded()),
                    CsvText.cell(m.assignedValueMethod()), m.printed().assignedValue(),
                    m.printed().assignedValueUncertainty(), m.printed().sigmaPt(),
                    CsvText.cell(m.sigmaPtMethod()), CsvText.cell(m.sigmaPtSource()), m.printed().median(),
                    m.printed().madE(), m.printed().nIqr(), m.printed().robustMean(),
                    m.printed().robustSd(), CsvText.number(m.iterations()),
                    m.converged() == null ? "" : m.converged().toString(), CsvText.cell(m.scoreUsed()),
                    CsvText.cell(m.scoreUsedReason()), CsvText.cell(String.join("; ",
                            m.warnings().stream().map(EvaluationViews.Warning::code).toList())));
            String tail = Integer.toString(m.scoreDecimals()) + ','
                    + (m.enCoverageFactor() == null ? "" : NumberFormats.full(m.enCoverageFactor()));
            if (m.scores().isEmpty()) {
                csv.append(String.join(",", measurand)).append(",,,,,,,,,,,").append(m.informationOnly())
                        .append(',').append(tail).append("\r\n");
            }
            for (ParticipantExport s : m.scores()) {
                PrintedScores printed = s.printed();
                csv.append(String.join(",", measurand)).append(',').append(String.join(",",
                        CsvText.cell(s.participantCode()), CsvText.cell(s.reported()), CsvText.cell(s.methodGroup()),
                        printed.value(), printed.z(), printed.zPrime(), printed.zeta(), printed.en(),
                        CsvText.cell(s.classification()), CsvText.cell(s.excludedReason()),
                        Boolean.toString(s.informationOnly()), tail)).append("\r\n");
            }
        }
        return csv.toString();
    }

    /** A laboratory's {@code scores.csv}: RFC 4180, a header row; see {@link #OWN_SCORES_COLUMNS}. */
    public static String ownScoresCsv(OwnScores own) {
        StringBuilder csv = new StringBuilder(String.join(",", OWN_SCORES_COLUMNS)).append("\r\n");
        for (OwnScore s : own.scores()) {
            csv.append(String.join(",", CsvText.cell(own.roundCode()), CsvText.cell(own.participantCode()),
                    CsvText.number(own.evaluationVersion()), CsvText.cell(own.reportId()),
                    CsvText.cell(own.reportStatus()), CsvText.cell(s.element()), CsvText.cell(s.itemLabel()),
                    CsvText.cell(s.unit()), CsvText.cell(s.reported()), CsvText.cell(s.methodGroup()),
                    s.printed().value(), NumberFormats.plainStatistic(s.assignedValue(), s.reportingDigits()),
                    NumberFormats.plainStatistic(s.assignedValueUncertainty(), s.reportingDigits()),
                    NumberFormats.plainStatistic(s.sigmaPt(), s.reportingDigits()),
                    CsvText.cell(s.scoreUsed()), s.printed().z(), s.printed().zPrime(),
                    s.printed().zeta(), s.printed().en(), CsvText.cell(s.classification()),
                    CsvText.cell(s.excludedReason()), Boolean.toString(s.informationOnly()))).append("\r\n");
        }
        return csv.toString();
    }

    // ---- the evaluate command's input of a run ----------------------------------------------------------------

    private EvaluateInput evaluateInput(long roundId, EvaluationViews.Run run) {
        EvaluationViews.RunSummary summary = run.run();
        Object[] stored = (Object[]) entityManager.createNativeQuery("""
                SELECT id, plan_sha256, inputs_trailer FROM evaluation_run WHERE round_id = :r AND version = :v
                """).setParameter("r", roundId).setParameter("v", summary.version()).getSingleResult();
        long runId = ((Number) stored[0]).longValue();
        RoundAccess.SubmissionWindow window = rounds.window(roundId);
        List<EvaluationService.Row> rows = resultsReadBy(roundId, runId);
        // the result lines rebuilt from the submissions, then the blunder marks and decisions the run recorded
        String text = EvaluationService.inputsText(roundId, summary.planVersion(), stored[1].toString(),
                window.latePolicy(), rows) + stored[2];
        if (!Secrets.sha256Hex(text).equals(summary.inputsSha256())) {
            throw new DomainException.Conflict("The inputs of evaluation version " + summary.version()
                    + " cannot be rebuilt exactly from the stored submissions (the inputs hash differs), so no"
                    + " evaluate input is exported for it. Export the round's results instead.");
        }
        // exactly the results the run scored: those of its measurands, without the ones it left out
        Map<String, Map<Long, EvaluationViews.Score>> scored = new HashMap<>();
        for (EvaluationViews.MeasurandOutcome m : run.measurands()) {
            Map<Long, EvaluationViews.Score> byLaboratory = new HashMap<>();
            m.scores().stream().filter(s -> s.excludedReason() == null).forEach(s -> byLaboratory.put(s.laboratoryId(), s));
            scored.put(key(m.element(), m.itemLabel()), byLaboratory);
        }
        List<EvaluationService.Row> used = rows.stream().filter(r -> scored.getOrDefault(key(r.element(), r.itemLabel()),
                Map.of()).containsKey(r.laboratoryId())).toList();
        long expected = scored.values().stream().mapToLong(Map::size).sum();
        if (used.size() != expected) {
            throw new DomainException.Conflict("Evaluation version " + summary.version() + " scored " + expected
                    + " result(s) but " + used.size() + " were rebuilt; no evaluate input is exported for it.");
        }
        Function<String[], String> name = measurandNames(run.measurands());
        Map<String, String> units = new HashMap<>();
        run.measurands().forEach(m -> units.put(key(m.element(), m.itemLabel()), m.unit()));
        StringBuilder csv = new StringBuilder(EVALUATE_HEADER).append("\r\n");
        for (EvaluationService.Row r : used) {
            csv.append(String.join(",", CsvText.cell(r.participantCode()),
                    CsvText.cell(name.apply(new String[]{r.element(), r.itemLabel()})),
                    CsvText.cell(units.get(key(r.element(), r.itemLabel()))),
                    (r.lessThan() ? "<" : "") + r.value().toPlainString(),
                    r.expandedUncertainty() == null ? "" : r.expandedUncertainty().toPlainString(),
                    r.expandedUncertainty() == null || r.coverageFactor() == null ? ""
                            : r.coverageFactor().toPlainString(),
                    CsvText.cell(r.methodGroup()))).append("\r\n");
        }
        List<EvaluationViews.MeasurandOutcome> present = run.measurands().stream()
                .filter(m -> !scored.get(key(m.element(), m.itemLabel())).isEmpty()).toList();
        return new EvaluateInput(window.roundCode(), summary.version(), csv.toString(), arguments(present, name));
    }

    /** The expanded uncertainty U and its coverage factor k a participant reported; both null when it gave none. */
    public record ReportedUncertainty(Double expandedUncertainty, Double coverageFactor) {
    }

    /**
     * The uncertainties the participants reported, as evaluation run {@code runId} read them (each laboratory's
     * revision current when the run was made), keyed by {@link #uncertaintyKey}. The stored scores do not repeat
     * them; a report shows them beside each result.
     */
    @Transactional
    public Map<String, ReportedUncertainty> uncertaintiesReadBy(long roundId, long runId) {
        Map<String, ReportedUncertainty> found = new HashMap<>();
        for (EvaluationService.Row r : resultsReadBy(roundId, runId)) {
            if (r.expandedUncertainty() != null) {
                found.put(uncertaintyKey(r.element(), r.itemLabel(), r.participantCode()), new ReportedUncertainty(
                        r.expandedUncertainty().doubleValue(),
                        r.coverageFactor() == null ? null : r.coverageFactor().doubleValue()));
            }
        }
        return found;
    }

    /**
     * The expanded uncertainties (and k) that run {@code runId} read for one measurand of one item, by
     * {@link #uncertaintyKey}; for a chart of one measurand without reading the whole round.
     */
    @Transactional
    public Map<String, ReportedUncertainty> uncertaintiesReadBy(long roundId, long runId, String element,
                                                                String itemLabel) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT rp.participant_code, rr.expanded_uncertainty, rr.coverage_factor
                  FROM submission s
                  JOIN LATERAL (SELECT v.id FROM submission_revision v
                                 WHERE v.submission_id = s.id
                                   AND v.submitted_at <= (SELECT created_at FROM evaluation_run WHERE id = :run)
                                 ORDER BY v.revision DESC LIMIT 1) sr ON true
                  JOIN reported_result rr ON rr.revision_id = sr.id AND rr.element = :e AND rr.item_label = :i
                  JOIN round_participant rp ON rp.round_id = s.round_id AND rp.laboratory_id = s.laboratory_id
                 WHERE s.round_id = :r AND rr.expanded_uncertainty IS NOT NULL
                """).setParameter("r", roundId).setParameter("run", runId).setParameter("e", element)
                .setParameter("i", itemLabel).getResultList();
        Map<String, ReportedUncertainty> uncertainties = new HashMap<>();
        for (Object[] f : found) {
            BigDecimal u = decimal(f[1]);
            BigDecimal k = decimal(f[2]);
            uncertainties.put(uncertaintyKey(element, itemLabel, (String) f[0]),
                    new ReportedUncertainty(u.doubleValue(), k == null ? null : k.doubleValue()));
        }
        return uncertainties;
    }

    /** The key of {@link #uncertaintiesReadBy}: element, item label and participant code. */
    public static String uncertaintyKey(String element, String itemLabel, String participantCode) {
        return element + "\u0000" + itemLabel + "\u0000" + participantCode;
    }

    /**
     * Each laboratory's latest revision submitted at or before the run was made, in the order the run reads
     * results (element, item, participant code) — the same columns as {@link EvaluationService#currentResults}.
     */
    private List<EvaluationService.Row> resultsReadBy(long roundId, long runId) {
        @SuppressWarnings("unchecked")
        List<Object[]> found = entityManager.createNativeQuery("""
                SELECT s.laboratory_id, rp.participant_code, rr.element, rr.item_label, rr.value_as_reported,
                       rr.value_in_measurand_unit, rr.less_than, rr.expanded_uncertainty, rr.coverage_factor,
                       rr.method_group, sr.late
                  FROM submission s
                  JOIN LATERAL (SELECT v.id, v.late FROM submission_revision v
                                 WHERE v.submission_id = s.id
                                   AND v.submitted_at <= (SELECT created_at FROM evaluation_run WHERE id = :run)
                                 ORDER BY v.revision DESC LIMIT 1) sr ON true
                  JOIN reported_result rr ON rr.revision_id = sr.id
                  JOIN round_participant rp ON rp.round_id = s.round_id AND rp.laboratory_id = s.laboratory_id
                 WHERE s.round_id = :r
                 ORDER BY rr.element, rr.item_label, rp.participant_code
                """).setParameter("r", roundId).setParameter("run", runId).getResultList();
        return found.stream().map(f -> new EvaluationService.Row(((Number) f[0]).longValue(), (String) f[1],
                (String) f[2], (String) f[3], (String) f[4], decimal(f[5]), (Boolean) f[6], decimal(f[7]),
                decimal(f[8]), (String) f[9], (Boolean) f[10])).toList();
    }

    /**
     * The measurand names of the {@code evaluate} CSV: the element, or element-item when the run has more than
     * one item (as {@link EvaluationService#exportCsv} names them).
     */
    private static Function<String[], String> measurandNames(List<EvaluationViews.MeasurandOutcome> measurands) {
        Set<String> items = new LinkedHashSet<>();
        measurands.forEach(m -> items.add(m.itemLabel()));
        boolean several = items.size() > 1;
        return elementAndItem -> several ? elementAndItem[0] + "-" + elementAndItem[1] : elementAndItem[0];
    }

    /**
     * Arguments of the {@code evaluate} command that reproduce the run: {@code --sigma-pt=M=σpt} where σpt was
     * given by the plan (not the data's robust SD), {@code --assigned=M=x_pt:U} with U = 2·u(x_pt) where x_pt did
     * not come from Algorithm A over all results (a reference value, or a method group's or experts' consensus).
     * Numbers in {@link NumberFormats#full} form (the shortest decimal that reads back as the identical double, no
     * exponent). The plan's score decimals, En's k, minimums and information-only choice follow where they differ
     * from the command's defaults.
     */
    private static List<String> arguments(List<EvaluationViews.MeasurandOutcome> measurands,
                                          Function<String[], String> name) {
        List<String> arguments = new ArrayList<>();
        for (EvaluationViews.MeasurandOutcome m : measurands) {
            String measurand = name.apply(new String[]{m.element(), m.itemLabel()});
            if ("GIVEN".equals(m.sigmaPtSource()) && m.sigmaPt() != null) {
                arguments.add("--sigma-pt=" + measurand + "=" + NumberFormats.full(m.sigmaPt()));
            }
            if (!"CONSENSUS_ALL".equals(m.assignedValueMethod()) && m.assignedValue() != null
                    && m.assignedValueUncertainty() != null) {
                arguments.add("--assigned=" + measurand + "=" + NumberFormats.full(m.assignedValue()) + ":"
                        + NumberFormats.full(2 * m.assignedValueUncertainty()));
            }
            EvaluationViews.Rules rules = m.rules();
            if (rules != null) {
                if (rules.scoreDecimals() != null && rules.scoreDecimals() != NumberFormats.DEFAULT_SCORE_DECIMALS) {
                    arguments.add("--score-decimals=" + measurand + "=" + rules.scoreDecimals());
                }
                if (rules.scoreCoverageFactor() != null && rules.scoreCoverageFactor() != 2.0) {
                    arguments.add("--coverage-factor=" + measurand + "=" + NumberFormats.full(rules.scoreCoverageFactor()));
                }
                if (rules.minimumParticipants() != null && rules.minimumParticipants() != 10) {
                    arguments.add("--minimum-participants=" + measurand + "=" + rules.minimumParticipants());
                }
                if (rules.minimumForDataDerivedSigmaPt() != null && rules.minimumForDataDerivedSigmaPt() != 10) {
                    arguments.add("--minimum-for-sigma=" + measurand + "=" + rules.minimumForDataDerivedSigmaPt());
                }
                if (rules.informationOnly()) {
                    arguments.add("--information-only=" + measurand);
                }
            }
        }
        return arguments;
    }

    /** Reporting digits of a measurand the catalogue no longer lists (as the reports assume). */
    private static final int DEFAULT_DIGITS = 3;

    private static boolean scored(EvaluationViews.Score s) {
        return s.z() != null || s.zPrime() != null || s.zeta() != null || s.en() != null;
    }

    private static String key(String element, String item) {
        return element + "\u0000" + item;
    }

    private static BigDecimal decimal(Object value) {
        return value == null ? null : value instanceof BigDecimal b ? b : new BigDecimal(value.toString());
    }
}
