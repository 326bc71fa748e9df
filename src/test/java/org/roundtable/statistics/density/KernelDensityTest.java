package org.roundtable.statistics.density;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Gaussian kernel density against R 4.2.2 (Debian r-base-core), {@code density(x, bw = "nrd0",
 * kernel = "gaussian")}. R's density() bins the data and uses an FFT, so its values differ from
 * the exact sum by about 1e-3 relative; the exact sum is checked against R's
 * {@code mean(dnorm(t, x, bw.nrd0(x)))}.
 */
class KernelDensityTest {

    static final double[] MANGANESE = org.roundtable.statistics.DemoData.manganese();
    static final double[] CREOSOTE = org.roundtable.statistics.DemoData.creosote();
    /** Two populations, 7 + 5 values: constructed demo data. */
    static final double[] TWO_GROUPS = {1.00, 1.01, 0.99, 1.005, 0.995, 1.002, 0.998, 1.10, 1.11, 1.09, 1.105, 1.095};

    @Test
    void silvermanBandwidthEqualsRsNrd0() {
        // R: density(x, bw = "nrd0", kernel = "gaussian")$bw ; rel 1e-12
        assertEquals(0.00276689689078964, KernelDensity.silvermanBandwidth(MANGANESE), 0.00276689689078964 * 1e-12);
        assertEquals(0.3635536383006, KernelDensity.silvermanBandwidth(CREOSOTE), 0.3635536383006 * 1e-12);
        assertEquals(0.0284382483307637, KernelDensity.silvermanBandwidth(TWO_GROUPS), 0.0284382483307637 * 1e-12);
    }

    @Test
    void exactDensityEqualsTheDirectSumInR() {
        // R: mean(dnorm(t, x, bw.nrd0(x))) at the type-7 quartiles of x ; rel 1e-12
        KernelDensity mn = KernelDensity.of(MANGANESE);
        assertEquals(53.931626169214, mn.density(0.74375), 53.931626169214 * 1e-12);
        assertEquals(62.5786898783239, mn.density(0.7475), 62.5786898783239 * 1e-12);
        assertEquals(47.3449025227426, mn.density(0.75125), 47.3449025227426 * 1e-12);
        KernelDensity cr = KernelDensity.of(CREOSOTE);
        assertEquals(0.418907108254814, cr.density(20.1), 0.418907108254814 * 1e-12);
        assertEquals(0.447914659339773, cr.density(20.3), 0.447914659339773 * 1e-12);
        assertEquals(0.36426333146305, cr.density(20.94), 0.36426333146305 * 1e-12);
    }

    @Test
    void densityAgreesWithRsBinnedEstimateToItsBinningError() {
        // R: d <- density(x, bw = "nrd0", kernel = "gaussian"); approx(d$x, d$y, t)$y ; rel 2e-3
        KernelDensity mn = KernelDensity.of(MANGANESE);
        assertEquals(53.9751082949701, mn.density(0.74375), 53.975 * 2e-3);
        assertEquals(62.6112372768169, mn.density(0.7475), 62.611 * 2e-3);
        KernelDensity bi = KernelDensity.of(TWO_GROUPS);
        assertEquals(8.014675685371, bi.density(0.9995), 8.0147 * 2e-3);
        assertEquals(5.65595672550827, bi.density(1.09625), 5.656 * 2e-3);
    }

    @Test
    void twoPopulationsGiveTwoModesWhereRFindsThem() {
        // R: d <- density(x, bw = "nrd0"); y <- d$y; i <- which(diff(sign(diff(y))) == -2) + 1;
        // d$x[i] = 1.000234676, 1.099196577; y[i]/max(y) = 1, 0.709848. Tolerance: R's grid step (5.7e-4)
        List<KernelDensity.Mode> modes = KernelDensity.of(TWO_GROUPS).modes();
        assertEquals(2, modes.size());
        assertEquals(1.000234676, modes.get(0).location(), 6e-4);
        assertEquals(1.099196577, modes.get(1).location(), 6e-4);
        assertEquals(0.709848, modes.get(1).relativeHeight(), 0.01);
    }

    @Test
    void manganeseOutliersAreSmallBumpsBelowTheDefaultHeight() {
        // R (same commands): peaks at 0.7470174663, 0.7719878321, 0.7899772354 with relative heights
        // 1, 0.114513, 0.114572. Tolerance: R's grid step (1.4e-4) and 0.01 in height.
        assertEquals(1, KernelDensity.of(MANGANESE).modes().size());
        List<KernelDensity.Mode> modes = KernelDensity.of(MANGANESE).modes(512, 0.1);
        assertEquals(3, modes.size());
        assertEquals(0.7470174663, modes.get(0).location(), 2e-4);
        assertEquals(0.7719878321, modes.get(1).location(), 2e-4);
        assertEquals(0.7899772354, modes.get(2).location(), 2e-4);
        assertEquals(0.114513, modes.get(1).relativeHeight(), 0.01);
        assertEquals(0.114572, modes.get(2).relativeHeight(), 0.01);
    }

    @Test
    void creosoteHasThreeModesAboveAQuarterOfTheHighest() {
        // R (same commands): peaks 17.57539505, 20.31553496, 24.13460495; heights 0.271711, 1, 0.271711
        List<KernelDensity.Mode> modes = KernelDensity.of(CREOSOTE).modes();
        assertEquals(3, modes.size());
        assertEquals(20.31553496, modes.get(1).location(), 0.02);
        assertEquals(0.271711, modes.get(0).relativeHeight(), 0.01);
    }

    @Test
    void densityIntegratesToOne() {
        KernelDensity k = KernelDensity.of(TWO_GROUPS);
        double lo = 0.8;
        double hi = 1.3;
        int n = 20000;
        double h = (hi - lo) / n;
        double sum = 0;
        for (int i = 0; i <= n; i++) {
            sum += (i == 0 || i == n ? 0.5 : 1) * k.density(lo + i * h);
        }
        assertEquals(1.0, sum * h, 1e-6);
    }

    @Test
    void allEqualValuesHaveNoBandwidth() {
        assertThrows(IllegalArgumentException.class, () -> KernelDensity.of(new double[] {2, 2, 2}));
        assertThrows(IllegalArgumentException.class, () -> KernelDensity.of(new double[] {2}));
        // IQR = 0 but SD > 0: R's nrd0 falls back to the SD
        double[] x = {5.0, 5.0, 5.0, 5.0, 5.0, 5.1, 4.9};
        double sd = org.roundtable.statistics.descriptive.Descriptive.standardDeviation(x);
        assertEquals(0.9 * sd * Math.pow(7, -0.2), KernelDensity.silvermanBandwidth(x), 1e-15);
    }
}
