package org.roundtable.statistics.sigma;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class SigmaPtTest {

    @ParameterizedTest(name = "c = {0}: Horwitz {1}, RSD (0.8495 form) {2} %, 2^(1-0.5log c) {3} %, Thompson {4}")
    @CsvSource({
        // CALC: computed independently in Python and R, no published source; rel 1e-9 on the
        // printed digits (sigma to 7 significant digits, RSD to 5)
        "1,      2.000000e-02, 2.0000,  2.0000,  1.000000e-02",
        "0.5,    1.109954e-02, 2.2199,  2.2199,  7.071068e-03",
        "0.18,   4.659979e-03, 2.5889,  2.5889,  4.242641e-03",
        "0.138,  3.718410e-03, 2.6945,  2.6946,  3.718410e-03",
        "0.01,   3.999724e-04, 3.9997,  4.0000,  3.999724e-04",
        "1e-4,   7.998895e-06, 7.9989,  8.0000,  7.998895e-06",
        "1e-6,   1.599669e-07, 15.9967, 16.0000, 1.599669e-07",
        "1.2e-7, 2.641158e-08, 22.0097, 22.0149, 2.641158e-08",
        "1e-8,   3.199116e-09, 31.9912, 32.0000, 2.200000e-09"})
    void horwitzAndThompsonMatchIndependentComputation(double c, double horwitz, double rsd,
            double rsdPowerOfTwo, double thompson) {
        // tolerance: half a unit in the last printed digit
        assertEquals(horwitz, SigmaPt.horwitz(c), horwitz * 5e-7);
        assertEquals(rsd, 100 * SigmaPt.horwitz(c) / c, 5e-5);
        assertEquals(rsdPowerOfTwo, SigmaPt.horwitzRsdPercentPowerOfTwoForm(c), 5e-5);
        assertEquals(thompson, SigmaPt.thompsonHorwitz(c), thompson * 5e-7);
    }

    @Test
    void horwitzAnchorPointsOfThePowerOfTwoForm() {
        // PUB: Horwitz et al. (1980): RSD 2 % at c = 1, 4 % at 1 %, 8 % at 100 mg/kg, 16 % at 1 mg/kg
        assertEquals(2.0, SigmaPt.horwitzRsdPercentPowerOfTwoForm(1), 1e-9);
        assertEquals(4.0, SigmaPt.horwitzRsdPercentPowerOfTwoForm(0.01), 1e-9);
        assertEquals(8.0, SigmaPt.horwitzRsdPercentPowerOfTwoForm(1e-4), 1e-9);
        assertEquals(16.0, SigmaPt.horwitzRsdPercentPowerOfTwoForm(1e-6), 1e-9);
    }

    @Test
    void thompsonEndsAtOnePercentAndTwentyTwoPercent() {
        // PUB: Thompson (2000) Analyst 125:385: upper branch 0.01 c^0.5 (1 % RSD at c = 1), 22 % floor
        assertEquals(0.01, SigmaPt.thompsonHorwitz(1), 1e-9);
        assertEquals(0.22 * 1e-9, SigmaPt.thompsonHorwitz(1e-9), 1e-24);
        // boundaries of the middle branch are inclusive (our choice, documented)
        assertEquals(0.02 * Math.pow(0.138, 0.8495), SigmaPt.thompsonHorwitz(0.138), 0.0);
        assertEquals(0.02 * Math.pow(1.2e-7, 0.8495), SigmaPt.thompsonHorwitz(1.2e-7), 0.0);
    }

    @Test
    void aMassFractionOfZeroOrBelowIsRefusedSayingThatHorwitzIsNotDefinedThere() {
        // the Horwitz function is defined for 0 < c <= 1 (Horwitz et al. 1980; Thompson 2000): a negative consensus of
        // blank-corrected results has no Horwitz sigma_pt
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SigmaPt.thompsonHorwitz(-0.002, MassFractionUnit.PERCENT));
        org.junit.jupiter.api.Assertions.assertTrue(e.getMessage().contains("not defined for a mass fraction of zero"),
                e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> SigmaPt.horwitz(0));
    }

    @Test
    void unitsAreConvertedToMassFractionAndBack() {
        // 18 % m/m Cr: c = 0.18, Thompson sigma 4.242641e-03 as mass fraction = 0.4242641 % m/m
        // (CALC row above, unit conversion arithmetic)
        assertEquals(0.4242641, SigmaPt.thompsonHorwitz(18, MassFractionUnit.PERCENT), 5e-8);
        // 100 mg/kg: Horwitz 7.998895e-06 as mass fraction = 7.998895 mg/kg
        assertEquals(7.998895, SigmaPt.horwitz(100, MassFractionUnit.MILLIGRAMS_PER_KILOGRAM), 5e-6);
        assertThrows(IllegalArgumentException.class, () -> SigmaPt.horwitz(18));
    }

    @Test
    void sigmaPtFromPrecisionData() {
        // CALC: sigma_R = 0.5, sigma_r = 0.3, n = 2 -> 0.45276926 (Python and R, no published source); rel 1e-8
        assertEquals(0.45276926, SigmaPt.fromPrecision(0.5, 0.3, 2), 0.45276926 * 1e-8);
        assertEquals(0.5, SigmaPt.fromPrecision(0.5, 0.3, 1), 1e-15);
        assertThrows(IllegalArgumentException.class, () -> SigmaPt.fromPrecision(0.2, 0.5, 2));
    }

    @Test
    void fixedAndPercentageSigma() {
        assertEquals(0.010, SigmaPt.fixed(0.010), 0.0);
        assertEquals(0.18, SigmaPt.percentOfAssigned(1, 18), 1e-15);
        assertThrows(IllegalArgumentException.class, () -> SigmaPt.fixed(0));
        assertThrows(IllegalArgumentException.class, () -> SigmaPt.fixed(Double.NaN));
    }
}
