package org.roundtable.statistics.robust;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.roundtable.statistics.descriptive.Descriptive;

/** Edge cases p = 1, 2, 3 and NaN for the robust estimators (policy documented in AlgorithmA). */
class SmallSampleEdgeCasesTest {

    @Test
    void oneValueHasAMedianButNoAlgorithmA() {
        assertEquals(4.2, Median.of(new double[] {4.2}), 0.0);
        assertEquals(0.0, ScaledMad.madE(new double[] {4.2}), 0.0);
        assertThrows(IllegalArgumentException.class, () -> AlgorithmA.robustMean(new double[] {4.2}));
    }

    @Test
    void twoValuesGiveTheMeanAndTheScaledSd() {
        // CALC (constructed 10.1 10.3): x* = 10.2, s* = 1.134 SD = 0.1603718180, no clipping
        double[] x = {10.1, 10.3};
        AlgorithmA.Result r = AlgorithmA.fullConvergence().evaluate(x);
        assertEquals(Descriptive.mean(x), r.robustMean(), 1e-12);
        assertEquals(1.134 * Descriptive.standardDeviation(x), r.robustSd(), 1e-12);
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("too-few-values")));
    }

    @Test
    void threeValuesConvergeInFourIterations() {
        // CALC (constructed 10.1 10.2 10.6): x* = 10.3, s* = 0.3000281987, 4 iterations; rel 1e-8
        AlgorithmA.Result r = AlgorithmA.fullConvergence().evaluate(new double[] {10.1, 10.2, 10.6});
        assertEquals(10.3, r.robustMean(), 10.3 * 1e-8);
        assertEquals(0.3000281987, r.robustSd(), 0.3000281987 * 1e-8);
        assertEquals(4, r.iterations());
    }

    @Test
    void nanAndInfinityAreRefusedEverywhere() {
        double[] x = {1, 2, Double.NaN};
        double[] y = {1, 2, Double.POSITIVE_INFINITY};
        assertThrows(IllegalArgumentException.class, () -> Median.of(x));
        assertThrows(IllegalArgumentException.class, () -> ScaledMad.madE(y));
        assertThrows(IllegalArgumentException.class, () -> NormalizedIqr.of(x));
        assertThrows(IllegalArgumentException.class, () -> AlgorithmA.fullConvergence().evaluate(y));
    }
}
