package org.roundtable.report;

import java.math.BigDecimal;
import java.math.RoundingMode;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.TreeMap;
import org.roundtable.report.model.EvaluationNotes;
import org.roundtable.report.model.Exclusion;
import org.roundtable.report.model.InterpretationAdvice;
import org.roundtable.report.model.ItemCheck;
import org.roundtable.report.model.ItemInfo;
import org.roundtable.report.model.MeasurandSection;
import org.roundtable.report.model.MethodGroupStatistics;
import org.roundtable.report.model.PairedItems;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.ReportIdentity;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.report.model.RobustStatistics;
import org.roundtable.report.model.RoundInfo;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.model.SchemeInfo;
import org.roundtable.report.model.Signatory;
import org.roundtable.report.model.Signatures;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.Median;
import org.roundtable.statistics.robust.NormalizedIqr;
import org.roundtable.statistics.robust.ScaledMad;
import org.roundtable.statistics.score.Classification;
import org.roundtable.statistics.score.ScoreKind;
import org.roundtable.statistics.score.Scores;

/**
 * Builds invented but realistic report models for tests and benchmarks: a low-alloy steel round
 * with seeded random results around fixed assigned values, plus chosen special cases (a given
 * value, a late or excluded result, a censored result, a result without uncertainty).
 *
 * <p>Scores and robust statistics are computed with the statistics core, so the model is
 * consistent with itself. All data are demo data.
 */
public final class SampleRoundBuilder {

    /** One measurand of the plan. */
    public record Spec(String id, String name, String itemLabel, String unit, int digits, double assignedValue,
            double assignedUncertainty, double sigmaPt, String assignedMethod, String sigmaMethod) {
    }

    private static final String[] METHOD_GROUPS = {"spark OES", "spark OES", "spark OES", "combustion IR", "XRF"};

    private int participants = 12;
    private long seed = 20261201L;
    private ReportStatus status = ReportStatus.FINAL;
    private String reportId = "LAS-2026-2-R1";
    private final List<Spec> specs = new ArrayList<>();
    private final List<PairedItems> pairs = new ArrayList<>();
    private final Map<String, String> givenValues = new HashMap<>();
    private final Set<String> late = new HashSet<>();
    private final Map<String, String> excluded = new LinkedHashMap<>();
    private final Map<String, String> lessThan = new HashMap<>();
    private final Set<String> withoutUncertainty = new HashSet<>();

    /** Number of participants, coded P01, P02, ... (P0001 ... beyond 99). */
    public SampleRoundBuilder participants(int count) {
        this.participants = count;
        return this;
    }

    public SampleRoundBuilder seed(long seed) {
        this.seed = seed;
        return this;
    }

    public SampleRoundBuilder status(ReportStatus status, String reportId) {
        this.status = status;
        this.reportId = reportId;
        return this;
    }

    public SampleRoundBuilder measurand(Spec spec) {
        specs.add(spec);
        return this;
    }

    public SampleRoundBuilder pair(String first, String second) {
        pairs.add(new PairedItems(first, second));
        return this;
    }

    /** Fixes one reported value (as a decimal string). */
    public SampleRoundBuilder value(String code, String measurandId, String reported) {
        givenValues.put(code + "/" + measurandId, reported);
        return this;
    }

    public SampleRoundBuilder late(String code, String measurandId) {
        late.add(code + "/" + measurandId);
        return this;
    }

    public SampleRoundBuilder excluded(String code, String measurandId, String reason) {
        excluded.put(code + "/" + measurandId, reason);
        return this;
    }

    /** A censored result "&lt; limit". */
    public SampleRoundBuilder lessThan(String code, String measurandId, String limit) {
        lessThan.put(code + "/" + measurandId, limit);
        return this;
    }

    public SampleRoundBuilder withoutUncertainty(String code, String measurandId) {
        withoutUncertainty.add(code + "/" + measurandId);
        return this;
    }

    /** Participant code of the i-th participant (1-based). */
    public String code(int i) {
        return participants < 100 ? String.format("P%02d", i) : String.format("P%04d", i);
    }

    /** The small low-alloy steel round used by the tests: 12 participants, C, Mn (paired), Cr, Ni, N. */
    public static SampleRoundBuilder lowAlloySteel() {
        return new SampleRoundBuilder()
                .measurand(new Spec("C", "Carbon", "A", "%", 3, 0.182, 0.0015, 0.006,
                        "robust mean of participants' results (Algorithm A)", "fixed in the plan from earlier rounds"))
                .measurand(new Spec("Mn-A", "Manganese", "A", "%", 3, 0.748, 0.003, 0.020,
                        "certified value of the item's reference material", "fixed in the plan from earlier rounds"))
                .measurand(new Spec("Mn-B", "Manganese", "B", "%", 3, 0.802, 0.003, 0.020,
                        "certified value of the item's reference material", "fixed in the plan from earlier rounds"))
                .measurand(new Spec("Cr", "Chromium", "A", "%", 3, 1.052, 0.004, 0.025,
                        "robust mean of participants' results (Algorithm A)", "fixed in the plan (expert judgement)"))
                .measurand(new Spec("Ni", "Nickel", "A", "%", 3, 0.512, 0.006, 0.015,
                        "robust mean of participants' results (Algorithm A)", "fixed in the plan (expert judgement)"))
                .measurand(new Spec("N", "Nitrogen", "A", "mg/kg", 0, 86, 1.5, 6,
                        "robust mean of participants' results (Algorithm A)", "fixed in the plan from earlier rounds"))
                .pair("Mn-A", "Mn-B")
                .value("P05", "Mn-A", "0.702")
                .value("P05", "Mn-B", "0.757")
                .value("P11", "Cr", "1.140")
                .value("P03", "C", "0.175")
                .late("P07", "C")
                .excluded("P12", "Ni", "unit error (reported in mg/kg), confirmed by the participant")
                .value("P12", "Ni", "5120")
                .lessThan("P09", "N", "50")
                .withoutUncertainty("P02", "Cr");
    }

    /** A synthetic round of {@code labs} participants and {@code measurands} measurands (benchmarks). */
    public static SampleRoundBuilder synthetic(int labs, int measurands) {
        String[][] elements = {{"C", "Carbon"}, {"Si", "Silicon"}, {"Mn", "Manganese"}, {"P", "Phosphorus"},
            {"S", "Sulfur"}, {"Cr", "Chromium"}, {"Ni", "Nickel"}, {"Mo", "Molybdenum"}, {"Cu", "Copper"},
            {"V", "Vanadium"}};
        SampleRoundBuilder builder = new SampleRoundBuilder().participants(labs);
        for (int i = 0; i < measurands; i++) {
            String[] element = elements[i % elements.length];
            String item = String.valueOf((char) ('A' + i / elements.length));
            double level = 0.05 + 0.1 * (i % 7);
            builder.measurand(new Spec(element[0] + "-" + item, element[1], item, "%", 4, level, level * 0.004,
                    level * 0.03, "robust mean of participants' results (Algorithm A)", "fixed in the plan"));
        }
        if (measurands > elements.length) {
            builder.pair("Mn-A", "Mn-B");
        }
        return builder;
    }

    public RoundReport build() {
        Random random = new Random(seed);
        List<MeasurandSection> sections = new ArrayList<>();
        List<ItemCheck> checks = new ArrayList<>();
        List<Exclusion> exclusions = new ArrayList<>();
        for (Spec spec : specs) {
            sections.add(section(spec, random, exclusions));
            checks.add(new ItemCheck(spec.id(), spec.sigmaPt() * 0.12, spec.sigmaPt() * 0.3, true,
                    spec.sigmaPt() * 0.05, spec.sigmaPt() * 0.3, true,
                    "10 discs in duplicate, spark OES"));
        }
        return new RoundReport(
                new ReportIdentity(reportId, status, status == ReportStatus.AMENDED ? "LAS-2026-2-R1" : null,
                        status == ReportStatus.AMENDED ? "Cr result of P11 corrected for a transcription error" : null,
                        LocalDate.of(2026, 11, 20), "Roundtable Proficiency Testing (demo provider)"),
                new SchemeInfo("LAS", "Low-alloy steel by spark OES, combustion and fusion",
                        "Two rounds a year; each round sends chill-cast discs (item A, and item B in paired rounds) "
                                + "and chips for combustion. Participants report the mean of their routine number "
                                + "of burns with U and k. z or z′ is the performance score; ζ and En are "
                                + "given for information.", true),
                new RoundInfo("LAS-2026-2", "Low-alloy steel disc, autumn 2026", LocalDate.of(2026, 9, 14),
                        LocalDate.of(2026, 10, 16), participants + 1, participants),
                new ItemInfo("Chill-cast low-alloy steel discs, 40 mm diameter, 20 mm thick, cut from one "
                        + "continuously cast bar (items A and B from two heats of similar composition).",
                        "Discs were surface-ground by the provider; participants re-prepare the surface before "
                                + "analysis. Homogeneity: 10 discs analysed in duplicate in random order; "
                                + "criterion s_s ≤ 0.3 σ_pt. Stability: 3 discs analysed after the closing date.",
                        checks),
                sections,
                pairs,
                new EvaluationNotes(List.of(
                        "Robust mean and standard deviation by Algorithm A (ISO 13528:2022 Annex C).",
                        "z = (x − x_pt)/σ_pt; z′ is used instead when u(x_pt) > 0.3 σ_pt.",
                        "ζ and En use the participant's reported expanded uncertainty divided by k.",
                        "Censored results are not scored; a limit below x_pt is unsatisfactory."),
                        "iterate until x* and s* change by less than 1e-10 s*, at most 1000 iterations",
                        "a score exactly on a limit takes the better class (|z| = 2.00 is satisfactory)",
                        "Hyndman-Fan type 7 quartiles",
                        "late results are shown and scored for information but are not used in the statistics",
                        exclusions),
                "The round went well. Nickel had a larger uncertainty of the assigned value than planned, so "
                        + "z′ was used. One participant reported nickel in mg/kg; the result was excluded.\n\n"
                        + "Participants with a questionable manganese score on both items should check the "
                        + "manganese calibration, as both points lie along the diagonal of the Youden plot.",
                new Signatures(new Signatory("Dr. Irena Kovač", "Round coordinator", LocalDate.of(2026, 11, 19)),
                        new Signatory("Tomás Ferreira", "Second reviewer (statistics)", LocalDate.of(2026, 11, 19))),
                "This report is confidential to the participants of the round, the provider and, where a "
                        + "participant has agreed, its accreditation body. Participants may share their own results.",
                InterpretationAdvice.general());
    }

    private MeasurandSection section(Spec spec, Random random, List<Exclusion> exclusions) {
        List<double[]> raw = new ArrayList<>();
        List<ParticipantResult> results = new ArrayList<>();
        double scale = Math.pow(10, spec.digits());
        List<Double> used = new ArrayList<>();
        Map<String, List<Double>> groups = new TreeMap<>();
        boolean useZPrime = spec.assignedUncertainty() > 0.3 * spec.sigmaPt();
        ScoreKind kind = useZPrime ? ScoreKind.Z_PRIME : ScoreKind.Z;
        for (int i = 1; i <= participants; i++) {
            String code = code(i);
            String key = code + "/" + spec.id();
            double bias = spec.sigmaPt() * 0.4 * Math.sin(i * 1.7);
            double x = spec.assignedValue() + bias + spec.sigmaPt() * 0.7 * random.nextGaussian();
            String reported = BigDecimal.valueOf(Math.round(x * scale) / scale).setScale(spec.digits(),
                    RoundingMode.HALF_UP).toPlainString();
            if (givenValues.containsKey(key)) {
                reported = givenValues.get(key);
            }
            boolean censored = lessThan.containsKey(key);
            if (censored) {
                reported = "<" + lessThan.get(key);
            }
            double value = Double.parseDouble(censored ? lessThan.get(key) : reported);
            String group = METHOD_GROUPS[i % METHOD_GROUPS.length];
            if (spec.unit().equals("mg/kg")) {
                group = i % 3 == 0 ? "hot extraction" : "inert-gas fusion";
            }
            Double expanded = withoutUncertainty.contains(key) ? null
                    : BigDecimal.valueOf(spec.sigmaPt() * (0.8 + 0.15 * (i % 5))).round(new java.math.MathContext(2))
                            .doubleValue();
            Double k = expanded == null ? null : 2.0;
            boolean isLate = late.contains(key);
            String excludedReason = excluded.get(key);
            Double z = null;
            Double zPrime = null;
            Double zeta = null;
            Double en = null;
            Classification classification = null;
            String censoredCheck = "";
            if (censored) {
                censoredCheck = value < spec.assignedValue() ? "limit below x_pt, inconsistent" : "consistent with x_pt";
                classification = value < spec.assignedValue() ? Classification.UNSATISFACTORY : null;
            } else if (excludedReason == null) {
                z = Scores.z(value, spec.assignedValue(), spec.sigmaPt()).getAsDouble();
                zPrime = Scores.zPrime(value, spec.assignedValue(), spec.sigmaPt(), spec.assignedUncertainty())
                        .getAsDouble();
                if (expanded != null) {
                    zeta = Scores.zeta(value, spec.assignedValue(), expanded / k, spec.assignedUncertainty())
                            .getAsDouble();
                    en = Scores.en(value, spec.assignedValue(), expanded, 2 * spec.assignedUncertainty())
                            .getAsDouble();
                }
                classification = Scores.classify(kind, useZPrime ? zPrime : z);
            }
            if (excludedReason != null) {
                exclusions.add(new Exclusion(code, spec.id(), excludedReason));
            }
            if (!censored && excludedReason == null && !isLate) {
                used.add(value);
                groups.computeIfAbsent(group, g -> new ArrayList<>()).add(value);
            }
            results.add(new ParticipantResult(code, spec.itemLabel(), reported, value,
                    spec.unit(), expanded, k, group, z, zPrime, zeta, en, classification, censored, censoredCheck,
                    excludedReason != null, excludedReason == null ? "" : excludedReason, isLate));
            raw.add(new double[] {value});
        }
        double[] values = used.stream().mapToDouble(Double::doubleValue).toArray();
        Arrays.sort(values);
        AlgorithmA.Result a = AlgorithmA.fullConvergence().evaluate(values);
        RobustStatistics robust = new RobustStatistics("Algorithm A", a.robustMean(), a.robustSd(),
                Median.of(values), ScaledMad.madE(values), NormalizedIqr.of(values), a.iterations(), a.converged());
        List<MethodGroupStatistics> groupStats = new ArrayList<>();
        for (Map.Entry<String, List<Double>> g : groups.entrySet()) {
            double[] gv = g.getValue().stream().mapToDouble(Double::doubleValue).toArray();
            Double mean = null;
            Double sd = null;
            if (gv.length >= 5 && ScaledMad.madE(gv) > 0) {
                mean = AlgorithmA.robustMean(gv);
                sd = AlgorithmA.robustSd(gv);
            }
            groupStats.add(new MethodGroupStatistics(g.getKey(), gv.length, Median.of(gv), mean, sd));
        }
        List<String> warnings = new ArrayList<>();
        if (useZPrime) {
            warnings.add("u(x_pt) > 0.3 σ_pt: z′ is used instead of z");
        }
        if (values.length < AlgorithmA.RECOMMENDED_MINIMUM) {
            warnings.add("fewer than " + AlgorithmA.RECOMMENDED_MINIMUM + " results in the statistics");
        }
        return new MeasurandSection(spec.id(), spec.name(), spec.itemLabel(), spec.unit(), spec.digits(), values.length,
                spec.assignedValue(), spec.assignedMethod(), spec.assignedUncertainty(), spec.sigmaPt(),
                spec.sigmaMethod(), robust, groupStats, warnings, kind,
                useZPrime ? "u(x_pt) > 0.3 σ_pt" : "u(x_pt) ≤ 0.3 σ_pt", results);
    }
}
