package org.roundtable.statistics.density;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Calibration of the multimodality warning: Silverman's (1981) bootstrap-calibrated critical-bandwidth test, run
 * (as {@code MeasurandEvaluation} runs it) only where the plain kernel density shows more than one mode. Seeded
 * simulations, 400 rounds per case. The targets are those of the product's issue (false alarms ≤ 5 % on one normal
 * population; ≥ 85 % at two populations 5 SD apart, p = 30; ≥ 80 % at 4 SD apart, p = 60); the test's level is
 * α = 0.05 (Silverman B.W. 1981, J. R. Stat. Soc. B 43:97–99). The simulated data are our own (seeded
 * {@link Random}), no source.
 */
class CriticalBandwidthTest {

    private static final int ROUNDS = 400;

    /** Share of rounds in which the warning fires: gate (plain density > 1 mode) and then the test. */
    private static double firingRate(long seed, int p, double separation) {
        Random random = new Random(seed);
        int fired = 0;
        for (int round = 0; round < ROUNDS; round++) {
            double[] x = new double[p];
            for (int i = 0; i < p; i++) {
                double centre = separation > 0 && i % 2 == 1 ? separation : 0;
                x[i] = 10 + centre + random.nextGaussian();
            }
            if (KernelDensity.of(x).modes().size() > 1 && CriticalBandwidth.test(x).moreThanOneMode()) {
                fired++;
            }
        }
        return (double) fired / ROUNDS;
    }

    @ParameterizedTest(name = "one normal population, p = {0}")
    @CsvSource({"10", "20", "50", "200"})
    void onOneNormalPopulationItFiresInAtMostFivePercentOfRounds(int p) {
        double rate = firingRate(1000L + p, p, 0);
        assertTrue(rate <= 0.05, "fired in " + rate + " of rounds");
    }

    @Test
    void onTwoPopulationsFiveSdApartItFiresInAtLeast85PercentOfRoundsAtP30() {
        double rate = firingRate(2030L, 30, 5);
        assertTrue(rate >= 0.85, "fired in " + rate + " of rounds");
    }

    @Test
    void onTwoPopulationsFourSdApartItFiresInAtLeast80PercentOfRoundsAtP60() {
        double rate = firingRate(2060L, 60, 4);
        assertTrue(rate >= 0.80, "fired in " + rate + " of rounds");
    }

    @Test
    void theSameDataGiveTheSameAnswerInAnyOrder() {
        double[] x = {9.1, 9.3, 9.2, 9.0, 12.1, 12.3, 12.0, 12.2, 9.25, 12.15};
        double[] reversed = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            reversed[i] = x[x.length - 1 - i];
        }
        CriticalBandwidth.Result a = CriticalBandwidth.test(x);
        CriticalBandwidth.Result b = CriticalBandwidth.test(reversed);
        assertEquals(a, b);
        assertTrue(a.moreThanOneMode());
    }

    @Test
    void tooFewValuesOrZeroSpreadAreNeverSignalled() {
        assertFalse(CriticalBandwidth.test(new double[]{1, 5}).moreThanOneMode());
        assertFalse(CriticalBandwidth.test(new double[]{2, 2, 2, 2}).moreThanOneMode());
    }
}
