package org.roundtable.demo;

import jakarta.enterprise.context.ApplicationScoped;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.time.Instant;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.LocalTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;
import org.roundtable.account.DemoAccounts;
import org.roundtable.account.Role;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.history.CorrectiveActions;
import org.roundtable.report.ReportLifecycle;
import org.roundtable.scheme.DemoSchemes;
import org.roundtable.scheme.DemoSchemes.DemoMeasurand;
import org.roundtable.submission.DemoSubmissions;

/**
 * The demo scenario, all invented: the Northmarch Alloy Proficiency Office runs a low-alloy steel scheme for 24
 * laboratories in 18 countries (C, Si, Mn, P, S, Cr, Ni, Mo, Cu, Al, V in %, N in mg/kg) and a smaller wrought
 * aluminium scheme for 11 of them.
 *
 * <ul>
 *   <li>Steel: three past rounds, about 11, 8 and 5 months before the first start, evaluated with final reports;
 *       one round open for results (dispatched two weeks ago, deadline in two weeks; 14 laboratories have
 *       reported, Kestrel Alloys, Tarnvik and Calderon among those that have not); the next round as a draft.
 *       </li>
 *   <li>Aluminium: one past round with its final report.</li>
 * </ul>
 *
 * Problems planted where a user would meet them: carbon by spark OES reads about 0.02 % higher than by
 * combustion (a method-group difference, flagged); in the second round Dunmore enters sulfur in mg/kg as % ("87"
 * instead of 0.0087) and confirms the range warning — an outlier; in the third round Salzach slips a decimal in Mn;
 * in the open round Veldhaven slips a decimal in Ni (inside the expected range, so nothing warns; the blunder the
 * coordinator guide marks); in the first round Mures reports five hours late (flagged, not scored); in the second round Ebro does not report;
 * "less than" results for V (two consistent, one not); Pomorze's Mn drifts from questionable to unsatisfactory over
 * the three rounds, and its corrective action is recorded after the third; each round has homogeneity data for Mn
 * and one marginal measurand, for which the coordinator decides to widen σpt by s_s.
 *
 * <p>The numbers come from a seeded generator (lot value + the laboratory's own bias + round-to-round noise,
 * rounded to the measurand's digits), so every first start gives the same results; the dates are relative to the
 * first start.
 */
@ApplicationScoped
public class DemoScenario {

    /** A step of the scenario: its moment, what it does (for messages) and the work. */
    public record Step(Instant at, String what, Runnable work) {
    }

    static final Actor COORDINATOR = new Actor("coordinator", Role.COORDINATOR_NAME, null);
    static final ReportLifecycle.Signer SIGNER = new ReportLifecycle.Signer(COORDINATOR, "Marta Ilves");

    static final List<DemoMeasurand> STEEL = List.of(
            new DemoMeasurand("C", "%", 3, "0.02", "1.1", List.of("SPARK_OES", "COMBUSTION"), "0.012", "0.010"),
            new DemoMeasurand("Si", "%", 3, "0.02", "1.54", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.010", null),
            new DemoMeasurand("Mn", "%", 3, "0.03", "2.0", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.020", null),
            new DemoMeasurand("P", "%", 4, "0.003", "0.085", List.of("SPARK_OES", "ICP_OES"), "0.0015", null),
            new DemoMeasurand("S", "%", 4, "0.001", "0.055", List.of("SPARK_OES", "COMBUSTION"), "0.0012", null),
            new DemoMeasurand("Cr", "%", 3, "0.007", "8.14", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.025", null),
            new DemoMeasurand("Ni", "%", 3, "0.006", "5.0", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.015", null),
            new DemoMeasurand("Mo", "%", 3, "0.007", "1.3", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.010", null),
            new DemoMeasurand("Cu", "%", 3, "0.006", "0.5", List.of("SPARK_OES", "ICP_OES"), "0.008", null),
            new DemoMeasurand("Al", "%", 3, "0.003", "0.10", List.of("SPARK_OES", "ICP_OES"), "0.004", null),
            new DemoMeasurand("V", "%", 4, "0.0005", "0.30", List.of("SPARK_OES", "ICP_OES"), "0.0006", null),
            new DemoMeasurand("N", "mg/kg", 0, "10", "550", List.of("INERT_GAS_FUSION", "SPARK_OES"), "9", null));
    /** The steel lots' base composition, in the order of {@link #STEEL} (invented). */
    static final double[] STEEL_BASE = {0.410, 0.250, 0.750, 0.0120, 0.0080, 1.050, 0.200, 0.215, 0.160, 0.025,
        0.0045, 85};
    /** Each steel round's lot relative to the base (past rounds, then the open one). */
    static final double[] STEEL_LOT_FACTORS = {0.94, 1.00, 1.06, 0.97};
    /** Days from the first start to each steel round's dispatch. */
    static final int[] STEEL_DISPATCH_DAYS = {-330, -240, -150, -14};
    /** The marginal measurand of each steel round's homogeneity data. */
    static final String[] STEEL_MARGINAL = {"Cr", "P", "Mo", "Si"};
    /** The laboratories (by list index) that have reported in the open round. */
    static final Set<Integer> OPEN_ROUND_REPORTED = Set.of(1, 2, 5, 6, 7, 8, 9, 11, 13, 14, 15, 16, 18, 20);

    static final List<DemoMeasurand> ALUMINIUM = List.of(
            new DemoMeasurand("Si", "%", 3, "0.05", "1.5", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.015", null),
            new DemoMeasurand("Fe", "%", 3, "0.05", "1.0", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.012", null),
            new DemoMeasurand("Cu", "%", 3, "0.005", "0.5", List.of("SPARK_OES", "ICP_OES"), "0.004", null),
            new DemoMeasurand("Mn", "%", 3, "0.005", "0.5", List.of("SPARK_OES", "ICP_OES"), "0.003", null),
            new DemoMeasurand("Mg", "%", 3, "0.1", "1.5", List.of("SPARK_OES", "XRF", "ICP_OES"), "0.020", null),
            new DemoMeasurand("Zn", "%", 3, "0.005", "0.5", List.of("SPARK_OES", "ICP_OES"), "0.003", null),
            new DemoMeasurand("Ti", "%", 4, "0.002", "0.2", List.of("SPARK_OES", "ICP_OES"), "0.0015", null));
    static final double[] ALUMINIUM_LOT = {0.450, 0.300, 0.080, 0.050, 0.700, 0.050, 0.0200};
    static final int ALUMINIUM_DISPATCH_DAY = -200;
    /** The laboratories (by list index) in the aluminium scheme. */
    static final List<Integer> ALUMINIUM_LABS = List.of(2, 3, 11, 8, 22, 16, 12, 20, 0, 6, 14);

    static final int DRIFTING_LAB = 7;          // Pomorze: Mn drifts over the steel rounds
    static final double[] DRIFT_MN = {0.047, 0.055, 0.069, 0.004};
    static final int UNIT_SLIP_LAB = 10;        // Dunmore: S in mg/kg typed as %, second round
    static final int DECIMAL_SLIP_LAB = 12;     // Salzach: Mn ×10, third round
    static final int LATE_LAB = 17;             // Mures: five hours late, first round
    static final int MISSING_LAB = 19;          // Ebro: no results in the second round
    static final int BLUNDER_LAB = 11;          // Veldhaven: Ni ×10 in the open round (the coordinator guide's blunder)

    private final DemoSchemes schemes;
    private final DemoSubmissions submissions;
    private final EvaluationService evaluations;
    private final ReportLifecycle reports;
    private final CorrectiveActions correctiveActions;
    private final Map<String, Long> roundIds = new HashMap<>();

    public DemoScenario(DemoSchemes schemes, DemoSubmissions submissions, EvaluationService evaluations,
                        ReportLifecycle reports, CorrectiveActions correctiveActions) {
        this.schemes = schemes;
        this.submissions = submissions;
        this.evaluations = evaluations;
        this.reports = reports;
        this.correctiveActions = correctiveActions;
    }

    /** When the accounts are made: before every round. */
    static Instant accountsAt(Instant firstStart) {
        return day(firstStart, -400, 8, 0);
    }

    /** The scenario's steps after the accounts, in time order. */
    List<Step> steps(Instant firstStart, List<DemoAccounts.Loaded> labs) {
        List<Step> steps = new ArrayList<>();
        long[] steelScheme = {0};
        long[] aluminiumScheme = {0};
        steps.add(new Step(day(firstStart, -390, 9, 0), "schemes", () -> {
            steelScheme[0] = schemes.scheme("Northmarch low-alloy steel scheme", "LOW_ALLOY_STEEL", STEEL);
            aluminiumScheme[0] = schemes.scheme("Northmarch wrought aluminium scheme", "ALUMINIUM_ALLOY", ALUMINIUM);
        }));
        Map<Integer, Integer> perYear = new HashMap<>();
        List<String> steelCodes = new ArrayList<>();
        List<Long> allLabs = labs.stream().map(DemoAccounts.Loaded::id).toList();
        for (int r = 0; r < STEEL_DISPATCH_DAYS.length; r++) {
            LocalDate dispatch = LocalDate.ofInstant(firstStart, ZoneOffset.UTC).plusDays(STEEL_DISPATCH_DAYS[r]);
            String code = "NLS-" + dispatch.getYear() + "-" + perYear.merge(dispatch.getYear(), 1, Integer::sum);
            boolean open = r == STEEL_DISPATCH_DAYS.length - 1;
            int round = r;
            steelCodes.add(code);
            addRound(steps, firstStart, code, "Low-alloy steel disc, 38 mm, lot " + lotName(dispatch, r),
                    STEEL_DISPATCH_DAYS[r], () -> steelScheme[0], STEEL, allLabs, labs,
                    homogeneity(STEEL, r, "Mn", STEEL_MARGINAL[r]), STEEL_MARGINAL[r], open,
                    (lab, index) -> steelResults(round, index), index -> !open || OPEN_ROUND_REPORTED.contains(index),
                    index -> !(round == 1 && index == MISSING_LAB), r == 0 ? LATE_LAB : -1);
        }
        // the drifting laboratory records its corrective action after the third round's final report
        steps.add(new Step(day(firstStart, STEEL_DISPATCH_DAYS[2] + 56, 14, 0), "corrective action", () -> {
            DemoAccounts.Loaded lab = labs.get(DRIFTING_LAB);
            String code = steelCodes.get(2);
            correctiveActions.createFor(lab.id(), lab.manager(), new Actor(lab.manager(), Role.LAB_MANAGER.name(),
                    lab.id()), roundIds.get(code), "Mn", "A", new CorrectiveActions.Draft(
                    "The spark stand's Mn line drifted upwards between recalibrations; the control sample's chart had "
                            + "shown it since the first round but stayed within its action limits.",
                    "Recalibrated with fresh setting-up samples, tightened the control sample's action limits for "
                            + "Mn and added a daily check against a certified disc.",
                    "Control chart after recalibration, certified disc within ±0.005 % over 20 days.", null, null));
        }));
        LocalDate aluminiumDispatch = LocalDate.ofInstant(firstStart, ZoneOffset.UTC).plusDays(ALUMINIUM_DISPATCH_DAY);
        List<Long> aluminiumLabs = ALUMINIUM_LABS.stream().map(i -> labs.get(i).id()).toList();
        List<DemoAccounts.Loaded> aluminiumLoaded = ALUMINIUM_LABS.stream().map(labs::get).toList();
        addRound(steps, firstStart, "NAL-" + aluminiumDispatch.getYear() + "-1",
                "Wrought aluminium disc, 50 mm, lot " + lotName(aluminiumDispatch, 7), ALUMINIUM_DISPATCH_DAY,
                () -> aluminiumScheme[0], ALUMINIUM, aluminiumLabs, aluminiumLoaded,
                homogeneity(ALUMINIUM, 7, "Mg", null), null, false,
                (lab, index) -> aluminiumResults(ALUMINIUM_LABS.get(index)), index -> true, index -> true, -1);
        // the next steel round, a draft
        LocalDate nextDispatch = LocalDate.ofInstant(firstStart, ZoneOffset.UTC).plusDays(75);
        String nextCode = "NLS-" + nextDispatch.getYear() + "-" + (perYear.getOrDefault(nextDispatch.getYear(), 0) + 1);
        steps.add(new Step(day(firstStart, -1, 15, 0), "draft round", () -> schemes.draft(steelScheme[0], nextCode,
                "Low-alloy steel disc, 38 mm, lot to be chosen", nextDispatch,
                LocalDateTime.of(nextDispatch.plusDays(28), LocalTime.of(17, 0)), STEEL)));
        steps.sort(Comparator.comparing(Step::at));
        return steps;
    }

    private interface ResultsOf {
        List<DemoSubmissions.Result> of(DemoAccounts.Loaded lab, int index);
    }

    private interface Which {
        boolean test(int index);
    }

    /** The steps of one round, from preparation to its final report (or to open for results). */
    private void addRound(List<Step> steps, Instant firstStart, String code, String item, int dispatchDay,
                          java.util.function.LongSupplier scheme, List<DemoMeasurand> measurands, List<Long> labIds,
                          List<DemoAccounts.Loaded> labs, String homogeneityCsv, String marginal, boolean open,
                          ResultsOf results, Which reporting, Which notMissing, int lateLab) {
        LocalDate dispatch = LocalDate.ofInstant(firstStart, ZoneOffset.UTC).plusDays(dispatchDay);
        LocalDateTime deadline = LocalDateTime.of(dispatch.plusDays(28), LocalTime.of(17, 0));
        List<DemoSchemes.Decision> decisions = marginal == null ? List.of() : List.of(new DemoSchemes.Decision(
                marginal, "WIDEN_SIGMA_PT", "Between-disc s_s is close to 0.3·σpt: σpt is widened by it (the"
                        + " assigned value is a consensus, so u_hom cannot go into u(x_pt)) rather than relying on the"
                        + " criterion's margin."));
        steps.add(new Step(day(firstStart, dispatchDay - 21, 9, 0), code + " prepared", () -> roundIds.put(code,
                schemes.prepare(scheme.getAsLong(), code, item, dispatch, deadline, measurands, labIds, homogeneityCsv,
                        decisions))));
        steps.add(new Step(day(firstStart, dispatchDay, 8, 0), code + " dispatched", () -> schemes.dispatch(roundIds.get(code))));
        steps.add(new Step(day(firstStart, dispatchDay, 10, 0), code + " opened", () -> schemes.openForResults(roundIds.get(code))));
        for (int i = 0; i < labs.size(); i++) {
            DemoAccounts.Loaded lab = labs.get(i);
            int index = i;
            boolean late = i == lateLab;
            if (open && (i == 0 || i == 4)) {
                continue; // Kestrel and Calderon have not acknowledged their discs yet
            }
            steps.add(new Step(day(firstStart, dispatchDay + 2 + i % 4, 11, i), code + " received by " + lab.manager(),
                    () -> schemes.receive(roundIds.get(code), lab.id(), lab.manager())));
            if (!reporting.test(i) || !notMissing.test(i)) {
                continue;
            }
            Instant when = late ? deadline.atZone(java.time.ZoneId.of("Europe/London")).toInstant().plusSeconds(5 * 3600)
                    : open ? day(firstStart, -6 + i % 6, 10, i) : day(firstStart, dispatchDay + 8 + i % 17, 10, i);
            steps.add(new Step(when, code + " results of " + lab.manager(),
                    () -> submissions.submit(lab.id(), roundIds.get(code), results.of(lab, index))));
        }
        if (open) {
            return;
        }
        steps.add(new Step(day(firstStart, dispatchDay + 29, 9, 0), code + " closed", () -> schemes.close(roundIds.get(code))));
        int[] version = {0};
        steps.add(new Step(day(firstStart, dispatchDay + 31, 9, 0), code + " evaluated", () -> version[0] = evaluations
                .run(roundIds.get(code), false, COORDINATOR).run().version()));
        Instant finalAt = day(firstStart, dispatchDay + 49, 9, 0);
        steps.add(new Step(day(firstStart, dispatchDay + 35, 9, 0), code + " reports", () -> reports.publishWithoutJobs(
                roundIds.get(code), version[0], "Results of " + labs.size() + " laboratories. Scores are against the"
                        + " consensus of the participants' results (Algorithm A) with the σpt fixed in the plan;"
                        + " demo data, invented.", SIGNER, finalAt)));
    }

    /** A laboratory's steel results of round {@code r} (0–2 past, 3 open). */
    static List<DemoSubmissions.Result> steelResults(int r, int lab) {
        List<DemoSubmissions.Result> out = new ArrayList<>();
        for (int e = 0; e < STEEL.size(); e++) {
            DemoMeasurand m = STEEL.get(e);
            double sigma = Double.parseDouble(m.sigmaPt());
            double lot = STEEL_BASE[e] * STEEL_LOT_FACTORS[r];
            String method = steelMethod(m.element(), lab);
            double value = lot + sigma * (0.35 * gaussian(lab, e, -1) + 0.55 * gaussian(lab, e, r));
            if (m.element().equals("C")) {
                value += method.equals("combustion") ? -0.008 : 0.012;
            }
            if (m.element().equals("Mn") && lab == DRIFTING_LAB) {
                value = lot + DRIFT_MN[r];
            }
            String text = round(value, m.digits());
            if (m.element().equals("V") && (lab == 4 || lab == 15)) {
                text = "<0.005";
            } else if (m.element().equals("V") && lab == 20) {
                text = "<0.002";
            }
            if (r == 1 && lab == UNIT_SLIP_LAB && m.element().equals("S")) {
                text = round(value * 10_000, 0); // mg/kg typed into a % field
            }
            if (r == 2 && lab == DECIMAL_SLIP_LAB && m.element().equals("Mn")) {
                text = round(value * 10, m.digits() - 1);
            }
            if (r == 3 && lab == BLUNDER_LAB && m.element().equals("Ni")) {
                text = round(value * 10, m.digits() - 1); // inside the expected range: no warning stops it
            }
            boolean withUncertainty = lab % 3 == 0 && !text.startsWith("<");
            out.add(new DemoSubmissions.Result(m.element(), m.unit(), text, method,
                    withUncertainty ? round(1.6 * sigma, m.digits() + 1) : null, withUncertainty ? "2" : null));
        }
        return out;
    }

    /** A laboratory's aluminium results (one round). */
    static List<DemoSubmissions.Result> aluminiumResults(int lab) {
        List<DemoSubmissions.Result> out = new ArrayList<>();
        for (int e = 0; e < ALUMINIUM.size(); e++) {
            DemoMeasurand m = ALUMINIUM.get(e);
            double sigma = Double.parseDouble(m.sigmaPt());
            double value = ALUMINIUM_LOT[e] + sigma * (0.35 * gaussian(lab, 20 + e, -1) + 0.55 * gaussian(lab, 20 + e, 7));
            out.add(new DemoSubmissions.Result(m.element(), m.unit(), round(value, m.digits()),
                    lab == 11 || lab == 16 ? "icp-oes" : "spark-oes", null, null));
        }
        return out;
    }

    private static String steelMethod(String element, int lab) {
        return switch (element) {
            case "C", "S" -> lab % 5 == 0 || lab % 5 == 2 ? "combustion" : "spark-oes";
            case "N" -> lab % 2 == 0 ? "inert-gas-fusion" : "spark-oes";
            case "Si", "Mn", "Cr", "Ni", "Mo" -> lab == 5 || lab == 13 || lab == 21 ? "xrf"
                    : lab == 9 || lab == 17 ? "icp-oes" : "spark-oes";
            default -> lab == 9 || lab == 17 ? "icp-oes" : "spark-oes";
        };
    }

    /**
     * Homogeneity data of a round: 10 discs in duplicate for {@code measurand} (between-disc standard deviation
     * 0.1·σpt) and, when given, for the marginal one (0.29·σpt), at one more digit than reported.
     */
    static String homogeneity(List<DemoMeasurand> measurands, int round, String measurand, String marginal) {
        StringBuilder csv = new StringBuilder("item,replicate,measurand,value\n");
        for (DemoMeasurand m : measurands) {
            boolean isMarginal = m.element().equals(marginal);
            if (!m.element().equals(measurand) && !isMarginal) {
                continue;
            }
            int e = measurands.indexOf(m);
            double sigma = Double.parseDouble(m.sigmaPt());
            double level = measurands == STEEL ? STEEL_BASE[e] * STEEL_LOT_FACTORS[round] : ALUMINIUM_LOT[e];
            SplittableRandom random = new SplittableRandom(7919L * (round + 1) + e);
            for (int disc = 0; disc < 10; disc++) {
                double between = (isMarginal ? 0.29 : 0.10) * sigma * random.nextGaussian();
                for (int rep = 1; rep <= 2; rep++) {
                    double within = 0.08 * sigma * random.nextGaussian();
                    csv.append(String.format(Locale.ROOT, "D%02d,%d,%s,%s%n", 3 + 7 * disc, rep, m.element(),
                            round(level + between + within, m.digits() + 1)));
                }
            }
        }
        return csv.toString();
    }

    private static double gaussian(int lab, int element, int round) {
        return new SplittableRandom(1_000_003L * (lab + 1) + 1009L * (element + 1) + round + 17).nextGaussian();
    }

    static String round(double value, int digits) {
        return BigDecimal.valueOf(Math.max(value, 0)).setScale(Math.max(digits, 0), RoundingMode.HALF_UP).toPlainString();
    }

    private static String lotName(LocalDate dispatch, int sequence) {
        return String.format(Locale.ROOT, "%02d-%03d", dispatch.getYear() % 100, 14 + 17 * sequence);
    }

    /** {@code days} from the first start's date, at {@code hour:minute} UTC. */
    static Instant day(Instant firstStart, int days, int hour, int minute) {
        return LocalDate.ofInstant(firstStart, ZoneOffset.UTC).plusDays(days).atTime(hour, minute % 60)
                .toInstant(ZoneOffset.UTC);
    }
}
