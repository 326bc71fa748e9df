package org.roundtable.statistics;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.roundtable.statistics.density.CriticalBandwidth;
import org.roundtable.statistics.density.KernelDensity;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.Median;
import org.roundtable.statistics.robust.NormalizedIqr;
import org.roundtable.statistics.robust.QuartileRule;
import org.roundtable.statistics.robust.ScaledMad;
import org.roundtable.statistics.robust.SortedCopy;
import org.roundtable.statistics.score.BoundaryRule;
import org.roundtable.statistics.score.CensoredResult;
import org.roundtable.statistics.score.ScoreKind;
import org.roundtable.statistics.score.ScoreSelection;
import org.roundtable.statistics.score.Scores;

/**
 * Evaluates one measurand of a round: robust statistics, assigned value, σ_pt and the scores of
 * every participant. The offline {@code evaluate} command and the server's round evaluation
 * both call this class, so they give the same numbers.
 *
 * <p>Definition (the plan choices are the input's nullable fields):
 * <ol>
 * <li>Censored ("less than") results are set aside: not used in any statistic, not scored,
 * classified consistent/inconsistent with the assigned value ({@link CensoredResult}).</li>
 * <li>Results marked {@code excludedFromStatistics} (blunders) are left out of every statistic
 * and of n, but are still scored against the x_pt, u(x_pt) and σ_pt of the others (ISO
 * 13528:2015 removes blunders from the statistics; the laboratory still sees its score).</li>
 * <li>On the remaining p values: median, MADe, nIQR (quartiles by the {@link Rules}' quartile
 * rule, default Hyndman–Fan type 7) and Algorithm A (by the rules' stopping rule, default full
 * convergence, 1e-10·s*).</li>
 * <li>Assigned value x_pt: the given value with {@code u(x_pt) = U/2}, else the Algorithm A
 * robust mean x* of all non-censored results whatever their method, with
 * {@code u(x_pt) = 1.25·s* / sqrt(p)}.</li>
 * <li>σ_pt: the given value, else s* (data-derived, warned) — unless the input says the plan's σ_pt method gives
 * none ({@code sigmaPtUndefined}, e.g. Horwitz at x_pt ≤ 0): then no z or z′, {@code no-sigma-pt} with the
 * reason.</li>
 * <li>z or z′ is chosen by {@code u(x_pt) ≤ 0.3·σ_pt} ({@link ScoreSelection}); both are
 * reported, the chosen one classifies with the rules' {@link BoundaryRule} <b>as printed</b> (rounded half away
 * from zero to the rules' score decimals first). The choice is exact in decimal where U(x_pt), its k and σ_pt
 * were given as decimals ({@link Decimals}), else on doubles with a relative tolerance of 1e-12. ζ uses
 * {@code u(x_i) = U_i/k_i} (k = 2 when absent) and u(x_pt); En takes both at the rules' coverage factor k
 * (default 2): {@code En = (x − x_pt)/sqrt((k·u(x_i))² + (k·u(x_pt))²)}, so the same standard uncertainty
 * gives the same En whatever k a laboratory stated it at.</li>
 * <li>Small rounds ({@link SmallRounds}): a consensus x_pt of fewer results than the plan's minimum, or a
 * data-derived σ_pt of fewer than its minimum, scores nobody ({@code below-minimum}, naming the alternatives)
 * unless the plan asks for scores for information only ({@code information-only}: scores computed, no
 * classification).</li>
 * </ol>
 *
 * <p>Special cases and policy (computes what it can, warns, never refuses valid input):
 * fewer values than the plan's minimum ({@code few-participants}); p &lt; 2 (no Algorithm A, no
 * consensus); MADe = 0 ({@code zero-spread}: no robust SD; with a σ_pt given independently of the
 * data the median is the assigned value, {@code scored-against-median}; with a data-derived σ_pt
 * nothing is scored and {@code no-sigma-pt} names the alternatives); more than one population ({@code multimodal}: the plain kernel density shows more
 * than one mode and Silverman's bootstrap-calibrated critical-bandwidth test rejects one mode at
 * α = 0.05, {@link CriticalBandwidth});
 * more than 20 % censored ({@code censored-share}); a consensus x_pt with ζ/En
 * ({@code zeta-en-biased}). Undefined numbers are {@code null}.
 *
 * <p>References: ISO 13528:2015 clauses 7 (assigned value, 7.7 consensus), 8 (σ_pt), 9
 * (scores), Annex C (robust statistics); Silverman B.W. (1981) J. R. Stat. Soc. B 43:97–99 (the
 * multimodality test). The minimum of 10 results is common practice, no source.
 */
public final class MeasurandEvaluation {

    /** Results below this count get a {@code few-participants} warning. */
    public static final int MINIMUM_PARTICIPANTS = AlgorithmA.RECOMMENDED_MINIMUM;
    /** A censored share above this gets a {@code censored-share} warning (our choice, no source). */
    public static final double LARGE_CENSORED_SHARE = 0.2;
    /** Coverage factor assumed when a participant gives U without k, and of a given U(x_pt). */
    public static final double DEFAULT_COVERAGE_FACTOR = 2.0;

    /**
     * One participant's result for the measurand.
     *
     * @param participant         participant code
     * @param reported            the result as written (e.g. {@code "0.742"} or {@code "<0.001"})
     * @param value               the number; for a less-than result the limit X
     * @param lessThan            true for a censored result {@code <X}
     * @param expandedUncertainty U, or null
     * @param coverageFactor      k, or null (then 2)
     * @param method              method name, or null (not used by the statistics)
     * @param excludedFromStatistics true for a result left out of every statistic (a blunder)
     *                            but still scored against the others' assigned value
     */
    public record ParticipantResult(String participant, String reported, double value,
            boolean lessThan, Double expandedUncertainty, Double coverageFactor, String method,
            boolean excludedFromStatistics) {

        public ParticipantResult {
            Objects.requireNonNull(participant, "participant");
            Objects.requireNonNull(reported, "reported");
            Checks.requireFinite(value, "value of " + participant);
        }

        /** A result that takes part in the statistics. */
        public ParticipantResult(String participant, String reported, double value,
                boolean lessThan, Double expandedUncertainty, Double coverageFactor, String method) {
            this(participant, reported, value, lessThan, expandedUncertainty, coverageFactor, method,
                    false);
        }

        /** The same result left out of the statistics (still scored). */
        public ParticipantResult excluded() {
            return new ParticipantResult(participant, reported, value, lessThan,
                    expandedUncertainty, coverageFactor, method, true);
        }
    }

    /**
     * How the statistics are computed and scores classified, as a plan fixes it.
     *
     * @param quartileRule   quartiles of nIQR
     * @param stoppingRule   stopping rule of Algorithm A
     * @param boundaryRule   classification bands of z and z′
     * @param scoreDecimals  decimals scores are printed and classified with (default 2)
     * @param coverageFactor k at which En takes both expanded uncertainties (default 2)
     */
    public record Rules(QuartileRule quartileRule, AlgorithmA.StoppingRule stoppingRule,
            BoundaryRule boundaryRule, int scoreDecimals, double coverageFactor) {

        /** Hyndman–Fan type 7, full convergence, |z| ≤ 2 satisfactory and |z| ≥ 3 unsatisfactory, 2 decimals, k = 2. */
        public static final Rules DEFAULT = new Rules(QuartileRule.DEFAULT,
                AlgorithmA.StoppingRule.FULL_CONVERGENCE, BoundaryRule.DEFAULT);

        public Rules {
            Objects.requireNonNull(quartileRule, "quartileRule");
            Objects.requireNonNull(stoppingRule, "stoppingRule");
            Objects.requireNonNull(boundaryRule, "boundaryRule");
            if (scoreDecimals < 0 || scoreDecimals > 10) {
                throw new IllegalArgumentException("score decimals must be 0 to 10, got " + scoreDecimals);
            }
            Checks.requirePositive(coverageFactor, "coverage factor of En");
        }

        /** The rules with 2 score decimals and En at k = 2. */
        public Rules(QuartileRule quartileRule, AlgorithmA.StoppingRule stoppingRule, BoundaryRule boundaryRule) {
            this(quartileRule, stoppingRule, boundaryRule, Scores.DEFAULT_SCORE_DECIMALS, DEFAULT_COVERAGE_FACTOR);
        }

        /** Algorithm A configured with this stopping rule. */
        public AlgorithmA algorithmA() {
            return stoppingRule == AlgorithmA.StoppingRule.FULL_CONVERGENCE
                    ? AlgorithmA.fullConvergence() : AlgorithmA.thirdSignificantFigure();
        }
    }

    /**
     * The decimals a given x_pt's U(x_pt), its k and a given σ_pt were stated with, so that the z/z′ choice
     * compares them exactly ({@link ScoreSelection#chooseExact}). Any may be null (then the doubles are compared
     * with the documented tolerance).
     */
    public record Decimals(BigDecimal assignedExpandedUncertainty, BigDecimal coverageFactor, BigDecimal sigmaPt) {

        /** No decimals known. */
        public static final Decimals NONE = new Decimals(null, null, null);
    }

    /**
     * When a round is too small for data-derived values: the fewest results for a consensus x_pt and for a
     * data-derived σ_pt, and what happens below them.
     *
     * @param minimumParticipants            fewest results for a consensus x_pt (default 10)
     * @param minimumForDataDerivedSigmaPt   fewest results for σ_pt = robust SD of the round (default 10)
     * @param informationOnly                below a minimum: score for information only (no classification)
     *                                       instead of not scoring (the default)
     * @param givenAssignedValueFromN        when the given x_pt is itself a consensus of a subset (a method
     *                                       group, experts), the number of results it came from; else null
     */
    public record SmallRounds(int minimumParticipants, int minimumForDataDerivedSigmaPt, boolean informationOnly,
            Integer givenAssignedValueFromN) {

        /** 10 and 10, not scored below them (common practice, no source; see docs/methods.md). */
        public static final SmallRounds DEFAULT = new SmallRounds(MINIMUM_PARTICIPANTS, MINIMUM_PARTICIPANTS,
                false, null);

        public SmallRounds {
            if (minimumParticipants < 1 || minimumForDataDerivedSigmaPt < 1) {
                throw new IllegalArgumentException("minimums must be at least 1");
            }
        }
    }

    /**
     * What to evaluate and the plan's choices.
     *
     * @param measurand                   measurand name
     * @param unit                        unit of all values
     * @param results                     results in report order
     * @param assignedValue               x_pt if set by the plan, else null (consensus)
     * @param assignedExpandedUncertainty U(x_pt) at k = 2 for a given x_pt, else null (0)
     * @param sigmaPt                     σ_pt if set by the plan, else null (robust SD)
     * @param rules                       quartile, stopping and boundary rules, score decimals, k of En
     * @param decimals                    the decimals U(x_pt), k and σ_pt were given as (exact z/z′ choice)
     * @param smallRounds                 minimums for data-derived values and what happens below them
     * @param sigmaPtUndefined            why the plan's σ_pt method gives no σ_pt for this round (e.g. the Horwitz
     *                                    function at a consensus x_pt ≤ 0 of blank-corrected results), else null;
     *                                    when set, {@code sigmaPt} must be null, no σ_pt is taken from the data and
     *                                    nobody gets z or z′ ({@code no-sigma-pt} gives this reason)
     */
    public record Input(String measurand, String unit, List<ParticipantResult> results,
            Double assignedValue, Double assignedExpandedUncertainty, Double sigmaPt, Rules rules,
            Decimals decimals, SmallRounds smallRounds, String sigmaPtUndefined) {

        /** An input whose σ_pt is the given one or, when null, the round's robust SD. */
        public Input(String measurand, String unit, List<ParticipantResult> results,
                Double assignedValue, Double assignedExpandedUncertainty, Double sigmaPt, Rules rules,
                Decimals decimals, SmallRounds smallRounds) {
            this(measurand, unit, results, assignedValue, assignedExpandedUncertainty, sigmaPt, rules, decimals,
                    smallRounds, null);
        }

        /** An input evaluated with {@link Rules#DEFAULT}. */
        public Input(String measurand, String unit, List<ParticipantResult> results,
                Double assignedValue, Double assignedExpandedUncertainty, Double sigmaPt) {
            this(measurand, unit, results, assignedValue, assignedExpandedUncertainty, sigmaPt,
                    Rules.DEFAULT);
        }

        /** An input without decimals and with the default small-round policy. */
        public Input(String measurand, String unit, List<ParticipantResult> results,
                Double assignedValue, Double assignedExpandedUncertainty, Double sigmaPt, Rules rules) {
            this(measurand, unit, results, assignedValue, assignedExpandedUncertainty, sigmaPt, rules,
                    Decimals.NONE, SmallRounds.DEFAULT);
        }

        public Input {
            Objects.requireNonNull(measurand, "measurand");
            Objects.requireNonNull(rules, "rules");
            Objects.requireNonNull(decimals, "decimals");
            Objects.requireNonNull(smallRounds, "smallRounds");
            results = List.copyOf(results);
            if (assignedValue != null) {
                Checks.requireFinite(assignedValue, "assigned value");
            }
            if (assignedExpandedUncertainty != null && !(assignedExpandedUncertainty >= 0
                    && Double.isFinite(assignedExpandedUncertainty))) {
                throw new IllegalArgumentException("U(x_pt) must be a finite number >= 0");
            }
            if (sigmaPt != null) {
                Checks.requirePositive(sigmaPt, "sigma_pt");
            }
            if (sigmaPtUndefined != null && sigmaPt != null) {
                throw new IllegalArgumentException("a sigma_pt is given although it is marked undefined");
            }
        }
    }

    /** Where x_pt came from. */
    public enum AssignedValueSource { GIVEN, ALGORITHM_A, MEDIAN }

    /** Where σ_pt came from. */
    public enum SigmaPtSource { GIVEN, ROBUST_SD }

    /**
     * Scores of one participant (null = not scored).
     *
     * @param classification satisfactory/questionable/unsatisfactory from the score used;
     *                       consistent/inconsistent for a less-than result; null if unscored
     */
    public record ParticipantScore(String participant, String reported, Double value, Double z,
            Double zPrime, Double zeta, Double en, String classification) {
    }

    /**
     * Outcome for one measurand; null marks a number that could not be computed. n and censored
     * count only the results that take part in the statistics; excludedFromStatistics counts the
     * others (scored all the same, in {@code scores}). {@code scoreDecimals} and {@code coverageFactor} are the
     * rules' (classification as printed, k of En); {@code informationOnly} marks scores computed below a minimum
     * for information only: they carry no classification.
     */
    public record Result(String measurand, String unit, int n, int censored,
            int excludedFromStatistics, Double median,
            Double madE, Double nIqr, Double robustMean, Double robustSd, Integer iterations,
            Boolean converged, Double assignedValue, Double assignedValueUncertainty,
            AssignedValueSource assignedValueSource, Double sigmaPt, SigmaPtSource sigmaPtSource,
            ScoreKind scoreUsed, String scoreUsedReason, QuartileRule quartileRule,
            AlgorithmA.StoppingRule stoppingRule, BoundaryRule boundaryRule,
            List<StatisticsWarning> warnings,
            List<ParticipantScore> scores, int scoreDecimals, double coverageFactor, boolean informationOnly) {

        public Result {
            warnings = List.copyOf(warnings);
            scores = List.copyOf(scores);
        }
    }

    private MeasurandEvaluation() {
    }

    /** Evaluates the measurand (see class comment). */
    public static Result evaluate(Input input) {
        List<StatisticsWarning> warnings = new ArrayList<>();
        Rules rules = input.rules();
        List<ParticipantResult> results = input.results();
        List<ParticipantResult> retained = results.stream().filter(r -> !r.excludedFromStatistics()).toList();
        int excludedFromStatistics = results.size() - retained.size();
        double[] values = retained.stream().filter(r -> !r.lessThan()).mapToDouble(ParticipantResult::value).toArray();
        int p = values.length;
        int censored = retained.size() - p;
        double[] sorted = SortedCopy.of(values);

        SmallRounds small = input.smallRounds();
        if (p < small.minimumParticipants()) {
            warnings.add(new StatisticsWarning("few-participants", p + " results used, fewer than the "
                    + small.minimumParticipants() + " the plan asks for a consensus: robust statistics of so few"
                    + " values are unreliable (common practice, no source); prefer an independent assigned value"));
        }
        if (!retained.isEmpty() && (double) censored / retained.size() > LARGE_CENSORED_SHARE) {
            warnings.add(new StatisticsWarning("censored-share", String.format(Locale.ROOT,
                    "%d of %d results are 'less than' values (%.0f %%): they are left out of the"
                    + " statistics, which may then be biased high", censored, retained.size(),
                    100.0 * censored / retained.size())));
        }

        Double median = null;
        Double madE = null;
        Double nIqr = null;
        if (p >= 1) {
            median = Median.ofSorted(sorted);
            madE = ScaledMad.MADE_FACTOR * ScaledMad.madOfSorted(sorted, median);
            nIqr = NormalizedIqr.ofSorted(sorted, rules.quartileRule());
        }
        AlgorithmA.Result a = null;
        if (p >= 2) {
            a = rules.algorithmA().evaluateSorted(sorted);
            for (StatisticsWarning w : a.warnings()) {
                if (!w.code().equals("too-few-values")) {
                    warnings.add(w);
                }
            }
        } else {
            warnings.add(new StatisticsWarning("too-few-values", "Algorithm A needs at least 2"
                    + " results, " + p + " available"));
        }
        boolean scale = a != null && a.scaleEstimable();
        Double robustMean = scale ? a.robustMean() : null;
        Double robustSd = scale ? a.robustSd() : null;

        Double xpt = null;
        Double uxpt = null;
        AssignedValueSource xptSource = null;
        if (input.assignedValue() != null) {
            xpt = input.assignedValue();
            double bigU = input.assignedExpandedUncertainty() == null ? 0 : input.assignedExpandedUncertainty();
            uxpt = bigU / DEFAULT_COVERAGE_FACTOR;
            xptSource = AssignedValueSource.GIVEN;
        } else if (scale) {
            xpt = a.robustMean();
            uxpt = a.assignedValueUncertainty();
            xptSource = AssignedValueSource.ALGORITHM_A;
        } else if (p >= 1 && madE == 0 && input.sigmaPt() != null) {
            // more than half of the values identical: no robust SD, but with a σ_pt given independently of the
            // data the median is a usable consensus (its u(x_pt) = 1.25·MADe/√p is 0)
            xpt = median;
            uxpt = 0.0;
            xptSource = AssignedValueSource.MEDIAN;
            warnings.add(new StatisticsWarning("scored-against-median", "More than half of the results are"
                    + " identical (MADe = 0): Algorithm A has no spread to work with, so the assigned value is the"
                    + " median with u(x_pt) = 1.25·MADe/√p = 0, and sigma_pt is the given one (ISO 13528:2015,"
                    + " C.2 median and MADe; common practice, no source for this fallback)"));
        } else {
            warnings.add(new StatisticsWarning("no-assigned-value", "No assigned value: none was"
                    + " given and no robust mean with a usable spread could be computed; not scored"));
        }

        Double sigma = null;
        SigmaPtSource sigmaSource = null;
        if (input.sigmaPt() != null) {
            sigma = input.sigmaPt();
            sigmaSource = SigmaPtSource.GIVEN;
        } else if (input.sigmaPtUndefined() != null) {
            // the plan fixes how σ_pt is obtained and it gives none here: never replaced by the round's robust SD
            warnings.add(new StatisticsWarning("no-sigma-pt", "No sigma_pt: " + input.sigmaPtUndefined()
                    + "; z and z' not scored"));
        } else if (scale) {
            sigma = a.robustSd();
            sigmaSource = SigmaPtSource.ROBUST_SD;
            warnings.add(new StatisticsWarning("sigma-pt-data-derived", "sigma_pt is the robust"
                    + " SD of this round's results (data-derived): z-scores only rank participants"
                    + " against each other, they do not judge fitness for purpose"));
        } else {
            String why = p >= 1 && madE != null && madE == 0
                    ? "more than half of the results are identical (MADe = 0), so the round's data give no spread;"
                    + " give sigma_pt independently of the data (fixed, Horwitz, precision data), a reference value"
                    + " with a fixed sigma_pt, or score for information only"
                    : "none was given and no robust SD could be computed";
            warnings.add(new StatisticsWarning("no-sigma-pt", "No sigma_pt: " + why + "; z and z' not scored"));
        }

        // a consensus or a data-derived σ_pt of too few results: nobody is scored against it (or, if the plan says
        // so, scored for information only, without a classification)
        int assignedFrom = xptSource == AssignedValueSource.GIVEN
                ? (small.givenAssignedValueFromN() == null ? Integer.MAX_VALUE : small.givenAssignedValueFromN()) : p;
        boolean fewForAssigned = xpt != null && xptSource != null && assignedFrom < small.minimumParticipants();
        boolean fewForSigma = sigmaSource == SigmaPtSource.ROBUST_SD && p < small.minimumForDataDerivedSigmaPt();
        boolean informationOnly = false;
        if (fewForAssigned || fewForSigma) {
            String what = (fewForAssigned ? "the assigned value is a consensus of " + assignedFrom
                    + " result(s) (the plan asks for at least " + small.minimumParticipants() + ")" : "")
                    + (fewForAssigned && fewForSigma ? " and " : "")
                    + (fewForSigma ? "sigma_pt is the robust SD of " + p + " result(s) (the plan asks for at least "
                    + small.minimumForDataDerivedSigmaPt() + ")" : "");
            if (small.informationOnly()) {
                informationOnly = true;
                warnings.add(new StatisticsWarning("information-only", "Scores for information only, without a"
                        + " verdict: " + what + "."));
            } else {
                warnings.add(new StatisticsWarning("below-minimum", "Not scored: " + what + ". Alternatives the"
                        + " coordinator can choose in the plan: a reference or certified value, a fixed sigma_pt,"
                        + " or scores for information only."));
                xpt = null;
                uxpt = null;
                xptSource = null;
                sigma = null;
                sigmaSource = null;
            }
        }

        ScoreKind used = null;
        String usedReason = null;
        if (sigma != null && uxpt != null) {
            Decimals d = input.decimals();
            boolean exact = xptSource == AssignedValueSource.GIVEN && sigmaSource == SigmaPtSource.GIVEN
                    && d.sigmaPt() != null && d.coverageFactor() != null
                    && (d.assignedExpandedUncertainty() != null || input.assignedExpandedUncertainty() == null);
            ScoreSelection.Choice choice = exact
                    ? ScoreSelection.chooseExact(d.assignedExpandedUncertainty() == null ? BigDecimal.ZERO
                            : d.assignedExpandedUncertainty(), d.coverageFactor(), d.sigmaPt())
                    : ScoreSelection.choose(uxpt, sigma);
            used = choice.kind();
            usedReason = choice.reason();
        }

        if (p >= 3 && scale) {
            // the costly calibrated test only where the plain density shows more than one mode
            int modes = KernelDensity.of(values).modes().size();
            if (modes > 1) {
                CriticalBandwidth.Result test = CriticalBandwidth.test(values);
                if (test.moreThanOneMode()) {
                    warnings.add(new StatisticsWarning("multimodal", String.format(Locale.ROOT,
                            "The results look like more than one population (e.g. methods): Silverman's"
                            + " critical-bandwidth test rejects one mode, bootstrap p = %.3f < %.2f (%d seeded"
                            + " smoothed bootstrap samples; Silverman 1981, J. R. Stat. Soc. B 43); investigate"
                            + " before relying on the consensus", test.pValue(), CriticalBandwidth.DEFAULT_ALPHA,
                            test.bootstrapSamples())));
                }
            }
        }

        List<ParticipantScore> scores = new ArrayList<>(results.size());
        boolean anyUncertaintyScore = false;
        for (ParticipantResult r : results) {
            if (r.lessThan()) {
                String cls = xpt == null || informationOnly ? null
                        : CensoredResult.classifyLessThan(r.value(), xpt).word();
                scores.add(new ParticipantScore(r.participant(), r.reported(), null, null, null, null, null, cls));
                continue;
            }
            double x = r.value();
            Double z = null;
            Double zPrime = null;
            Double zeta = null;
            Double en = null;
            if (xpt != null) {
                if (sigma != null) {
                    z = box(Scores.z(x, xpt, sigma));
                    zPrime = box(Scores.zPrime(x, xpt, sigma, uxpt));
                }
                if (r.expandedUncertainty() != null) {
                    double k = r.coverageFactor() == null ? DEFAULT_COVERAGE_FACTOR : r.coverageFactor();
                    double u = r.expandedUncertainty() / k;
                    zeta = box(Scores.zeta(x, xpt, u, uxpt));
                    // both uncertainties at the plan's coverage: U = k_plan·u, whatever k the laboratory stated
                    double kPlan = rules.coverageFactor();
                    en = box(Scores.en(x, xpt, kPlan * u, kPlan * uxpt));
                    // ζ/En of a result outside the consensus are not biased by it
                    anyUncertaintyScore |= !r.excludedFromStatistics() && (zeta != null || en != null);
                }
            }
            Double chosen = used == ScoreKind.Z ? z : used == ScoreKind.Z_PRIME ? zPrime : null;
            String cls = chosen == null || informationOnly ? null
                    : rules.boundaryRule().classifyAsPrinted(chosen, rules.scoreDecimals()).word();
            scores.add(new ParticipantScore(r.participant(), r.reported(), x, z, zPrime, zeta, en, cls));
        }
        if (anyUncertaintyScore && xptSource == AssignedValueSource.ALGORITHM_A) {
            warnings.add(new StatisticsWarning("zeta-en-biased", "The assigned value is a consensus"
                    + " that includes each participant's own result: zeta and En are biased towards"
                    + " zero (ISO 13528:2015, clause 9)"));
        }
        return new Result(input.measurand(), input.unit(), p, censored, excludedFromStatistics,
                median, madE, nIqr, robustMean, robustSd, a == null ? null : a.iterations(),
                a == null ? null : a.converged(), xpt, uxpt, xptSource, sigma, sigmaSource, used,
                usedReason, rules.quartileRule(), rules.stoppingRule(), rules.boundaryRule(), warnings,
                scores, rules.scoreDecimals(), rules.coverageFactor(), informationOnly);
    }

    private static Double box(java.util.OptionalDouble value) {
        return value.isPresent() ? value.getAsDouble() : null;
    }
}
