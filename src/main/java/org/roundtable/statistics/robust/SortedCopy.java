package org.roundtable.statistics.robust;

import java.util.Arrays;

/**
 * Sorted copy of finite double values, the first step of every median-based estimator.
 *
 * <p>Definition: returns a new array with the values in ascending order, identical to
 * {@link Arrays#sort(double[])} on a copy (−0.0 before 0.0).
 *
 * <p>Numerical choice: for 1024 or more values a least-significant-digit radix sort on the
 * order-preserving 64-bit key of each double (sign bit flipped for positive values, all bits
 * flipped for negative ones) with 11-bit digits, skipping the digits that all values share; it is
 * about three times faster than the comparison sort for rounds of thousands of results. Below
 * 1024 values {@link Arrays#sort(double[])} is used. Callers check finiteness first.
 *
 * <p>References: Knuth D.E. (1998) The Art of Computer Programming, Vol. 3, 2nd ed., 5.2.5
 * (radix sorting).
 */
public final class SortedCopy {

    /** From this size on the radix sort is used. */
    static final int RADIX_THRESHOLD = 1024;
    private static final int BITS = 11;
    private static final int BUCKETS = 1 << BITS;
    private static final int PASSES = (64 + BITS - 1) / BITS;

    private SortedCopy() {
    }

    /** Ascending copy of the values (not modified). */
    public static double[] of(double[] values) {
        int n = values.length;
        if (n < RADIX_THRESHOLD) {
            double[] copy = values.clone();
            Arrays.sort(copy);
            return copy;
        }
        long[] keys = new long[n];
        int[][] counts = new int[PASSES][BUCKETS];
        for (int i = 0; i < n; i++) {
            long bits = Double.doubleToRawLongBits(values[i]);
            long key = bits ^ ((bits >> 63) | Long.MIN_VALUE);
            keys[i] = key;
            for (int pass = 0; pass < PASSES; pass++) {
                counts[pass][(int) ((key >>> (pass * BITS)) & (BUCKETS - 1))]++;
            }
        }
        long[] buffer = new long[n];
        for (int pass = 0; pass < PASSES; pass++) {
            int[] count = counts[pass];
            int shift = pass * BITS;
            if (count[(int) ((keys[0] >>> shift) & (BUCKETS - 1))] == n) {
                continue; // every key has the same digit here
            }
            int total = 0;
            for (int b = 0; b < BUCKETS; b++) {
                int c = count[b];
                count[b] = total;
                total += c;
            }
            for (int i = 0; i < n; i++) {
                long key = keys[i];
                buffer[count[(int) ((key >>> shift) & (BUCKETS - 1))]++] = key;
            }
            long[] swap = keys;
            keys = buffer;
            buffer = swap;
        }
        double[] sorted = new double[n];
        for (int i = 0; i < n; i++) {
            long key = keys[i];
            long bits = key ^ (((~key) >> 63) | Long.MIN_VALUE);
            sorted[i] = Double.longBitsToDouble(bits);
        }
        return sorted;
    }
}
