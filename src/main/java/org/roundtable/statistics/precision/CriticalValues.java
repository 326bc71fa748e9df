package org.roundtable.statistics.precision;

import org.hipparchus.distribution.continuous.FDistribution;
import org.hipparchus.distribution.continuous.TDistribution;

/**
 * Critical values of the ISO 5725-2 consistency and outlier tests, computed from the F and
 * Student t distributions (Hipparchus) instead of copied tables.
 *
 * <p>Definitions (α significance level, p laboratories, n replicates per cell):
 * <ul>
 * <li>Cochran: {@code C_crit = 1/(1 + (p − 1)/F)}, F the upper α/p quantile of
 * F(n − 1, (p − 1)(n − 1));</li>
 * <li>Grubbs (single): {@code G_crit = ((p − 1)/√p)·sqrt(t²/(p − 2 + t²))}, t the upper α/(2p)
 * quantile of Student t with p − 2 degrees of freedom (the convention that reproduces the ISO
 * 5725-2 table);</li>
 * <li>Mandel h: {@code h_crit = (p − 1)·t/sqrt(p·(p − 2 + t²))}, t the two-sided α quantile
 * (upper α/2) with p − 2 degrees of freedom;</li>
 * <li>Mandel k: {@code k_crit = sqrt(p/(1 + (p − 1)/F))}, F the upper α quantile of
 * F(n − 1, (p − 1)(n − 1)).</li>
 * </ul>
 *
 * <p>Special cases: p ≥ 3 (Grubbs, h) or p ≥ 2 (Cochran, k) and n ≥ 2 are required.
 *
 * @throws IllegalArgumentException (all methods) α not in (0, 1), p or n too small
 *
 * <p>References: ISO 5725-2:1994, 7.3 and Tables 4 to 6 (numbering from memory); ASTM E691
 * (h, k); Grubbs F.E. (1950) Ann. Math. Stat. 21:27–58; Eisenhart C., Hastay M.W., Wallis W.A.
 * (1947) Techniques of Statistical Analysis, McGraw-Hill (Cochran).
 */
public final class CriticalValues {

    private CriticalValues() {
    }

    /** Cochran's C critical value. */
    public static double cochran(double alpha, int laboratories, int replicates) {
        check(alpha, laboratories, 2, replicates);
        int df1 = replicates - 1;
        int df2 = (laboratories - 1) * (replicates - 1);
        double f = new FDistribution(df1, df2).inverseCumulativeProbability(1 - alpha / laboratories);
        return 1 / (1 + (laboratories - 1) / f);
    }

    /** Grubbs single-outlier critical value. */
    public static double grubbs(double alpha, int laboratories) {
        check(alpha, laboratories, 3, 2);
        int p = laboratories;
        double t = new TDistribution(p - 2).inverseCumulativeProbability(1 - alpha / (2.0 * p));
        return (p - 1) / Math.sqrt(p) * Math.sqrt(t * t / (p - 2 + t * t));
    }

    /** Mandel's h critical value. */
    public static double mandelH(double alpha, int laboratories) {
        check(alpha, laboratories, 3, 2);
        int p = laboratories;
        double t = new TDistribution(p - 2).inverseCumulativeProbability(1 - alpha / 2);
        return (p - 1) * t / Math.sqrt(p * (p - 2 + t * t));
    }

    /** Mandel's k critical value. */
    public static double mandelK(double alpha, int laboratories, int replicates) {
        check(alpha, laboratories, 2, replicates);
        int df1 = replicates - 1;
        int df2 = (laboratories - 1) * (replicates - 1);
        double f = new FDistribution(df1, df2).inverseCumulativeProbability(1 - alpha);
        return Math.sqrt(laboratories / (1 + (laboratories - 1) / f));
    }

    private static void check(double alpha, int p, int minP, int n) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must be in (0, 1), got " + alpha);
        }
        if (p < minP) {
            throw new IllegalArgumentException("needs at least " + minP + " laboratories, got " + p);
        }
        if (n < 2) {
            throw new IllegalArgumentException("needs at least 2 replicates, got " + n);
        }
    }
}
