package org.roundtable.statistics.robust;

import org.roundtable.statistics.Checks;

/**
 * Median absolute deviation (MAD) and the scaled MAD (MADe), a robust standard deviation.
 *
 * <p>Definition: {@code MAD = median_i |x_i − median(x)|}; {@code MADe = 1.483 · MAD}.
 *
 * <p>Symbols: 1.483 ≈ 1/Φ⁻¹(0.75) = 1.482602…, which makes MADe consistent with the standard
 * deviation for normal data; ISO 13528 prints the rounded constant and so do we, so that results
 * match worked examples.
 *
 * <p>Special cases: when more than half of the values are identical MAD = MADe = 0. This class
 * returns 0 in that case; it is the caller's duty not to use a zero scale (see
 * {@link AlgorithmA}, which flags it).
 *
 * <p>References: ISO 13528:2015, Annex C (simple robust estimators: median, MADe, nIQR);
 * Hampel F.R. (1974) The influence curve and its role in robust estimation. J. Am. Stat. Assoc.
 * 69:383–393.
 */
public final class ScaledMad {

    /** Consistency factor of MADe for the normal distribution, as rounded in ISO 13528. */
    public static final double MADE_FACTOR = 1.483;

    private ScaledMad() {
    }

    /**
     * Unscaled MAD.
     *
     * @throws IllegalArgumentException if empty or a value is not finite
     */
    public static double mad(double[] values) {
        Checks.requireFinite(values, 1, "MAD");
        double[] sorted = SortedCopy.of(values);
        return madOfSorted(sorted, Median.ofSorted(sorted));
    }

    /**
     * MADe = 1.483 · MAD.
     *
     * @throws IllegalArgumentException if empty or a value is not finite
     */
    public static double madE(double[] values) {
        return MADE_FACTOR * mad(values);
    }

    /**
     * MAD of sorted values about the given median, in O(log² p): the absolute deviations below
     * and above the median form two sorted runs (read outwards from the median), and the middle
     * order statistic(s) of their union are found by binary search, without building them.
     */
    public static double madOfSorted(double[] sorted, double median) {
        int p = sorted.length;
        int split = lowerBound(sorted, median);
        int lowRank = (p - 1) / 2;
        int highRank = p / 2;
        double low = kthDeviation(sorted, median, split, lowRank);
        double high = lowRank == highRank ? low : kthDeviation(sorted, median, split, highRank);
        return low + (high - low) / 2;
    }

    /**
     * The k-th smallest (0-based) of the deviations {@code median - sorted[split-1-j]} (j &lt; split)
     * and {@code sorted[split+j] - median} (j &lt; p - split): binary search on how many come
     * from the left run.
     */
    private static double kthDeviation(double[] sorted, double median, int split, int k) {
        int leftSize = split;
        int rightSize = sorted.length - split;
        // i = number taken from the left run, k + 1 - i from the right run
        int lo = Math.max(0, k + 1 - rightSize);
        int hi = Math.min(k + 1, leftSize);
        while (lo < hi) {
            int i = (lo + hi) >>> 1;
            int j = k + 1 - i;
            // left[i] < right[j - 1] means more must come from the left run
            if (median - sorted[split - 1 - i] < sorted[split + j - 1] - median) {
                lo = i + 1;
            } else {
                hi = i;
            }
        }
        int i = lo;
        int j = k + 1 - i;
        double a = i > 0 ? median - sorted[split - i] : Double.NEGATIVE_INFINITY;
        double b = j > 0 ? sorted[split + j - 1] - median : Double.NEGATIVE_INFINITY;
        return Math.max(a, b);
    }

    private static int lowerBound(double[] sorted, double key) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] < key) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }
}
