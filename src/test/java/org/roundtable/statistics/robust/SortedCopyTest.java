package org.roundtable.statistics.robust;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.util.Arrays;
import java.util.Random;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.IntRange;
import org.junit.jupiter.api.Test;

class SortedCopyTest {

    @Property(tries = 60, seed = "815")
    void radixSortOrdersLikeArraysSort(@ForAll long seed, @ForAll @IntRange(min = 0, max = 5000) int n) {
        Random r = new Random(seed);
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            switch (r.nextInt(6)) {
                case 0 -> x[i] = r.nextGaussian() * 1e-300;
                case 1 -> x[i] = -r.nextDouble() * 1e300;
                case 2 -> x[i] = r.nextInt(5) - 2.0; // ties, negative values, zero
                case 3 -> x[i] = r.nextBoolean() ? 0.0 : -0.0;
                default -> x[i] = 18 + 0.05 * r.nextGaussian();
            }
        }
        double[] expected = x.clone();
        Arrays.sort(expected);
        double[] copy = x.clone();
        assertArrayEquals(expected, SortedCopy.of(x));
        assertArrayEquals(copy, x, "input must not be modified");
    }

    @Test
    void largeNearlyConstantDataAreSorted() {
        double[] x = new double[3000];
        for (int i = 0; i < x.length; i++) {
            x[i] = 1000000000000.4 - (i % 7) * 0.1;
        }
        double[] expected = x.clone();
        Arrays.sort(expected);
        assertArrayEquals(expected, SortedCopy.of(x));
    }
}
