package org.roundtable.precision;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.roundtable.statistics.StatisticsWarning;
import org.roundtable.statistics.precision.ConsistencyStatistics;
import org.roundtable.statistics.precision.OutlierVerdict;
import org.roundtable.statistics.precision.PrecisionLevelEvaluation;
import org.roundtable.statistics.precision.PrecisionLevelRelationship;
import org.roundtable.statistics.precision.PrecisionStudyEvaluation;

/**
 * The evaluation of a precision experiment from plain inputs, shared by the server ({@link PrecisionEvaluationService})
 * and the offline {@code evaluate --precision} command, so both give the same numbers: cells by laboratory, level and
 * measurand in, {@link Study} (plain records, ready for JSON) out. No framework, no database.
 */
public final class PrecisionCalculation {

    private PrecisionCalculation() {
    }

    /** One laboratory's replicate results for one measurand at one level, in the measurand's unit. */
    public record Cell(String laboratory, String level, String measurand, double[] values) {
    }

    /** The design: levels in order (with the material), measurands with their unit, replicates and test levels. */
    public record Design(List<String> levels, Map<String, String> materials, Map<String, String> units,
                         int replicates, double alphaStraggler, double alphaOutlier, boolean fitRelationship) {
    }

    /** A decision to exclude a cell, with its reason. */
    public record Exclusion(String laboratory, String level, String measurand, String reason) {
    }

    /** A consistency or outlier test as reported: statistic, critical values, verdict and the laboratories tested. */
    public record TestResult(String test, Double statistic, Double stragglerCritical, Double outlierCritical,
                             String verdict, List<String> laboratories) {
    }

    /**
     * A laboratory's cell at one level.
     *
     * @param verdict the strongest indication among the tests: accepted, straggler or outlier
     * @param flags   the indications in words, e.g. "Cochran: straggler"
     */
    public record CellResult(String laboratory, List<Double> values, double mean, double sd, Double h, Double k,
                             String verdict, List<String> flags, boolean excluded, String exclusionReason) {
    }

    /** One level of one measurand. */
    public record LevelResult(String level, String material, int laboratories, int retainedLaboratories,
                              double generalMean, double repeatabilitySd, double betweenLaboratorySd,
                              double reproducibilitySd, double repeatabilityLimit, double reproducibilityLimit,
                              Double hStragglerLine, Double hOutlierLine, double kStragglerLine, double kOutlierLine,
                              List<TestResult> tests, List<CellResult> cells, List<String> warnings) {
    }

    /** A fitted precision-level relationship with its residuals. */
    public record FitResult(String model, String formula, double intercept, double slope, List<Double> levels,
                            List<Double> observed, List<Double> fitted, List<Double> residuals,
                            double relativeResidualRms, List<String> warnings) {
    }

    /** One measurand over all its levels. */
    public record MeasurandResult(String measurand, String unit, List<LevelResult> levels,
                                  List<FitResult> repeatabilityFits, List<FitResult> reproducibilityFits,
                                  List<String> warnings) {
    }

    /** The whole study. */
    public record Study(int replicates, double stragglerLevel, double outlierLevel, boolean fitRelationship,
                        List<MeasurandResult> measurands) {
    }

    /**
     * Evaluates the study. Laboratories appear in code order; a level with fewer than 2 retained laboratories is
     * left out with a warning on its measurand.
     */
    public static Study evaluate(Design design, List<Cell> cells, List<Exclusion> exclusions) {
        List<MeasurandResult> out = new ArrayList<>();
        for (Map.Entry<String, String> m : design.units().entrySet()) {
            String measurand = m.getKey();
            List<PrecisionStudyEvaluation.LevelInput> inputs = new ArrayList<>();
            List<List<String>> labsPerLevel = new ArrayList<>();
            List<String> levelNames = new ArrayList<>();
            List<String> warnings = new ArrayList<>();
            for (String level : design.levels()) {
                Map<String, double[]> byLab = new TreeMap<>();
                for (Cell c : cells) {
                    if (c.level().equals(level) && c.measurand().equals(measurand)) {
                        byLab.put(c.laboratory(), c.values());
                    }
                }
                List<String> labs = new ArrayList<>(byLab.keySet());
                boolean[] excluded = new boolean[labs.size()];
                for (int i = 0; i < labs.size(); i++) {
                    excluded[i] = reason(exclusions, labs.get(i), level, measurand) != null;
                }
                int retained = 0;
                for (boolean e : excluded) {
                    retained += e ? 0 : 1;
                }
                if (retained < 2) {
                    warnings.add("Level " + level + ": fewer than 2 laboratories retained; not evaluated.");
                    continue;
                }
                inputs.add(new PrecisionStudyEvaluation.LevelInput(level, byLab.values().toArray(double[][]::new), excluded));
                labsPerLevel.add(labs);
                levelNames.add(level);
            }
            if (inputs.isEmpty()) {
                out.add(new MeasurandResult(measurand, m.getValue(), List.of(), List.of(), List.of(), warnings));
                continue;
            }
            PrecisionStudyEvaluation.Result study = PrecisionStudyEvaluation.of(inputs, design.alphaStraggler(),
                    design.alphaOutlier(), design.fitRelationship());
            List<LevelResult> levels = new ArrayList<>();
            for (int j = 0; j < study.levels().size(); j++) {
                String level = levelNames.get(j);
                levels.add(level(level, design.materials().getOrDefault(level, ""), measurand,
                        study.levels().get(j).result(), labsPerLevel.get(j), inputs.get(j).cells(), exclusions));
            }
            out.add(new MeasurandResult(measurand, m.getValue(), levels, fits(study.repeatabilityFits()),
                    fits(study.reproducibilityFits()), warnings));
        }
        return new Study(design.replicates(), design.alphaStraggler(), design.alphaOutlier(), design.fitRelationship(), out);
    }

    private static LevelResult level(String level, String material, String measurand, PrecisionLevelEvaluation.Result r,
                                     List<String> labs, double[][] data, List<Exclusion> exclusions) {
        Map<Integer, List<String>> flagsOf = new LinkedHashMap<>();
        for (PrecisionLevelEvaluation.Flag f : r.flags()) {
            flagsOf.computeIfAbsent(f.cell(), c -> new ArrayList<>()).add(source(f.source()) + ": " + verdict(f.verdict()));
        }
        List<CellResult> cells = new ArrayList<>();
        for (int i = 0; i < labs.size(); i++) {
            List<Double> values = list(data[i]);
            cells.add(new CellResult(labs.get(i), values, r.cellMeans()[i], r.cellSds()[i], finite(r.mandelH()[i]),
                    finite(r.mandelK()[i]), verdict(r.verdictOf(i)), flagsOf.getOrDefault(i, List.of()),
                    r.excluded()[i], reason(exclusions, labs.get(i), level, measurand)));
        }
        List<TestResult> tests = new ArrayList<>();
        if (r.cochran() != null) {
            tests.add(test("Cochran C (largest variance)", r.cochran(), List.of(labs.get(r.cochranCell()))));
        }
        if (r.grubbs() != null) {
            int[] g = r.grubbsCells();
            tests.add(test("Grubbs single, highest mean", r.grubbs().singleHigh(), List.of(labs.get(g[3]))));
            tests.add(test("Grubbs single, lowest mean", r.grubbs().singleLow(), List.of(labs.get(g[0]))));
            if (r.grubbs().doubleHigh() != null) {
                tests.add(test("Grubbs double, two highest means", r.grubbs().doubleHigh(), List.of(labs.get(g[2]), labs.get(g[3]))));
                tests.add(test("Grubbs double, two lowest means", r.grubbs().doubleLow(), List.of(labs.get(g[0]), labs.get(g[1]))));
            }
        }
        var p = r.precision();
        return new LevelResult(level, material, labs.size(), r.retainedCells(), r.generalMean(), p.repeatabilitySd(),
                p.betweenLaboratorySd(), p.reproducibilitySd(), p.repeatabilityLimit(), p.reproducibilityLimit(),
                finite(r.hStragglerLine()), finite(r.hOutlierLine()), r.kStragglerLine(), r.kOutlierLine(), tests, cells,
                r.warnings().stream().map(StatisticsWarning::message).toList());
    }

    private static List<FitResult> fits(List<PrecisionLevelRelationship.Fit> fits) {
        List<FitResult> out = new ArrayList<>();
        for (PrecisionLevelRelationship.Fit f : fits) {
            String formula = switch (f.model()) {
                case PROPORTIONAL -> "s = b·m";
                case LINEAR -> "s = c + d·m";
                case POWER -> "lg s = c + d·lg m";
            };
            out.add(new FitResult(f.model().name(), formula, f.intercept(), f.slope(), list(f.levels()), list(f.observed()),
                    list(f.fitted()), list(f.residuals()), f.relativeResidualRms(),
                    f.warnings().stream().map(StatisticsWarning::message).toList()));
        }
        return out;
    }

    private static TestResult test(String name, ConsistencyStatistics.Test t, List<String> labs) {
        return new TestResult(name, finite(t.statistic()), finite(t.critical5()), finite(t.critical1()), verdict(t.verdict()), labs);
    }

    private static String reason(List<Exclusion> exclusions, String lab, String level, String measurand) {
        for (Exclusion e : exclusions) {
            if (e.laboratory().equals(lab) && e.level().equals(level) && e.measurand().equals(measurand)) {
                return e.reason();
            }
        }
        return null;
    }

    /** The verdict in words. */
    public static String verdict(OutlierVerdict v) {
        return switch (v) {
            case ACCEPTED -> "accepted";
            case STRAGGLER -> "straggler";
            case OUTLIER -> "outlier";
            case NOT_ASSESSED -> "not assessed";
        };
    }

    private static String source(PrecisionLevelEvaluation.FlagSource s) {
        return switch (s) {
            case MANDEL_H -> "Mandel h";
            case MANDEL_K -> "Mandel k";
            case COCHRAN -> "Cochran";
            case GRUBBS_SINGLE_HIGH, GRUBBS_SINGLE_LOW -> "Grubbs single";
            case GRUBBS_DOUBLE_HIGH, GRUBBS_DOUBLE_LOW -> "Grubbs double";
        };
    }

    private static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    private static List<Double> list(double[] x) {
        List<Double> out = new ArrayList<>();
        for (double v : x) {
            out.add(v);
        }
        return out;
    }
}
