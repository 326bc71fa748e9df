package org.roundtable.statistics.robust;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.hipparchus.distribution.continuous.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvFileSource;

/** Median, MADe and nIQR against check values computed independently (CALC). */
class SimpleRobustEstimatorsTest {

    @ParameterizedTest(name = "{0}: median {1}, MADe {2}, nIQR t5/t6/t7 {3}/{4}/{5} (rel {6})")
    @CsvFileSource(resources = "/statistics/robust/simple-estimators.csv")
    void medianMadeAndNiqrMatchIndependentComputation(String data, double median, double madE,
            double niqr5, double niqr6, double niqr7, double relTol) {
        double[] x = TestData.named(data);
        assertEquals(median, Median.of(x), Math.abs(median) * relTol + 1e-12, "median");
        assertEquals(madE, ScaledMad.madE(x), madE * relTol, "MADe");
        if (!Double.isNaN(niqr5)) {
            assertEquals(niqr5, NormalizedIqr.of(x, QuartileRule.HYNDMAN_FAN_5), niqr5 * relTol, "nIQR type 5");
        }
        assertEquals(niqr6, NormalizedIqr.of(x, QuartileRule.HYNDMAN_FAN_6), niqr6 * relTol, "nIQR type 6");
        assertEquals(niqr7, NormalizedIqr.of(x, QuartileRule.HYNDMAN_FAN_7), niqr7 * relTol, "nIQR type 7");
    }

    @Test
    void creosoteMadIsExactlyAsComputedByHand() {
        // CALC: computed independently in Python and R, no published source; abs 1e-10
        assertEquals(0.640, ScaledMad.mad(TestData.CREOSOTE), 1e-10);
        assertEquals(0.004, ScaledMad.mad(TestData.MANGANESE), 1e-12);
    }

    @Test
    void creosoteQuartilesFollowTheNamedRules() {
        // CALC: R quantile(x, c(.25,.75), type = 5/6/7), no published source; rel 1e-7
        double[] sorted = TestData.CREOSOTE.clone();
        java.util.Arrays.sort(sorted);
        assertEquals(19.8000, QuartileRule.HYNDMAN_FAN_6.quantileOfSorted(sorted, 0.25), 1e-9);
        assertEquals(21.0625, QuartileRule.HYNDMAN_FAN_6.quantileOfSorted(sorted, 0.75), 1e-9);
        assertEquals(20.100, QuartileRule.HYNDMAN_FAN_7.quantileOfSorted(sorted, 0.25), 1e-9);
        assertEquals(20.940, QuartileRule.HYNDMAN_FAN_7.quantileOfSorted(sorted, 0.75), 1e-9);
        assertEquals(19.950, QuartileRule.HYNDMAN_FAN_5.quantileOfSorted(sorted, 0.25), 1e-9);
        assertEquals(21.00125, QuartileRule.HYNDMAN_FAN_5.quantileOfSorted(sorted, 0.75), 1e-9);
    }

    @Test
    void defaultQuartileRuleIsHyndmanFanType7() {
        assertEquals(QuartileRule.HYNDMAN_FAN_7, QuartileRule.DEFAULT);
        assertEquals(NormalizedIqr.of(TestData.CREOSOTE, QuartileRule.HYNDMAN_FAN_7),
                NormalizedIqr.of(TestData.CREOSOTE), 0.0);
    }

    @Test
    void madOfMostlyEqualValuesIsZero() {
        // CALC (constructed data): MAD = 0 -> spread not estimable; exact
        assertEquals(0.0, ScaledMad.madE(TestData.MOSTLY_EQUAL), 0.0);
        assertEquals(5.0, Median.of(TestData.MOSTLY_EQUAL), 0.0);
    }

    @Test
    void roundedIsoConstantsAreCloseToTheExactNormalFactors() {
        // CALC: 1/qnorm(0.75) = 1.482602218505602, 1/(2*qnorm(0.75)) = 0.741301109252801 (R), rel 1e-12
        double q = new NormalDistribution(0, 1).inverseCumulativeProbability(0.75);
        assertEquals(1.482602218505602, 1 / q, 1.482602218505602 * 1e-12);
        assertEquals(0.741301109252801, 1 / (2 * q), 0.741301109252801 * 1e-12);
        // ISO 13528 rounds them to 1.483 and 0.7413
        assertEquals(1.483, ScaledMad.MADE_FACTOR, 0.0);
        assertEquals(0.7413, NormalizedIqr.NIQR_FACTOR, 0.0);
    }

    @Test
    void evenCountMedianAveragesTheTwoMiddleValues() {
        // common practice, no source
        assertEquals(2.5, Median.of(new double[] {4, 1, 3, 2}), 0.0);
        assertEquals(7.0, Median.of(new double[] {7}), 0.0);
    }

    @Test
    void rejectsNanAndEmptyInput() {
        assertThrows(IllegalArgumentException.class, () -> Median.of(new double[] {1, Double.NaN, 2}));
        assertThrows(IllegalArgumentException.class, () -> ScaledMad.madE(new double[0]));
        assertThrows(IllegalArgumentException.class, () -> NormalizedIqr.of(null));
    }
}
