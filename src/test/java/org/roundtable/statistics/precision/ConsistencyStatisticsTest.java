package org.roundtable.statistics.precision;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.roundtable.statistics.NistStrdFile;
import org.roundtable.statistics.descriptive.Descriptive;

class ConsistencyStatisticsTest {

    @ParameterizedTest(name = "p = {0}: Cochran n=2 {1}/{2}, n=3 {3}/{4}, Grubbs {5}/{6}, h {7}/{8}, k n=2 {9}/{10}, n=3 {11}/{12}")
    @CsvSource({
        // CALC from the distribution formulas (Python and R, no published source); abs 1e-4.
        // Printed tables: ISO 5725-2:1994 Tables 4-6 (from memory) agree, e.g. Cochran n=2 p=4 0.968/0.906.
        "3,  0.9933, 0.9669, 0.9423, 0.8709, 1.1547, 1.1543, 1.1546, 1.1511, 1.7147, 1.6454, 1.6432, 1.5262",
        "4,  0.9676, 0.9065, 0.8643, 0.7679, 1.4963, 1.4813, 1.4850, 1.4250, 1.9175, 1.7567, 1.7715, 1.5895",
        "5,  0.9279, 0.8413, 0.7885, 0.6838, 1.7637, 1.7150, 1.7150, 1.5712, 2.0509, 1.8143, 1.8490, 1.6235",
        "6,  0.8828, 0.7807, 0.7218, 0.6161, 1.9728, 1.8871, 1.8722, 1.6563, 2.1421, 1.8481, 1.9004, 1.6445",
        "7,  0.8376, 0.7270, 0.6644, 0.5612, 2.1391, 2.0200, 1.9832, 1.7110, 2.2075, 1.8698, 1.9367, 1.6587",
        "8,  0.7945, 0.6798, 0.6152, 0.5157, 2.2744, 2.1266, 2.0649, 1.7491, 2.2562, 1.8848, 1.9638, 1.6689",
        "9,  0.7544, 0.6385, 0.5727, 0.4775, 2.3868, 2.2150, 2.1271, 1.7770, 2.2938, 1.8957, 1.9847, 1.6766",
        "10, 0.7175, 0.6020, 0.5358, 0.4450, 2.4821, 2.2900, 2.1761, 1.7984, 2.3236, 1.9039, 2.0013, 1.6826"})
    void criticalValuesMatchIndependentComputation(int p, double c21, double c25, double c31, double c35,
            double g1, double g5, double h1, double h5, double k21, double k25, double k31, double k35) {
        double tol = 1e-4;
        assertEquals(c21, CriticalValues.cochran(0.01, p, 2), tol);
        assertEquals(c25, CriticalValues.cochran(0.05, p, 2), tol);
        assertEquals(c31, CriticalValues.cochran(0.01, p, 3), tol);
        assertEquals(c35, CriticalValues.cochran(0.05, p, 3), tol);
        assertEquals(g1, CriticalValues.grubbs(0.01, p), tol);
        assertEquals(g5, CriticalValues.grubbs(0.05, p), tol);
        assertEquals(h1, CriticalValues.mandelH(0.01, p), tol);
        assertEquals(h5, CriticalValues.mandelH(0.05, p), tol);
        assertEquals(k21, CriticalValues.mandelK(0.01, p, 2), tol);
        assertEquals(k25, CriticalValues.mandelK(0.05, p, 2), tol);
        assertEquals(k31, CriticalValues.mandelK(0.01, p, 3), tol);
        assertEquals(k35, CriticalValues.mandelK(0.05, p, 3), tol);
    }

    @ParameterizedTest(name = "Grubbs p = {0}: {1}/{2}")
    @CsvSource({
        // CALC (Python and R, no published source); abs 1e-4
        "11, 2.5641, 2.3547", "12, 2.6357, 2.4116", "15, 2.8061, 2.5483", "20, 3.0008, 2.7082",
        "30, 3.2361, 2.9085", "40, 3.3807, 3.0361"})
    void moreGrubbsCriticalValues(int p, double g1, double g5) {
        assertEquals(g1, CriticalValues.grubbs(0.01, p), 1e-4);
        assertEquals(g5, CriticalValues.grubbs(0.05, p), 1e-4);
    }

    @Test
    void cochranAndMandelKForFiveLaboratoriesWithFiveReplicates() {
        // CALC (Python and R, no published source); abs 1e-6
        assertEquals(0.632894, CriticalValues.cochran(0.01, 5, 5), 1e-6);
        assertEquals(0.544034, CriticalValues.cochran(0.05, 5, 5), 1e-6);
        assertEquals(1.649293, CriticalValues.mandelK(0.01, 5, 5), 1e-6);
        assertEquals(1.464813, CriticalValues.mandelK(0.05, 5, 5), 1e-6);
    }

    @Test
    void siRstvCellsGiveTheExpectedMandelCochranAndGrubbsStatistics() {
        // CALC from NIST StRD SiRstv.dat data (PUB input), computed in Python and R, no published source
        double[][] cells = NistStrdFile.anova("SiRstv").groups();
        double[] means = new double[cells.length];
        double[] sds = new double[cells.length];
        for (int i = 0; i < cells.length; i++) {
            means[i] = Descriptive.mean(cells[i]);
            sds[i] = Descriptive.standardDeviation(cells[i]);
        }
        assertArrayEquals(new double[] {196.24308, 196.24430, 196.16702, 196.14814, 196.14324}, means, 1e-9);
        assertArrayEquals(new double[] {1.0663, 1.0905, -0.4377, -0.8111, -0.9080},
                ConsistencyStatistics.mandelH(means), 1e-4);
        assertArrayEquals(new double[] {0.8405, 1.3257, 0.9005, 1.0014, 0.8498},
                ConsistencyStatistics.mandelK(sds), 1e-4);
        ConsistencyStatistics.Test c = ConsistencyStatistics.cochran(sds, 5);
        assertEquals(0.351503, c.statistic(), 1e-6);
        assertEquals(OutlierVerdict.ACCEPTED, c.verdict());
        ConsistencyStatistics.Grubbs g = ConsistencyStatistics.grubbs(means);
        assertEquals(1.090451, g.singleHigh().statistic(), 1e-6);
        assertEquals(0.907971, g.singleLow().statistic(), 1e-6);
        assertEquals(1.7150, g.singleHigh().critical5(), 1e-4);
        assertEquals(OutlierVerdict.ACCEPTED, g.singleHigh().verdict());
    }

    @Test
    void grubbsDoubleStatisticIsTheShareOfTheSumOfSquaresLeft() {
        // arithmetic from the definition (ISO 5725-2:1994 7.3.4): x = 1..5 and 20, 21;
        // s0^2 = sum of squares of all, remove 20 and 21 -> sum of squares of 1..5 = 10
        double[] x = {1, 2, 3, 4, 5, 20, 21};
        double mean = 56.0 / 7;
        double s0 = 0;
        for (double v : x) {
            s0 += (v - mean) * (v - mean);
        }
        ConsistencyStatistics.Grubbs g = ConsistencyStatistics.grubbs(x);
        assertEquals(10 / s0, g.doubleHigh().statistic(), 1e-12);
        assertTrue(g.doubleHigh().statistic() < g.doubleLow().statistic());
        assertEquals(OutlierVerdict.OUTLIER, ConsistencyStatistics.grubbs(
                new double[] {10.0, 10.1, 9.9, 10.05, 9.95, 10.02, 9.98, 10.03, 9.97, 14.0}).singleHigh().verdict());
        assertNull(ConsistencyStatistics.grubbs(new double[] {1, 2, 4}).doubleHigh());
    }

    @Test
    void negativeBetweenLaboratoryVarianceIsSetToZero() {
        double[][] cells = {{1.0, 1.2, 1.1}, {1.2, 1.0, 1.1}, {1.1, 1.1, 1.1}};
        PrecisionExperiment.Result r = PrecisionExperiment.of(cells);
        assertEquals(0.0, r.betweenLaboratorySd(), 0.0);
        assertEquals(r.repeatabilitySd(), r.reproducibilitySd(), 0.0);
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("negative-between-variance")));
    }

    @Test
    void refusesTooFewCellsAndEqualMeans() {
        assertThrows(IllegalArgumentException.class, () -> OneWayAnova.of(new double[][] {{1, 2}}));
        assertThrows(IllegalArgumentException.class, () -> ConsistencyStatistics.mandelH(new double[] {1, 1, 1}));
        assertThrows(IllegalArgumentException.class, () -> CriticalValues.grubbs(0.05, 2));
    }
}
