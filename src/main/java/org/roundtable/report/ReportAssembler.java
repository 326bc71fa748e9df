package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.evaluation.EvaluationExports;
import org.roundtable.evaluation.EvaluationReview;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.EvaluationViews;
import org.roundtable.platform.DomainException;
import org.roundtable.report.model.EvaluationNotes;
import org.roundtable.report.model.Exclusion;
import org.roundtable.report.model.InterpretationAdvice;
import org.roundtable.report.model.ItemCheck;
import org.roundtable.report.model.ItemInfo;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.MethodGroupStatistics;
import org.roundtable.report.model.PairedItems;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.RobustStatistics;
import org.roundtable.report.model.RoundInfo;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.SchemeInfo;
import org.roundtable.report.model.Signatures;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Measurand;
import org.roundtable.scheme.PlanStore;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundService;
import org.roundtable.scheme.SchemeService;
import org.roundtable.scheme.qualification.QualificationService;
import org.roundtable.statistics.score.Classification;
import org.roundtable.statistics.score.ScoreKind;

import org.roundtable.platform.Labels;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * Builds the report model from what is stored: a (non-preview) evaluation run, the round, its scheme and
 * measurand catalogue, the frozen plan, the sample qualification figures, the coordinator's comments and the
 * signatures. Participants enter the model by participant code only; the laboratory ids stay in
 * {@link Assembled#laboratories()}, which is used to file each laboratory report and never rendered.
 */
@ApplicationScoped
public class ReportAssembler {

    static final String CONFIDENTIALITY = "This report is confidential to the participants of the round, the provider "
            + "and, where a participant has agreed, its accreditation body. Participants are identified only by their "
            + "participant codes; the provider does not disclose which laboratory holds which code. A participant may "
            + "share its own results and its own laboratory report.";

    static final String CAUTION = "Scores support, and do not replace, the laboratory's own judgement and that of its "
            + "accreditation body.";

    private final EvaluationService evaluations;
    private final EvaluationReview review;
    private final EvaluationExports exports;
    private final RoundService rounds;
    private final RoundAccess roundAccess;
    private final SchemeService schemes;
    private final PlanStore plans;
    private final QualificationService qualification;
    private final EntityManager entityManager;
    private final String providerName;
    private final java.util.Optional<String> providerAddress;
    private final java.util.Optional<String> providerAccreditation;

    public ReportAssembler(EvaluationService evaluations, EvaluationReview review, EvaluationExports exports,
                           RoundService rounds,
                           RoundAccess roundAccess,
                           SchemeService schemes, PlanStore plans, QualificationService qualification,
                           EntityManager entityManager,
                           @ConfigProperty(name = "roundtable.reports.provider-name") String providerName,
                           @ConfigProperty(name = "roundtable.reports.provider-address")
                           java.util.Optional<String> providerAddress,
                           @ConfigProperty(name = "roundtable.reports.provider-accreditation")
                           java.util.Optional<String> providerAccreditation) {
        this.providerAddress = providerAddress;
        this.providerAccreditation = providerAccreditation;
        this.evaluations = evaluations;
        this.review = review;
        this.exports = exports;
        this.rounds = rounds;
        this.roundAccess = roundAccess;
        this.schemes = schemes;
        this.plans = plans;
        this.qualification = qualification;
        this.entityManager = entityManager;
        this.providerName = providerName;
    }

    /**
     * The assembled round report with what is needed to issue it.
     *
     * @param report          the round report
     * @param evaluationRunId the row id of the evaluation run it reports
     * @param laboratories    participant code to laboratory id, for every participant with results (never rendered)
     */
    public record Assembled(RoundReport report, long evaluationRunId, Map<String, Long> laboratories) {

        /** The laboratory report of one participant. */
        public LaboratoryReport laboratoryReport(String participantCode) {
            return new LaboratoryReport(report, participantCode);
        }
    }

    /** The installation's provider, named on every report whose scheme names none of its own. */
    public String providerName() {
        return providerName;
    }

    /**
     * {@code identity} naming the provider of the round's scheme: the scheme's own where set, else the
     * installation's ({@code roundtable.reports.provider-*}). Read at issue, so a change applies to documents
     * issued afterwards.
     */
    @Transactional
    public ReportIdentity withProviderOf(long roundId, ReportIdentity identity) {
        long schemeId = rounds.get(roundId).schemeId();
        return schemes.providerOf(schemeId)
                .map(p -> identity.withProvider(p.name(), p.address(), p.accreditation()))
                .orElseGet(() -> identity.withProvider(providerName, providerAddress.orElse(null),
                        providerAccreditation.orElse(null)));
    }

    /** The row id of a round's evaluation run; refuses a preview run (previews are never reported). */
    @Transactional
    public long runId(long roundId, int version) {
        @SuppressWarnings("unchecked")
        List<Object[]> rows = entityManager.createNativeQuery(
                        "SELECT id, preview FROM evaluation_run WHERE round_id = :r AND version = :v")
                .setParameter("r", roundId).setParameter("v", version).getResultList();
        if (rows.isEmpty()) {
            throw new DomainException.NotFound("The evaluation run");
        }
        if (Boolean.TRUE.equals(rows.get(0)[1])) {
            throw new DomainException.Conflict("Evaluation run " + version + " is a preview on results still open; "
                    + "reports are issued only from an evaluation of the closed round.");
        }
        return ((Number) rows.get(0)[0]).longValue();
    }

    /**
     * Assembles the round report of run {@code version} of the round.
     *
     * @param identity            report number, status, issue date; the provider is filled in here when blank
     * @param signatures          who signed it off (for a preliminary report: who issued it)
     * @param coordinatorComments the coordinator's comments; may be empty
     */
    @Transactional
    public Assembled assemble(long roundId, int version, ReportIdentity identity, Signatures signatures,
                              String coordinatorComments) {
        long runId = runId(roundId, version);
        EvaluationViews.Run run = evaluations.run(roundId, version);
        Map<String, EvaluationExports.ReportedUncertainty> uncertainties = exports.uncertaintiesReadBy(roundId, runId);
        RoundService.RoundView round = rounds.get(roundId);
        SchemeService.SchemeView scheme = schemes.get(round.schemeId());
        boolean secondReviewer = schemes.secondReviewerRequired(round.schemeId());
        Map<String, Measurand> catalogue = new LinkedHashMap<>();
        schemes.catalogue(round.schemeId()).forEach(m -> catalogue.put(m.element, m));
        EvaluationPlan plan = plans.current(roundId).orElseThrow(
                () -> new DomainException.Conflict("The round has no frozen evaluation plan."));
        Map<String, EvaluationPlan.MeasurandPlan> planned = new LinkedHashMap<>();
        plan.measurands().forEach(m -> planned.put(m.element(), m));

        boolean manyItems = run.measurands().stream().map(EvaluationViews.MeasurandOutcome::itemLabel).distinct().count() > 1;
        List<MeasurandSection> sections = new ArrayList<>();
        List<Exclusion> exclusions = new ArrayList<>();
        Map<String, Long> laboratories = new TreeMap<>();
        Map<String, String> firstSectionOfElement = new LinkedHashMap<>();
        for (EvaluationViews.MeasurandOutcome o : run.measurands()) {
            String id = manyItems ? o.element() + "-" + o.itemLabel() : o.element();
            firstSectionOfElement.putIfAbsent(o.element(), id);
            Measurand m = catalogue.get(o.element());
            int digits = m == null ? 3 : m.reportingDigits;
            for (EvaluationViews.Score s : o.scores()) {
                laboratories.put(s.participantCode(), s.laboratoryId());
                if (s.excludedReason() != null) {
                    exclusions.add(new Exclusion(s.participantCode(), id, s.excludedReason()));
                }
            }
            sections.add(section(o, id, manyItems, digits, uncertainties));
        }

        List<ItemCheck> checks = new ArrayList<>();
        Map<String, List<String>> decisions = new LinkedHashMap<>();
        for (QualificationService.MeasurandQualification q : qualification.status(roundId)) {
            String sectionId = firstSectionOfElement.get(q.element());
            if (q.decision() != null) {
                String reason = q.decision().reason();
                String words = "coordinator's decision: " + Labels.of("Decision", q.decision().decision()).toLowerCase(Locale.ROOT)
                        + (reason == null || reason.isBlank() ? "" : " (" + reason.strip() + ")");
                decisions.computeIfAbsent(words, k -> new ArrayList<>()).add(q.element());
            }
            if (sectionId == null || q.homogeneity() == null) {
                continue;
            }
            QualificationService.HomogeneityFigures h = q.homogeneity();
            QualificationService.StabilityFigures st = q.stability();
            String note = h.items() + " items in " + h.replicates() + " replicates"
                    + (st == null ? "; no stability check uploaded" : "; stability from " + st.endResults() + " results");
            checks.add(new ItemCheck(sectionId, h.betweenItemSd(), h.simpleLimit(), h.sufficientlyHomogeneous(),
                    st == null ? Double.NaN : st.difference(), st == null ? Double.NaN : st.simpleLimit(),
                    st == null || st.stable(), note));
        }
        StringBuilder preparation = new StringBuilder();
        decisions.forEach((decision, elements) -> preparation.append(preparation.isEmpty() ? "Sample qualification: " : " ")
                .append(String.join(", ", elements)).append(" — ").append(decision).append(decision.endsWith(".") ? "" : "."));
        ItemInfo item = new ItemInfo(round.itemDescription() + " (" + round.itemsPerLaboratory() + " item"
                + (round.itemsPerLaboratory() == 1 ? "" : "s") + " per participant, labelled "
                + String.join(", ", round.itemLabels()) + ")", preparation.toString(), checks);

        List<PairedItems> pairs = new ArrayList<>();
        if (manyItems && round.itemLabels().size() == 2) {
            for (String element : firstSectionOfElement.keySet()) {
                String a = element + "-" + round.itemLabels().get(0);
                String b = element + "-" + round.itemLabels().get(1);
                if (sections.stream().anyMatch(s -> s.id().equals(a)) && sections.stream().anyMatch(s -> s.id().equals(b))) {
                    pairs.add(new PairedItems(a, b));
                }
            }
        }

        EvaluationPlan.MeasurandPlan first = plan.measurands().isEmpty() ? null : plan.measurands().get(0);
        // measurands evaluated alike are named together, so that the method reads once
        Map<String, Set<String>> byMethod = new LinkedHashMap<>();
        for (EvaluationViews.MeasurandOutcome o : run.measurands()) {
            byMethod.computeIfAbsent("x_pt " + assignedValueWords(o.assignedValueMethod()) + "; σpt "
                    + sigmaPtWords(o.sigmaPtMethod(), o.sigmaPtSource()) + "; scored by "
                    + scoreSymbol(scoreKind(o.scoreUsed())) + scoringWords(o.rules()) + ".",
                    k -> new LinkedHashSet<>()).add(o.element());
            EvaluationPlan.MeasurandPlan p = planned.get(o.element());
            if (p != null && p.exclusionRules() != null && !p.exclusionRules().isBlank()) {
                byMethod.computeIfAbsent("Exclusion rules: " + p.exclusionRules().strip(), k -> new LinkedHashSet<>())
                        .add(o.element());
            }
        }
        Set<String> methods = new LinkedHashSet<>();
        byMethod.forEach((text, elements) -> methods.add(String.join(", ", elements) + ": " + text));
        methods.add("Evaluation run " + run.run().version() + " of the round, plan version " + run.run().planVersion()
                + " (plan SHA-256 " + run.run().planSha256() + "), outputs SHA-256 " + run.run().outputsSha256() + ".");
        EvaluationNotes notes = new EvaluationNotes(List.copyOf(methods),
                stoppingWords(first == null ? null : first.stoppingRule()),
                boundaryWords(first == null ? null : first.boundaryRule()),
                quartileWords(first == null ? null : first.quartileRule()),
                lateWords(round.latePolicy()), exclusions);

        int reporting = (int) run.measurands().stream().flatMap(o -> o.scores().stream())
                .map(EvaluationViews.Score::participantCode).distinct().count();
        RoundInfo roundInfo = new RoundInfo(round.code(), round.itemDescription(), round.dispatchDate(),
                round.resultDeadline().toLocalDate(), roundAccess.participantCodes(roundId).size(), reporting);
        SchemeInfo schemeInfo = new SchemeInfo("S" + scheme.id(), scheme.name(),
                "Material family " + scheme.materialFamily().toLowerCase(Locale.ROOT).replace('_', ' ') + "; "
                        + round.itemsPerLaboratory() + " item(s) per participant; measurands "
                        + String.join(", ", firstSectionOfElement.keySet()) + ".",
                secondReviewer);
        ReportIdentity id = identity.providerName().isBlank() ? new ReportIdentity(identity.reportId(),
                identity.status(), identity.replacesReportId(), identity.amendmentReason(), identity.issueDate(),
                providerName) : identity;
        // the caution closes §"Reading the scores" in every report already (ReportDocument); adding it here too
        // printed the same sentence twice
        List<String> advice = new ArrayList<>(InterpretationAdvice.general().paragraphs());
        RoundReport report = new RoundReport(id, schemeInfo, roundInfo, item, sections, pairs, notes,
                coordinatorComments, signatures, CONFIDENTIALITY, new InterpretationAdvice(advice));
        return new Assembled(report, runId, laboratories);
    }

    /**
     * The report's section of one measurand ({@code Cr-A}) of run {@code version} of the round — previews
     * included, for the coordinator's review — built as {@link #assemble} builds it, from that measurand's rows
     * only (its scores and the uncertainties the run read for it). 404 for a run or measurand that does not exist.
     */
    @Transactional
    public MeasurandSection reviewSection(long roundId, int version, String measurandKey) {
        EvaluationViews.MeasurandOutcome o = review.measurandWithScores(roundId, version, measurandKey);
        long runId = review.runId(roundId, version);
        boolean manyItems = review.manyItems(roundId, version);
        String id = manyItems ? o.element() + "-" + o.itemLabel() : o.element();
        return section(o, id, manyItems, review.digits(roundId, o.element()),
                exports.uncertaintiesReadBy(roundId, runId, o.element(), o.itemLabel()));
    }

    /**
     * The report's section of one measurand of a run, as the round report carries it (the charts of the
     * coordinator's review are drawn from this section, so they are the report's charts).
     *
     * @param id            the section's id ({@code Cr}, or {@code Cr-A} when the run has several items)
     * @param uncertainties the expanded uncertainties the run read, by {@link EvaluationExports#uncertaintyKey}
     */
    static MeasurandSection section(EvaluationViews.MeasurandOutcome o, String id, boolean manyItems, int digits,
                                    Map<String, EvaluationExports.ReportedUncertainty> uncertainties) {
        ScoreKind kind = scoreKind(o.scoreUsed());
        List<ParticipantResult> results = new ArrayList<>();
        for (EvaluationViews.Score s : o.scores()) {
            boolean lessThan = s.reported() != null && s.reported().strip().startsWith("<");
            Classification classification = classification(s.classification());
            boolean excluded = s.excludedReason() != null;
            boolean late = excluded && s.excludedReason().startsWith("late result");
            EvaluationExports.ReportedUncertainty u = uncertainties.get(
                    EvaluationExports.uncertaintyKey(o.element(), o.itemLabel(), s.participantCode()));
            results.add(new ParticipantResult(s.participantCode(), o.itemLabel(), s.reported(),
                    s.value() == null ? Double.NaN : s.value(), o.unit(), u == null ? null : u.expandedUncertainty(),
                    u == null ? null : u.coverageFactor(), s.methodGroup(),
                    s.z(), s.zPrime(), s.zeta(), s.en(), classification, lessThan,
                    lessThan && classification == null && s.classification() != null ? s.classification() : "",
                    excluded, excluded ? s.excludedReason() : "", late));
        }
        List<MethodGroupStatistics> groups = o.methodGroups().stream()
                .map(g -> new MethodGroupStatistics(g.methodGroup(), g.n(), nan(g.median()), g.robustMean(), g.robustSd()))
                .toList();
        RobustStatistics robust = new RobustStatistics("Algorithm A (ISO 13528:2015, C.3.1)", nan(o.robustMean()),
                nan(o.robustSd()), nan(o.median()), nan(o.madE()), nan(o.nIqr()),
                o.iterations() == null ? 0 : o.iterations(), Boolean.TRUE.equals(o.converged()));
        return new MeasurandSection(id, o.element(), manyItems ? o.itemLabel() : "", o.unit(), digits, o.n(),
                nan(o.assignedValue()), assignedValueWords(o.assignedValueMethod()), nan(o.assignedValueUncertainty()),
                nan(o.sigmaPt()), sigmaPtWords(o.sigmaPtMethod(), o.sigmaPtSource()), robust, groups,
                o.warnings().stream().map(w -> org.roundtable.evaluation.WarningTexts.forPeople(w, digits)).toList(), kind,
                o.scoreUsedReason(), results,
                o.rules() == null ? org.roundtable.platform.NumberFormats.DEFAULT_SCORE_DECIMALS
                        : o.rules().decimalsOfScores());
    }

    private static double nan(Double value) {
        return value == null ? Double.NaN : value;
    }

    static ScoreKind scoreKind(String jsonName) {
        for (ScoreKind k : ScoreKind.values()) {
            if (k.jsonName().equals(jsonName)) {
                return k;
            }
        }
        return ScoreKind.Z;
    }

    static String scoreSymbol(ScoreKind kind) {
        return switch (kind) {
            case Z -> "z";
            case Z_PRIME -> "z′ (z prime)";
            case ZETA -> "ζ (zeta)";
            case EN -> "En";
        };
    }

    static Classification classification(String word) {
        for (Classification c : Classification.values()) {
            if (c.word().equals(word)) {
                return c;
            }
        }
        return null;
    }

    static String assignedValueWords(String method) {
        if (method == null) {
            return "";
        }
        return switch (method) {
            case "CONSENSUS_ALL" -> "robust mean of all participants' results (Algorithm A, ISO 13528:2015 C.3.1)";
            case "CONSENSUS_METHOD_GROUP" -> "robust mean of one method group's results (Algorithm A)";
            case "CERTIFIED_REFERENCE" -> "certified value of a reference material";
            case "REFERENCE_LABORATORY" -> "value from a reference laboratory";
            case "EXPERT_CONSENSUS" -> "robust mean of expert laboratories' results (Algorithm A)";
            default -> method.toLowerCase(Locale.ROOT).replace('_', ' ');
        };
    }

    static String sigmaPtWords(String method, String source) {
        String words = method == null ? "" : switch (method) {
            case "FIXED" -> "fixed in the plan by fitness for purpose";
            case "PERCENT_OF_ASSIGNED" -> "a fixed percentage of the assigned value";
            case "HORWITZ_THOMPSON" -> "Horwitz function with Thompson's modification";
            case "PRECISION_DATA" -> "from the reproducibility and repeatability of a precision experiment";
            case "EARLIER_ROUNDS" -> "from earlier rounds of the scheme";
            case "ROBUST_SD_OF_ROUND" -> "robust standard deviation of this round's results (scores rank only)";
            default -> method.toLowerCase(Locale.ROOT).replace('_', ' ');
        };
        // the source ("given" / "robust SD") says only whether σpt came from the plan or from the data, which the
        // method already says; printed beside a formula such as Horwitz–Thompson it misled readers
        return words;
    }

    /**
     * How scores were printed and judged: the score decimals they are classified at (as printed), the coverage
     * factor k at which En takes both expanded uncertainties, and scores for information only. Empty for runs
     * stored before these were recorded.
     */
    static String scoringWords(EvaluationViews.Rules rules) {
        if (rules == null || rules.scoreDecimals() == null) {
            return "";
        }
        String words = "; scores printed to " + rules.scoreDecimals() + " decimal" + (rules.scoreDecimals() == 1 ? "" : "s")
                + " and classified as printed; En with the participant's and the assigned value's expanded"
                + " uncertainties both at k = " + org.roundtable.platform.NumberFormats.full(rules.scoreCoverageFactor())
                + " (a U stated at another k converted through u = U/k)";
        return rules.informationOnly() ? words + "; scores for information only, without a verdict (fewer results"
                + " than the plan's minimum)" : words;
    }

    static String stoppingWords(String rule) {
        return rule == null || rule.equals("FULL_CONVERGENCE")
                ? "Algorithm A iterated until x* and s* converge (the plan's full-convergence rule)"
                : rule.toLowerCase(Locale.ROOT).replace('_', ' ');
    }

    static String boundaryWords(String rule) {
        return rule == null || rule.equals("SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3")
                ? "|z| ≤ 2 satisfactory, 2 < |z| < 3 questionable, |z| ≥ 3 unsatisfactory, judged on the score as printed"
                        + " (a printed score on a limit takes the better class)"
                : "|z| < 2 satisfactory, 2 ≤ |z| ≤ 3 questionable, |z| > 3 unsatisfactory, judged on the score as printed";
    }

    static String quartileWords(String rule) {
        return rule == null || rule.equals("HYNDMAN_FAN_7") ? "Hyndman-Fan type 7 quartiles for nIQR"
                : rule.replace('_', ' ');
    }

    static String lateWords(String latePolicy) {
        if (latePolicy == null) {
            return "";
        }
        return switch (latePolicy) {
            case "REFUSE" -> "results after the deadline were refused";
            case "ACCEPT_FLAGGED_SCORED" -> "late results were accepted until the round closed, flagged and scored";
            case "ACCEPT_FLAGGED_UNSCORED" -> "late results are shown, flagged and not scored or used in the statistics";
            default -> "late results: " + latePolicy.toLowerCase(Locale.ROOT).replace('_', ' ');
        };
    }
}
