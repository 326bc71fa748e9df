package org.roundtable.statistics.density;

import java.util.ArrayList;
import java.util.List;
import org.roundtable.statistics.Checks;
import org.roundtable.statistics.descriptive.Descriptive;
import org.roundtable.statistics.robust.QuartileRule;

/**
 * Gaussian kernel density estimate and its modes, to spot a second population of results.
 *
 * <p>Definition: {@code f(t) = (1/(p·h)) Σ φ((t − x_i)/h)}, φ the standard normal density.
 * Bandwidth by Silverman's rule of thumb {@code h = 0.9·min(s, IQR/1.34)·p^(−1/5)}, with s the
 * sample SD and IQR from Hyndman–Fan type 7 quartiles (identical to R's {@code bw.nrd0}). Modes
 * are the local maxima of f on an evenly spaced grid of {@value #DEFAULT_GRID_POINTS} points over
 * {@code [min − 3h, max + 3h]} whose height is at least {@value #DEFAULT_RELATIVE_HEIGHT} of the
 * highest maximum; each mode is refined by a parabola through the grid maximum and its
 * neighbours.
 *
 * <p>Symbols: p number of values; h bandwidth.
 *
 * <p>Special cases: following R's {@code bw.nrd0}, if IQR = 0 the SD alone is used; if the SD is
 * 0 as well (all values equal) there is no bandwidth and the methods throw. p = 1 is refused.
 * {@link #density(double)} is exact (a direct sum); the modes are found on the linearly binned
 * estimate, like R's {@code density()}, so that large rounds stay fast.
 *
 * @throws IllegalArgumentException fewer than 2 values, a non-finite value, all values equal
 *
 * <p>References: Silverman B.W. (1986) Density Estimation for Statistics and Data Analysis.
 * Chapman and Hall, eq. (3.31); AMC Technical Brief No. 4 (2001, revised 2006) Representing data
 * distributions with kernel density estimates (from memory); ISO 13528:2015 Annex (kernel
 * density plots, from memory).
 */
public final class KernelDensity {

    /** Silverman's factor 0.9. */
    public static final double SILVERMAN_FACTOR = 0.9;
    /** IQR divisor 1.34 (≈ 2Φ⁻¹(0.75)). */
    public static final double IQR_DIVISOR = 1.34;
    /** Grid points for mode finding. */
    public static final int DEFAULT_GRID_POINTS = 512;
    /** Grid margin in bandwidths beyond the data range (R's {@code cut = 3}). */
    public static final double GRID_CUT = 3;
    /** A local maximum counts as a mode when at least this share of the highest one. */
    public static final double DEFAULT_RELATIVE_HEIGHT = 0.25;

    private static final double INV_SQRT_2PI = 1 / Math.sqrt(2 * Math.PI);

    private final double[] sorted;
    private final double bandwidth;

    /**
     * A mode of the density.
     *
     * @param location       abscissa
     * @param density        f at the mode
     * @param relativeHeight density / highest mode density
     */
    public record Mode(double location, double density, double relativeHeight) {
    }

    private KernelDensity(double[] sorted, double bandwidth) {
        this.sorted = sorted;
        this.bandwidth = bandwidth;
    }

    /** Density estimate with Silverman's bandwidth. */
    public static KernelDensity of(double[] values) {
        Checks.requireFinite(values, 2, "kernel density");
        double[] s = org.roundtable.statistics.robust.SortedCopy.of(values);
        return new KernelDensity(s, silvermanBandwidthOfSorted(s));
    }

    /** Density estimate with a given bandwidth h &gt; 0. */
    public static KernelDensity of(double[] values, double bandwidth) {
        Checks.requireFinite(values, 1, "kernel density");
        Checks.requirePositive(bandwidth, "bandwidth");
        double[] s = org.roundtable.statistics.robust.SortedCopy.of(values);
        return new KernelDensity(s, bandwidth);
    }

    /** Silverman's rule of thumb {@code 0.9·min(s, IQR/1.34)·p^(−1/5)} (R {@code bw.nrd0}). */
    public static double silvermanBandwidth(double[] values) {
        Checks.requireFinite(values, 2, "Silverman bandwidth");
        double[] s = org.roundtable.statistics.robust.SortedCopy.of(values);
        return silvermanBandwidthOfSorted(s);
    }

    private static double silvermanBandwidthOfSorted(double[] sorted) {
        double sd = Descriptive.standardDeviation(sorted);
        double iqr = QuartileRule.HYNDMAN_FAN_7.quantileOfSorted(sorted, 0.75)
                - QuartileRule.HYNDMAN_FAN_7.quantileOfSorted(sorted, 0.25);
        double spread = Math.min(sd, iqr / IQR_DIVISOR);
        if (spread == 0) {
            spread = sd;
        }
        if (spread == 0) {
            throw new IllegalArgumentException("kernel density: all values are equal, no bandwidth");
        }
        return SILVERMAN_FACTOR * spread * Math.pow(sorted.length, -0.2);
    }

    /** The bandwidth h. */
    public double bandwidth() {
        return bandwidth;
    }

    /** Density f(t), summed over kernels within 40 bandwidths (the rest underflow). */
    public double density(double t) {
        double sum = 0;
        for (double x : sorted) {
            double u = (t - x) / bandwidth;
            if (Math.abs(u) < 40) {
                sum += Math.exp(-0.5 * u * u);
            }
        }
        return sum * INV_SQRT_2PI / (sorted.length * bandwidth);
    }

    /**
     * The density on an evenly spaced grid from linearly binned data: each value is split between
     * its two neighbouring grid points in proportion to proximity, and the bin weights are
     * convolved with the Gaussian kernel sampled on the grid (kernel cut at 8 bandwidths). Cost
     * O(p + G·min(G, 16h/Δ)) instead of O(p·G); the binning error is of order (Δ/h)², the
     * method of R's {@code density()} (which convolves by FFT).
     */
    private double[] binnedDensity(double lo, double step, int gridPoints) {
        double[] weights = new double[gridPoints];
        for (double x : sorted) {
            double position = (x - lo) / step;
            int left = Math.min(gridPoints - 2, Math.max(0, (int) Math.floor(position)));
            double fraction = position - left;
            weights[left] += 1 - fraction;
            weights[left + 1] += fraction;
        }
        int reach = (int) Math.min(gridPoints - 1, Math.ceil(8 * bandwidth / step));
        double[] kernel = new double[reach + 1];
        double norm = INV_SQRT_2PI / (sorted.length * bandwidth);
        for (int d = 0; d <= reach; d++) {
            double u = d * step / bandwidth;
            kernel[d] = norm * Math.exp(-0.5 * u * u);
        }
        double[] f = new double[gridPoints];
        convolve(weights, kernel, f);
        return f;
    }

    /**
     * Adds the binned weights convolved with a symmetric kernel ({@code kernel[d]} at distance d grid steps) into
     * {@code f}; empty bins are skipped, so sparse data cost little.
     */
    static void convolve(double[] weights, double[] kernel, double[] f) {
        int gridPoints = weights.length;
        int reach = kernel.length - 1;
        for (int j = 0; j < gridPoints; j++) {
            double w = weights[j];
            if (w == 0) {
                continue;
            }
            int from = Math.max(0, j - reach);
            int to = Math.min(gridPoints - 1, j + reach);
            for (int i = from; i <= to; i++) {
                f[i] += w * kernel[Math.abs(i - j)];
            }
        }
    }

    /** Modes with the default grid and relative height. */
    public List<Mode> modes() {
        return modes(DEFAULT_GRID_POINTS, DEFAULT_RELATIVE_HEIGHT);
    }

    /**
     * Local maxima of the density on a grid, at least {@code relativeHeight} of the highest, in
     * ascending order of location.
     *
     * @throws IllegalArgumentException fewer than 3 grid points or relative height outside [0, 1]
     */
    public List<Mode> modes(int gridPoints, double relativeHeight) {
        if (gridPoints < 3) {
            throw new IllegalArgumentException("grid needs at least 3 points");
        }
        if (!(relativeHeight >= 0 && relativeHeight <= 1)) {
            throw new IllegalArgumentException("relative height must be in [0, 1]");
        }
        double lo = sorted[0] - GRID_CUT * bandwidth;
        double hi = sorted[sorted.length - 1] + GRID_CUT * bandwidth;
        double step = (hi - lo) / (gridPoints - 1);
        double[] f = binnedDensity(lo, step, gridPoints);
        List<double[]> maxima = new ArrayList<>();
        double highest = 0;
        for (int i = 1; i < gridPoints - 1; i++) {
            if (f[i] > f[i - 1] && f[i] >= f[i + 1]) {
                double denom = f[i - 1] - 2 * f[i] + f[i + 1];
                double offset = denom < 0 ? 0.5 * (f[i - 1] - f[i + 1]) / denom : 0;
                double location = lo + (i + offset) * step;
                double height = f[i] - 0.25 * (f[i - 1] - f[i + 1]) * offset;
                maxima.add(new double[] {location, height});
                highest = Math.max(highest, height);
            }
        }
        List<Mode> modes = new ArrayList<>();
        for (double[] m : maxima) {
            if (m[1] >= relativeHeight * highest) {
                modes.add(new Mode(m[0], m[1], m[1] / highest));
            }
        }
        return List.copyOf(modes);
    }
}
