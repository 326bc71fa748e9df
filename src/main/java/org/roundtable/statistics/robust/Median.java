package org.roundtable.statistics.robust;

import org.roundtable.statistics.Checks;

/**
 * Median, the outlier-resistant estimate of location (50 % breakdown point).
 *
 * <p>Definition: the middle order statistic {@code x_((p+1)/2)} for odd p; for even p the mean
 * of the two middle order statistics {@code (x_(p/2) + x_(p/2+1))/2}.
 *
 * <p>Symbols: p number of values; {@code x_(k)} the k-th smallest value.
 *
 * <p>Special cases: p = 1 returns the value. NaN or infinite values are rejected (a NaN has no
 * place in an ordering).
 *
 * <p>References: ISO 13528:2015, Statistical methods for use in proficiency testing by
 * interlaboratory comparison, Annex C (simple robust estimators).
 */
public final class Median {

    private Median() {
    }

    /**
     * Median of the values (the array is not modified).
     *
     * @throws IllegalArgumentException if empty or a value is not finite
     */
    public static double of(double[] values) {
        Checks.requireFinite(values, 1, "median");
        double[] sorted = SortedCopy.of(values);
        return ofSorted(sorted);
    }

    /**
     * Median of values already sorted in ascending order (not checked).
     */
    public static double ofSorted(double[] sorted) {
        int p = sorted.length;
        int half = p / 2;
        if (p % 2 == 1) {
            return sorted[half];
        }
        return sorted[half - 1] + (sorted[half] - sorted[half - 1]) / 2;
    }
}
