package org.roundtable.statistics.robust;

import java.util.Arrays;
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
        double[] sorted = values.clone();
        Arrays.sort(sorted);
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
     * MAD of sorted values about the given median, in O(p): the absolute deviations below and
     * above the median form two sorted runs, merged until the middle is reached.
     */
    public static double madOfSorted(double[] sorted, double median) {
        int p = sorted.length;
        // split: left run = indices < split (deviations increase going left), right run >= split
        int split = lowerBound(sorted, median);
        int left = split - 1;
        int right = split;
        int lowRank = (p - 1) / 2;
        int highRank = p / 2;
        double lowValue = 0;
        double current = 0;
        for (int rank = 0; rank <= highRank; rank++) {
            double dl = left >= 0 ? median - sorted[left] : Double.POSITIVE_INFINITY;
            double dr = right < p ? sorted[right] - median : Double.POSITIVE_INFINITY;
            if (dl <= dr) {
                current = dl;
                left--;
            } else {
                current = dr;
                right++;
            }
            if (rank == lowRank) {
                lowValue = current;
            }
        }
        return lowValue + (current - lowValue) / 2;
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
