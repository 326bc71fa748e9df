package org.roundtable.statistics.precision;

import java.util.ArrayList;
import java.util.List;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;
import org.roundtable.statistics.descriptive.Descriptive;

/**
 * The ISO 5725-2 evaluation of one measurand at one level of a precision experiment: cell
 * statistics, consistency statistics, outlier tests and the precision values.
 *
 * <p>Procedure (p cells, one per laboratory, each of n replicate results):
 * <ol>
 * <li>cell means ȳ_i and SDs s_i (divisor n − 1) of every cell;</li>
 * <li>Mandel's h and k of <em>all</em> cells, with their indicator lines at the straggler and
 * outlier levels (the graphical consistency check, 7.3.1);</li>
 * <li>Cochran's C (7.3.3) and Grubbs' single and double tests on the cell means (7.3.4) on the
 * <em>retained</em> cells, so that a coordinator who excludes a cell and evaluates again sees the
 * tests repeated on the rest; as in 7.3.4, the double test raises flags only when neither single
 * test finds an outlier (its statistics are reported either way);</li>
 * <li>s_r, s_L, s_R, r and R from the retained cells ({@link PrecisionExperiment}).</li>
 * </ol>
 * Nothing is excluded here: stragglers and outliers are {@link Flag flagged}; which cells to
 * exclude is the caller's (the coordinator's) decision, passed in as {@code excluded}.
 *
 * <p>Symbols: general mean m = mean of the retained cell means (equal n).
 *
 * <p>Special cases: all cell means equal (h undefined) or all cell SDs zero (k, C undefined):
 * those statistics are NaN and a warning ({@code zero-spread-means}, {@code zero-spread-sds}) is
 * attached. Fewer than 3 retained cells: no Grubbs test ({@code too-few-cells}); fewer than 4: no
 * Grubbs double test. Grubbs double critical values exist only at 1 % and 5 % and for 4 ≤ p ≤ 40;
 * otherwise its verdict is {@link OutlierVerdict#NOT_ASSESSED}.
 *
 * @throws IllegalArgumentException fewer than 2 retained cells, unequal replicate numbers, a
 *                                  cell with fewer than 2 results, non-finite values, or levels
 *                                  not in (0, 1) with the straggler level above the outlier level
 *
 * <p>References: ISO 5725-2:1994, Accuracy (trueness and precision) of measurement methods and
 * results — Part 2: Basic method for the determination of repeatability and reproducibility of a
 * standard measurement method, clause 7.3 (consistency and outliers, 7.3.1 to 7.3.4) and 7.4
 * (general mean and variances); clause numbers from memory.
 */
public final class PrecisionLevelEvaluation {

    /** The test that raised a flag. */
    public enum FlagSource {
        MANDEL_H,
        MANDEL_K,
        COCHRAN,
        GRUBBS_SINGLE_HIGH,
        GRUBBS_SINGLE_LOW,
        GRUBBS_DOUBLE_HIGH,
        GRUBBS_DOUBLE_LOW
    }

    /**
     * A straggler or outlier indication for a cell.
     *
     * @param cell    index of the cell in the input
     * @param source  which statistic
     * @param verdict straggler or outlier
     */
    public record Flag(int cell, FlagSource source, OutlierVerdict verdict) {
    }

    /**
     * The evaluation of one level.
     *
     * @param cellMeans      ȳ_i, all cells
     * @param cellSds        s_i, all cells
     * @param mandelH        h_i, all cells (NaN when undefined)
     * @param mandelK        k_i, all cells (NaN when undefined)
     * @param hStragglerLine h indicator at the straggler level (±)
     * @param hOutlierLine   h indicator at the outlier level (±)
     * @param kStragglerLine k indicator at the straggler level
     * @param kOutlierLine   k indicator at the outlier level
     * @param cochran        Cochran's C on the retained cells (null when undefined)
     * @param cochranCell    index of the cell with the largest variance (−1 when no test)
     * @param grubbs         Grubbs' tests on the retained cell means (null when fewer than 3)
     * @param grubbsCells    indices {lowest, second lowest, second highest, highest} of the
     *                       retained cell means (empty when no test)
     * @param flags          stragglers and outliers
     * @param retainedCells  p used for the precision values
     * @param generalMean    m
     * @param precision      s_r, s_L, s_R, r, R of the retained cells
     */
    public record Result(int replicates, double[] cellMeans, double[] cellSds, double[] mandelH,
            double[] mandelK, double hStragglerLine, double hOutlierLine, double kStragglerLine,
            double kOutlierLine, ConsistencyStatistics.Test cochran, int cochranCell,
            ConsistencyStatistics.Grubbs grubbs, int[] grubbsCells, List<Flag> flags,
            boolean[] excluded, int retainedCells, double generalMean, PrecisionExperiment.Result precision,
            List<StatisticsWarning> warnings) {

        public Result {
            cellMeans = cellMeans.clone();
            cellSds = cellSds.clone();
            mandelH = mandelH.clone();
            mandelK = mandelK.clone();
            grubbsCells = grubbsCells.clone();
            excluded = excluded.clone();
            flags = List.copyOf(flags);
            warnings = List.copyOf(warnings);
        }

        /** The strongest verdict among the flags of a cell. */
        public OutlierVerdict verdictOf(int cell) {
            OutlierVerdict v = OutlierVerdict.ACCEPTED;
            for (Flag f : flags) {
                if (f.cell() == cell && (f.verdict() == OutlierVerdict.OUTLIER || v == OutlierVerdict.ACCEPTED)) {
                    v = f.verdict();
                }
            }
            return v;
        }
    }

    private PrecisionLevelEvaluation() {
    }

    /** Evaluates with the ISO default levels (5 % straggler, 1 % outlier) and nothing excluded. */
    public static Result of(double[][] cells) {
        return of(cells, new boolean[cells.length], ConsistencyStatistics.ALPHA_STRAGGLER,
                ConsistencyStatistics.ALPHA_OUTLIER);
    }

    /**
     * Evaluates one level.
     *
     * @param cells          one array of replicate results per laboratory
     * @param excluded       cells the coordinator decided to exclude (same length as cells)
     * @param alphaStraggler straggler level (0.05 by default)
     * @param alphaOutlier   outlier level (0.01 by default)
     */
    public static Result of(double[][] cells, boolean[] excluded, double alphaStraggler, double alphaOutlier) {
        if (cells == null || excluded == null || cells.length != excluded.length) {
            throw new IllegalArgumentException("precision level: one exclusion mark per cell is needed");
        }
        if (!(alphaOutlier > 0 && alphaOutlier < alphaStraggler && alphaStraggler < 1)) {
            throw new IllegalArgumentException("precision level: the outlier level must be below the straggler level, both in (0, 1)");
        }
        int p = cells.length;
        int n = -1;
        double[] means = new double[p];
        double[] sds = new double[p];
        for (int i = 0; i < p; i++) {
            Checks.requireFinite(cells[i], 2, "precision level cell " + (i + 1));
            if (n >= 0 && cells[i].length != n) {
                throw new IllegalArgumentException("precision level: cell " + (i + 1) + " has "
                        + cells[i].length + " results, the others " + n);
            }
            n = cells[i].length;
            means[i] = Descriptive.mean(cells[i]);
            sds[i] = Descriptive.standardDeviation(cells[i]);
        }
        List<Integer> kept = new ArrayList<>();
        for (int i = 0; i < p; i++) {
            if (!excluded[i]) {
                kept.add(i);
            }
        }
        if (kept.size() < 2) {
            throw new IllegalArgumentException("precision level: needs at least 2 retained laboratories, got " + kept.size());
        }
        List<StatisticsWarning> warnings = new ArrayList<>();
        List<Flag> flags = new ArrayList<>();

        double[] h = nan(p);
        double hS = Double.NaN;
        double hO = Double.NaN;
        if (p >= 3) {
            hS = CriticalValues.mandelH(alphaStraggler, p);
            hO = CriticalValues.mandelH(alphaOutlier, p);
            if (Descriptive.standardDeviation(means) == 0) {
                warnings.add(new StatisticsWarning("zero-spread-means", "all cell means are equal: h is not defined"));
            } else {
                h = ConsistencyStatistics.mandelH(means);
                for (int i = 0; i < p; i++) {
                    OutlierVerdict v = OutlierVerdict.upperTail(Math.abs(h[i]), hS, hO);
                    if (v.flagged()) {
                        flags.add(new Flag(i, FlagSource.MANDEL_H, v));
                    }
                }
            }
        }
        double[] k = nan(p);
        double kS = CriticalValues.mandelK(alphaStraggler, p, n);
        double kO = CriticalValues.mandelK(alphaOutlier, p, n);
        boolean allSdsZero = true;
        for (double s : sds) {
            allSdsZero &= s == 0;
        }
        if (allSdsZero) {
            warnings.add(new StatisticsWarning("zero-spread-sds", "all cell standard deviations are zero: k and C are not defined"));
        } else {
            k = ConsistencyStatistics.mandelK(sds);
            for (int i = 0; i < p; i++) {
                OutlierVerdict v = OutlierVerdict.upperTail(k[i], kS, kO);
                if (v.flagged()) {
                    flags.add(new Flag(i, FlagSource.MANDEL_K, v));
                }
            }
        }

        double[] keptMeans = new double[kept.size()];
        double[] keptSds = new double[kept.size()];
        double[][] keptCells = new double[kept.size()][];
        for (int j = 0; j < kept.size(); j++) {
            keptMeans[j] = means[kept.get(j)];
            keptSds[j] = sds[kept.get(j)];
            keptCells[j] = cells[kept.get(j)];
        }

        ConsistencyStatistics.Test cochran = null;
        int cochranCell = -1;
        double keptSumSquares = 0;
        for (double s : keptSds) {
            keptSumSquares += s * s;
        }
        if (keptSumSquares > 0) {
            cochran = ConsistencyStatistics.cochran(keptSds, n, alphaStraggler, alphaOutlier);
            int largest = 0;
            for (int j = 1; j < keptSds.length; j++) {
                if (keptSds[j] > keptSds[largest]) {
                    largest = j;
                }
            }
            cochranCell = kept.get(largest);
            if (cochran.verdict().flagged()) {
                flags.add(new Flag(cochranCell, FlagSource.COCHRAN, cochran.verdict()));
            }
        } else if (!allSdsZero) {
            warnings.add(new StatisticsWarning("zero-spread-sds", "all retained cell standard deviations are zero: C is not defined"));
        }

        ConsistencyStatistics.Grubbs grubbs = null;
        int[] grubbsCells = new int[0];
        if (kept.size() < 3) {
            warnings.add(new StatisticsWarning("too-few-cells", "fewer than 3 retained laboratories: no Grubbs test"));
        } else if (Descriptive.standardDeviation(keptMeans) == 0) {
            warnings.add(new StatisticsWarning("zero-spread-means", "all retained cell means are equal: no Grubbs test"));
        } else {
            grubbs = ConsistencyStatistics.grubbs(keptMeans, alphaStraggler, alphaOutlier);
            Integer[] order = new Integer[kept.size()];
            for (int j = 0; j < order.length; j++) {
                order[j] = j;
            }
            java.util.Arrays.sort(order, (a, b) -> Double.compare(keptMeans[a], keptMeans[b]));
            int q = order.length;
            grubbsCells = new int[] {kept.get(order[0]), kept.get(order[1]), kept.get(order[q - 2]), kept.get(order[q - 1])};
            addFlag(flags, grubbsCells[3], FlagSource.GRUBBS_SINGLE_HIGH, grubbs.singleHigh());
            addFlag(flags, grubbsCells[0], FlagSource.GRUBBS_SINGLE_LOW, grubbs.singleLow());
            boolean singleOutlier = grubbs.singleHigh().verdict() == OutlierVerdict.OUTLIER
                    || grubbs.singleLow().verdict() == OutlierVerdict.OUTLIER;
            if (grubbs.doubleHigh() != null && !singleOutlier) {
                addFlag(flags, grubbsCells[2], FlagSource.GRUBBS_DOUBLE_HIGH, grubbs.doubleHigh());
                addFlag(flags, grubbsCells[3], FlagSource.GRUBBS_DOUBLE_HIGH, grubbs.doubleHigh());
                addFlag(flags, grubbsCells[0], FlagSource.GRUBBS_DOUBLE_LOW, grubbs.doubleLow());
                addFlag(flags, grubbsCells[1], FlagSource.GRUBBS_DOUBLE_LOW, grubbs.doubleLow());
            } else if (grubbs.doubleHigh() == null) {
                warnings.add(new StatisticsWarning("no-grubbs-double", "fewer than 4 retained laboratories: no Grubbs double test"));
            }
            if (grubbs.doubleHigh() != null && grubbs.doubleHigh().verdict() == OutlierVerdict.NOT_ASSESSED) {
                warnings.add(new StatisticsWarning("grubbs-double-not-assessed", "no Grubbs double critical value for these"
                        + " levels and " + kept.size() + " laboratories (tabulated: 1 % and 5 %, 4 to 40)"));
            }
        }

        PrecisionExperiment.Result precision = PrecisionExperiment.of(keptCells);
        warnings.addAll(precision.warnings());
        return new Result(n, means, sds, h, k, hS, hO, kS, kO, cochran, cochranCell, grubbs, grubbsCells, flags,
                excluded, kept.size(), Descriptive.mean(keptMeans), precision, warnings);
    }

    private static void addFlag(List<Flag> flags, int cell, FlagSource source, ConsistencyStatistics.Test test) {
        if (test.verdict().flagged()) {
            flags.add(new Flag(cell, source, test.verdict()));
        }
    }

    private static double[] nan(int p) {
        double[] x = new double[p];
        java.util.Arrays.fill(x, Double.NaN);
        return x;
    }
}
