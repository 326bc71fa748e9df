package org.roundtable.statistics.precision;

import java.util.ArrayList;
import java.util.List;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.StatisticsWarning;

/**
 * Fits the relationship between a precision standard deviation (s_r or s_R) and the level m of
 * the material, over the levels of a precision experiment.
 *
 * <p>Definitions (q levels with general means m_j and standard deviations s_j):
 * <ul>
 * <li>{@link Model#PROPORTIONAL} {@code s = b·m}: weighted least squares with weights
 * {@code W_j = 1/ŝ_j²}, which for this model gives {@code b = (1/q)·Σ s_j/m_j};</li>
 * <li>{@link Model#LINEAR} {@code s = c + d·m}: weighted least squares with weights
 * {@code W_j = 1/ŝ_j²}, started from {@code W_j = 1/s_j²} and iterated with the fitted values
 * until c and d change by less than 1e-12 relative (at most 100 steps);</li>
 * <li>{@link Model#POWER} {@code lg s = c + d·lg m} (so {@code s = 10^c·m^d}): ordinary least
 * squares on the decimal logarithms.</li>
 * </ul>
 * Residuals are {@code s_j − ŝ_j}; the fits are compared by the root mean square of the relative
 * residuals {@code (s_j − ŝ_j)/ŝ_j}.
 *
 * <p>Special cases: proportional needs q ≥ 2 and every m_j &gt; 0; linear and power need q ≥ 3
 * (one residual degree of freedom) and distinct levels; power needs every m_j &gt; 0 and
 * s_j &gt; 0; linear needs every s_j &gt; 0 for its starting weights. A linear fit whose fitted
 * value is ≤ 0 at a level carries the warning {@code non-positive-fitted-sd}; an iteration that
 * does not settle carries {@code not-converged}.
 *
 * @throws IllegalArgumentException too few levels, non-finite values, or a condition above
 *
 * <p>References: ISO 5725-2:1994, 7.5 (functional relationship between precision values and the
 * mean level m, models I to III and the weighted regression of 7.5.4–7.5.8; clause numbers and
 * the iteration rule from memory: the standard stops after its second step, we iterate to
 * convergence).
 */
public final class PrecisionLevelRelationship {

    /** The three relationships of ISO 5725-2, 7.5. */
    public enum Model {
        /** {@code s = b·m}. */
        PROPORTIONAL,
        /** {@code s = c + d·m}. */
        LINEAR,
        /** {@code lg s = c + d·lg m}. */
        POWER
    }

    /**
     * One fitted relationship.
     *
     * @param model       which relationship
     * @param intercept   c (0 for proportional; for power, c of {@code lg s = c + d·lg m})
     * @param slope       b (proportional), d (linear, power)
     * @param levels      m_j as given
     * @param observed    s_j as given
     * @param fitted      ŝ_j
     * @param residuals   s_j − ŝ_j
     * @param relativeResidualRms sqrt(Σ((s_j − ŝ_j)/ŝ_j)²/q)
     * @param iterations  weighting steps (linear), else 1
     */
    public record Fit(Model model, double intercept, double slope, double[] levels, double[] observed,
            double[] fitted, double[] residuals, double relativeResidualRms, int iterations,
            List<StatisticsWarning> warnings) {

        public Fit {
            levels = levels.clone();
            observed = observed.clone();
            fitted = fitted.clone();
            residuals = residuals.clone();
            warnings = List.copyOf(warnings);
        }

        /** ŝ at level m. */
        public double predict(double m) {
            return switch (model) {
                case PROPORTIONAL -> slope * m;
                case LINEAR -> intercept + slope * m;
                case POWER -> Math.pow(10, intercept) * Math.pow(m, slope);
            };
        }
    }

    private static final int MAX_ITERATIONS = 100;
    private static final double TOLERANCE = 1e-12;

    private PrecisionLevelRelationship() {
    }

    /** Fits one model. */
    public static Fit fit(Model model, double[] levels, double[] sds) {
        Checks.requireFinite(levels, model == Model.PROPORTIONAL ? 2 : 3, "precision-level relationship levels");
        Checks.requireFinite(sds, levels.length, "precision-level relationship standard deviations");
        if (sds.length != levels.length) {
            throw new IllegalArgumentException("precision-level relationship: " + levels.length
                    + " levels but " + sds.length + " standard deviations");
        }
        return switch (model) {
            case PROPORTIONAL -> proportional(levels, sds);
            case LINEAR -> linear(levels, sds);
            case POWER -> power(levels, sds);
        };
    }

    /** Fits every model the data allow (proportional from 2 levels, the others from 3). */
    public static List<Fit> fitAll(double[] levels, double[] sds) {
        List<Fit> fits = new ArrayList<>();
        for (Model m : Model.values()) {
            try {
                fits.add(fit(m, levels, sds));
            } catch (IllegalArgumentException notApplicable) {
                // a model the data cannot support is left out; callers list what was fitted
            }
        }
        return fits;
    }

    private static Fit proportional(double[] m, double[] s) {
        requirePositive(m, "levels");
        double sum = 0;
        for (int j = 0; j < m.length; j++) {
            sum += s[j] / m[j];
        }
        double b = sum / m.length;
        double[] fitted = new double[m.length];
        for (int j = 0; j < m.length; j++) {
            fitted[j] = b * m[j];
        }
        return finish(Model.PROPORTIONAL, 0, b, m, s, fitted, 1, new ArrayList<>());
    }

    private static Fit linear(double[] m, double[] s) {
        requirePositive(s, "standard deviations");
        requireDistinct(m);
        double[] w = new double[m.length];
        for (int j = 0; j < m.length; j++) {
            w[j] = 1 / (s[j] * s[j]);
        }
        double c = 0;
        double d = 0;
        int iterations = 0;
        List<StatisticsWarning> warnings = new ArrayList<>();
        boolean converged = false;
        while (iterations < MAX_ITERATIONS) {
            iterations++;
            double[] cd = weightedLine(m, s, w);
            // change of the line over the range of the levels, relative to its size there
            double scale = maxAbs(m);
            boolean settled = iterations > 1 && Math.abs(cd[0] - c) + Math.abs(cd[1] - d) * scale
                    <= TOLERANCE * (Math.abs(cd[0]) + Math.abs(cd[1]) * scale);
            c = cd[0];
            d = cd[1];
            if (settled) {
                converged = true;
                break;
            }
            boolean positive = true;
            for (int j = 0; j < m.length; j++) {
                double f = c + d * m[j];
                positive &= f > 0;
                w[j] = f > 0 ? 1 / (f * f) : w[j];
            }
            if (!positive) {
                break;
            }
        }
        double[] fitted = new double[m.length];
        for (int j = 0; j < m.length; j++) {
            fitted[j] = c + d * m[j];
            if (fitted[j] <= 0 && warnings.isEmpty()) {
                warnings.add(new StatisticsWarning("non-positive-fitted-sd",
                        "the fitted line gives a standard deviation of zero or less within the levels"));
            }
        }
        if (!converged && warnings.isEmpty()) {
            warnings.add(new StatisticsWarning("not-converged",
                    "the weighted fit did not settle within " + MAX_ITERATIONS + " steps"));
        }
        return finish(Model.LINEAR, c, d, m, s, fitted, iterations, warnings);
    }

    private static Fit power(double[] m, double[] s) {
        requirePositive(m, "levels");
        requirePositive(s, "standard deviations");
        requireDistinct(m);
        double[] x = new double[m.length];
        double[] y = new double[m.length];
        double[] w = new double[m.length];
        for (int j = 0; j < m.length; j++) {
            x[j] = Math.log10(m[j]);
            y[j] = Math.log10(s[j]);
            w[j] = 1;
        }
        double[] cd = weightedLine(x, y, w);
        double[] fitted = new double[m.length];
        for (int j = 0; j < m.length; j++) {
            fitted[j] = Math.pow(10, cd[0] + cd[1] * x[j]);
        }
        return finish(Model.POWER, cd[0], cd[1], m, s, fitted, 1, new ArrayList<>());
    }

    /** Weighted least-squares line {intercept, slope}, centred on the weighted mean of x. */
    private static double[] weightedLine(double[] x, double[] y, double[] w) {
        double sw = 0;
        double swx = 0;
        double swy = 0;
        for (int j = 0; j < x.length; j++) {
            sw += w[j];
            swx += w[j] * x[j];
            swy += w[j] * y[j];
        }
        double xm = swx / sw;
        double ym = swy / sw;
        double sxx = 0;
        double sxy = 0;
        for (int j = 0; j < x.length; j++) {
            sxx += w[j] * (x[j] - xm) * (x[j] - xm);
            sxy += w[j] * (x[j] - xm) * (y[j] - ym);
        }
        double slope = sxy / sxx;
        return new double[] {ym - slope * xm, slope};
    }

    private static Fit finish(Model model, double c, double d, double[] m, double[] s, double[] fitted,
            int iterations, List<StatisticsWarning> warnings) {
        double[] residuals = new double[m.length];
        double sum = 0;
        for (int j = 0; j < m.length; j++) {
            residuals[j] = s[j] - fitted[j];
            double rel = fitted[j] == 0 ? Double.NaN : residuals[j] / fitted[j];
            sum += rel * rel;
        }
        return new Fit(model, c, d, m, s, fitted, residuals, Math.sqrt(sum / m.length), iterations, warnings);
    }

    private static double maxAbs(double[] x) {
        double max = 0;
        for (double v : x) {
            max = Math.max(max, Math.abs(v));
        }
        return max;
    }

    private static void requirePositive(double[] x, String what) {
        for (double v : x) {
            if (!(v > 0)) {
                throw new IllegalArgumentException("precision-level relationship: " + what + " must be positive");
            }
        }
    }

    private static void requireDistinct(double[] m) {
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        for (double v : m) {
            min = Math.min(min, v);
            max = Math.max(max, v);
        }
        if (min == max) {
            throw new IllegalArgumentException("precision-level relationship: the levels must differ");
        }
    }
}
