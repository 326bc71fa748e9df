package org.roundtable.statistics.precision;

import java.util.Arrays;
import org.roundtable.statistics.Checks;

/**
 * ISO 5725-2 consistency and outlier statistics of cells: Mandel's h and k, Cochran's C,
 * Grubbs' single and double tests.
 *
 * <p>Definitions (p cells with means ȳ_i and SDs s_i, equal n):
 * <ul>
 * <li>Mandel h: {@code h_i = (ȳ_i − ȳ)/sqrt(Σ(ȳ_i − ȳ)²/(p − 1))}, ȳ the unweighted mean of the
 * cell means;</li>
 * <li>Mandel k: {@code k_i = s_i·√p/sqrt(Σs_i²)};</li>
 * <li>Cochran: {@code C = s_max²/Σs_i²} (upper tail only);</li>
 * <li>Grubbs single: {@code G_p = (x_max − x̄)/s}, {@code G_1 = (x̄ − x_min)/s} with s the SD
 * (divisor p − 1) of the values tested (normally the cell means);</li>
 * <li>Grubbs double: {@code G = s²_{p−1,p}/s²_0} for the two largest and
 * {@code s²_{1,2}/s²_0} for the two smallest, with {@code s²_0 = Σ(x_i − x̄)²} and the numerator
 * the same sum after removing the two values; <em>small</em> values are significant. Critical
 * values from {@link CriticalValues#grubbsDouble(double, int)} (a seeded simulation, at 1 % and
 * 5 % for 4 ≤ p ≤ 40); at other levels or sizes the verdict is
 * {@link OutlierVerdict#NOT_ASSESSED}.</li>
 * </ul>
 *
 * <p>The straggler and outlier levels default to 5 % and 1 % (ISO 5725-2:1994, 7.3.2); the
 * overloads taking two levels put the straggler level's critical value in
 * {@link Test#critical5()} and the outlier level's in {@link Test#critical1()}.
 *
 * <p>Special cases: zero spread of the means (h, Grubbs) or of the SDs (k, Cochran) makes the
 * statistic undefined: the methods throw. Grubbs double needs p ≥ 4.
 *
 * @throws IllegalArgumentException too few cells, non-finite values, or zero spread
 *
 * <p>References: ISO 5725-2:1994, 7.3.1 (Mandel h, k), 7.3.3 (Cochran), 7.3.4 (Grubbs), clause
 * numbers from memory; Mandel J. (1991) Evaluation and control of measurements, Dekker;
 * Grubbs F.E. (1950) Ann. Math. Stat. 21:27–58 (double test); Grubbs F.E. (1969)
 * Technometrics 11:1–21.
 */
public final class ConsistencyStatistics {

    /** Significance levels of ISO 5725-2: 5 % (straggler) and 1 % (outlier). */
    public static final double ALPHA_STRAGGLER = 0.05;
    /** 1 % level (outlier). */
    public static final double ALPHA_OUTLIER = 0.01;

    /**
     * A test result with its critical values and verdict.
     *
     * @param critical5 critical value at the straggler level (5 % unless chosen otherwise); NaN
     *                  when not available
     * @param critical1 critical value at the outlier level (1 % unless chosen otherwise); NaN
     *                  when not available
     */
    public record Test(double statistic, double critical5, double critical1, OutlierVerdict verdict) {
    }

    /**
     * Grubbs' tests on the values: single high, single low, double high (two largest), double low
     * (two smallest). The double tests are null when fewer than 4 values are tested.
     */
    public record Grubbs(Test singleHigh, Test singleLow, Test doubleHigh, Test doubleLow) {
    }

    private ConsistencyStatistics() {
    }

    /** Mandel's h for each cell mean. */
    public static double[] mandelH(double[] cellMeans) {
        Checks.requireFinite(cellMeans, 3, "Mandel h");
        double mean = org.roundtable.statistics.descriptive.Descriptive.mean(cellMeans);
        double sd = org.roundtable.statistics.descriptive.Descriptive.standardDeviation(cellMeans);
        if (sd == 0) {
            throw new IllegalArgumentException("Mandel h: all cell means are equal");
        }
        double[] h = new double[cellMeans.length];
        for (int i = 0; i < h.length; i++) {
            h[i] = (cellMeans[i] - mean) / sd;
        }
        return h;
    }

    /** Mandel's k for each cell SD. */
    public static double[] mandelK(double[] cellSds) {
        Checks.requireFinite(cellSds, 2, "Mandel k");
        double sumSquares = 0;
        for (double s : cellSds) {
            sumSquares += s * s;
        }
        if (sumSquares == 0) {
            throw new IllegalArgumentException("Mandel k: all cell SDs are zero");
        }
        double[] k = new double[cellSds.length];
        for (int i = 0; i < k.length; i++) {
            k[i] = cellSds[i] * Math.sqrt(cellSds.length / sumSquares);
        }
        return k;
    }

    /** Cochran's C of the cell SDs (or duplicate ranges) with n replicates per cell. */
    public static Test cochran(double[] cellSds, int replicates) {
        return cochran(cellSds, replicates, ALPHA_STRAGGLER, ALPHA_OUTLIER);
    }

    /** Cochran's C with chosen straggler and outlier levels. */
    public static Test cochran(double[] cellSds, int replicates, double alphaStraggler, double alphaOutlier) {
        Checks.requireFinite(cellSds, 2, "Cochran");
        double sumSquares = 0;
        double max = 0;
        for (double s : cellSds) {
            sumSquares += s * s;
            max = Math.max(max, s * s);
        }
        if (sumSquares == 0) {
            throw new IllegalArgumentException("Cochran: all cell SDs are zero");
        }
        double c = max / sumSquares;
        double c5 = CriticalValues.cochran(alphaStraggler, cellSds.length, replicates);
        double c1 = CriticalValues.cochran(alphaOutlier, cellSds.length, replicates);
        return new Test(c, c5, c1, OutlierVerdict.upperTail(c, c5, c1));
    }

    /** Grubbs' single and double tests on values (normally cell means). */
    public static Grubbs grubbs(double[] values) {
        return grubbs(values, ALPHA_STRAGGLER, ALPHA_OUTLIER);
    }

    /** Grubbs' single and double tests with chosen straggler and outlier levels. */
    public static Grubbs grubbs(double[] values, double alphaStraggler, double alphaOutlier) {
        Checks.requireFinite(values, 3, "Grubbs");
        double[] x = values.clone();
        Arrays.sort(x);
        int p = x.length;
        double mean = org.roundtable.statistics.descriptive.Descriptive.mean(x);
        double sd = org.roundtable.statistics.descriptive.Descriptive.standardDeviation(x);
        if (sd == 0) {
            throw new IllegalArgumentException("Grubbs: all values are equal");
        }
        double g5 = CriticalValues.grubbs(alphaStraggler, p);
        double g1 = CriticalValues.grubbs(alphaOutlier, p);
        double high = (x[p - 1] - mean) / sd;
        double low = (mean - x[0]) / sd;
        Test doubleHigh = null;
        Test doubleLow = null;
        if (p >= 4) {
            double s0 = org.roundtable.statistics.descriptive.Descriptive.sumOfSquaredDeviations(x, mean);
            double[] withoutHigh = Arrays.copyOfRange(x, 0, p - 2);
            double[] withoutLow = Arrays.copyOfRange(x, 2, p);
            double d5 = CriticalValues.hasGrubbsDouble(alphaStraggler, p)
                    ? CriticalValues.grubbsDouble(alphaStraggler, p) : Double.NaN;
            double d1 = CriticalValues.hasGrubbsDouble(alphaOutlier, p)
                    ? CriticalValues.grubbsDouble(alphaOutlier, p) : Double.NaN;
            doubleHigh = lowerTailTest(sumSquares(withoutHigh) / s0, d5, d1);
            doubleLow = lowerTailTest(sumSquares(withoutLow) / s0, d5, d1);
        }
        return new Grubbs(new Test(high, g5, g1, OutlierVerdict.upperTail(high, g5, g1)),
                new Test(low, g5, g1, OutlierVerdict.upperTail(low, g5, g1)), doubleHigh, doubleLow);
    }

    private static Test lowerTailTest(double statistic, double critical5, double critical1) {
        OutlierVerdict v = Double.isNaN(critical5) || Double.isNaN(critical1)
                ? OutlierVerdict.NOT_ASSESSED : OutlierVerdict.lowerTail(statistic, critical5, critical1);
        return new Test(statistic, critical5, critical1, v);
    }

    private static double sumSquares(double[] x) {
        double m = org.roundtable.statistics.descriptive.Descriptive.mean(x);
        return org.roundtable.statistics.descriptive.Descriptive.sumOfSquaredDeviations(x, m);
    }
}
