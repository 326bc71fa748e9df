package org.roundtable.statistics.precision;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.roundtable.statistics.NistStrdFile;
import org.roundtable.statistics.precision.PrecisionLevelEvaluation.Flag;
import org.roundtable.statistics.precision.PrecisionLevelEvaluation.FlagSource;
import org.roundtable.statistics.precision.PrecisionLevelEvaluation.Result;

/**
 * The per-level evaluation. Check values: NIST StRD SiRstv (PUB data; h, k, C, G CALC in the
 * shared statistics reference 14.11), hand-computable extreme cases, and the invented study
 * {@code statistics/precision/carbon-in-steel-study.csv} (demo data) whose expected values were
 * computed independently by {@code check_values.py} beside it (NumPy/SciPy; CALC, no published
 * source). No ISO 5725-2 worked example could be retrieved for this work.
 */
class PrecisionLevelEvaluationTest {

    /** Cells of one level of the invented study, laboratories in code order. */
    static double[][] studyLevel(int level) {
        Map<String, List<Double>> cells = new TreeMap<>();
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                PrecisionLevelEvaluationTest.class.getResourceAsStream("/statistics/precision/carbon-in-steel-study.csv"),
                StandardCharsets.UTF_8))) {
            in.readLine();
            for (String line = in.readLine(); line != null; line = in.readLine()) {
                String[] f = line.split(",");
                if (Integer.parseInt(f[1]) == level) {
                    cells.computeIfAbsent(f[0], k -> new ArrayList<>()).add(Double.parseDouble(f[4]));
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return cells.values().stream().map(l -> l.stream().mapToDouble(Double::doubleValue).toArray())
                .toArray(double[][]::new);
    }

    @Test
    void siRstvGivesTheReferenceConsistencyStatisticsAndNistPrecision() {
        // inputs PUB (NIST StRD SiRstv); h, k, C, G CALC (shared statistics reference 14.11); s_r PUB
        Result r = PrecisionLevelEvaluation.of(NistStrdFile.anova("SiRstv").groups());
        assertArrayEquals(new double[] {1.0663, 1.0905, -0.4377, -0.8111, -0.9080}, r.mandelH(), 1e-4);
        assertArrayEquals(new double[] {0.8405, 1.3257, 0.9005, 1.0014, 0.8498}, r.mandelK(), 1e-4);
        assertEquals(0.351503, r.cochran().statistic(), 1e-6);
        assertEquals(1, r.cochranCell());
        assertEquals(1.090451, r.grubbs().singleHigh().statistic(), 1e-6);
        assertEquals(0.907971, r.grubbs().singleLow().statistic(), 1e-6);
        assertEquals(0.104076068334656, r.precision().repeatabilitySd(), 1e-13);
        assertTrue(r.flags().isEmpty());
        assertEquals(1.5712, r.hStragglerLine(), 1e-4);
        assertEquals(1.7150, r.hOutlierLine(), 1e-4);
    }

    @Test
    void oneDeviatingMeanReachesTheLargestPossibleH() {
        // hand arithmetic: p − 1 equal means and one other give h = (p − 1)/√p for that one,
        // −1/√p for the others, whatever the distance (p = 12: 3.1754, beyond both lines)
        double[][] cells = new double[12][];
        for (int i = 0; i < 12; i++) {
            cells[i] = i == 3 ? new double[] {5.5, 5.7} : new double[] {1.0 + 0.01 * (i % 2), 1.0 - 0.01 * (i % 2)};
        }
        Result r = PrecisionLevelEvaluation.of(cells);
        assertEquals(11 / Math.sqrt(12), r.mandelH()[3], 1e-12);
        assertEquals(-1 / Math.sqrt(12), r.mandelH()[0], 1e-12);
        assertTrue(r.flags().contains(new Flag(3, FlagSource.MANDEL_H, OutlierVerdict.OUTLIER)));
    }

    @Test
    void cochranExactlyOnItsCriticalValueIsAcceptedAndJustAboveIsAStraggler() {
        // hand arithmetic: three cells with s = 1 and one with s² = 3c/(1 − c) give C = c exactly;
        // k of that cell = sqrt(4·s²/(s² + 3)) = sqrt(4c)
        double c5 = CriticalValues.cochran(0.05, 4, 2);
        double atCritical = Math.sqrt(3 * c5 / (1 - c5));
        Result at = PrecisionLevelEvaluation.of(fourCells(atCritical * 1.0000001));
        assertEquals(OutlierVerdict.STRAGGLER, at.cochran().verdict());
        assertEquals(3, at.cochranCell());
        assertEquals(Math.sqrt(4 * at.cochran().statistic()), at.mandelK()[3], 1e-12);
        Result below = PrecisionLevelEvaluation.of(fourCells(atCritical * 0.9999999));
        assertEquals(OutlierVerdict.ACCEPTED, below.cochran().verdict());
        // all variance in one cell: C = 1 and k = √p (p = 4: 2), beyond every line
        double[][] one = {{1, 1}, {2, 2}, {3, 3}, {4, 6}};
        Result r = PrecisionLevelEvaluation.of(one);
        assertEquals(1.0, r.cochran().statistic(), 1e-15);
        assertEquals(2.0, r.mandelK()[3], 1e-15);
        assertEquals(OutlierVerdict.OUTLIER, r.verdictOf(3));
    }

    /** Cells with SD 1 (two results 1/√2 either side of the mean), the last with SD {@code s}. */
    private static double[][] fourCells(double s) {
        double d = 1 / Math.sqrt(2);
        return new double[][] {{10 - d, 10 + d}, {11 - d, 11 + d}, {12 - d, 12 + d},
            {13 - s * d, 13 + s * d}};
    }

    @Test
    void studyLevelsMatchTheIndependentComputation() {
        // CALC: check_values.py (NumPy 2.4 / SciPy 1.17), printed to 10 significant digits
        Result l1 = PrecisionLevelEvaluation.of(studyLevel(1));
        assertEquals(0.05099166667, l1.generalMean(), 1e-11);
        assertEquals(0.2690906079, l1.cochran().statistic(), 1e-9);
        assertEquals(0.002242951924, l1.precision().repeatabilitySd(), 1e-12);
        assertEquals(0.002648734689, l1.precision().reproducibilitySd(), 1e-12);
        assertEquals(0.5240013467, l1.grubbs().doubleHigh().statistic(), 1e-9);
        assertEquals(0.5307078529, l1.grubbs().doubleLow().statistic(), 1e-9);
        assertTrue(l1.flags().isEmpty(), l1.flags().toString());

        Result l3 = PrecisionLevelEvaluation.of(studyLevel(3));
        assertEquals(2.677352824, l3.grubbs().singleHigh().statistic(), 1e-9);
        assertEquals(0.00784402639, l3.precision().repeatabilitySd(), 1e-12);
        assertEquals(0.01861496018, l3.precision().betweenLaboratorySd(), 1e-11);
        assertEquals(0.05656038066, l3.precision().reproducibilityLimit(), 1e-11);
        assertArrayEquals(new double[] {0.239612, -0.844114, -0.949655, 0.602571, -0.012656, -0.895597,
            -0.741147, -0.571252, 0.257632, 2.677353, 0.007937, 0.229316}, l3.mandelH(), 1e-6);
    }

    @Test
    void plantedStragglerAndOutlierAreFlaggedAtTheirLevelsAndNothingIsExcluded() {
        // level 2: L07 (index 6) has a wide cell: Cochran C = 0.5670 between 0.5410 (5 %) and 0.6528 (1 %)
        Result l2 = PrecisionLevelEvaluation.of(studyLevel(2));
        assertEquals(0.5670300384, l2.cochran().statistic(), 1e-9);
        assertEquals(OutlierVerdict.STRAGGLER, l2.cochran().verdict());
        assertTrue(l2.flags().contains(new Flag(6, FlagSource.COCHRAN, OutlierVerdict.STRAGGLER)));
        assertEquals(2.608517, l2.mandelK()[6], 1e-6);
        assertEquals(0.0, l2.precision().betweenLaboratorySd(), 0.0);
        assertTrue(l2.warnings().stream().anyMatch(w -> w.code().equals("negative-between-variance")));
        // level 3: L10 (index 9) has a shifted mean: Grubbs G = 2.6774 beyond 2.6357 (1 %)
        Result l3 = PrecisionLevelEvaluation.of(studyLevel(3));
        assertEquals(OutlierVerdict.OUTLIER, l3.grubbs().singleHigh().verdict());
        assertEquals(9, l3.grubbsCells()[3]);
        assertTrue(l3.flags().contains(new Flag(9, FlagSource.GRUBBS_SINGLE_HIGH, OutlierVerdict.OUTLIER)));
        assertEquals(12, l3.retainedCells());
        assertFalse(l3.flags().stream().anyMatch(f -> f.cell() != 9 && f.source() != FlagSource.MANDEL_K
                && f.source() != FlagSource.MANDEL_H));
    }

    @Test
    void excludingACellByDecisionRepeatsTheTestsOnTheRest() {
        // CALC: check_values.py, level 3 without L10
        boolean[] excluded = new boolean[12];
        excluded[9] = true;
        Result r = PrecisionLevelEvaluation.of(studyLevel(3), excluded, 0.05, 0.01);
        assertEquals(11, r.retainedCells());
        assertEquals(0.8009681818, r.generalMean(), 1e-10);
        assertEquals(1.500137077, r.grubbs().singleHigh().statistic(), 1e-9);
        assertEquals(0.2188996605, r.cochran().statistic(), 1e-9);
        assertEquals(0.008156787469, r.precision().repeatabilitySd(), 1e-12);
        assertEquals(0.01237928622, r.precision().reproducibilitySd(), 1e-11);
        assertEquals(0.03466200141, r.precision().reproducibilityLimit(), 1e-11);
        // h and k stay those of all cells (the charts show every laboratory)
        assertEquals(2.677352824, r.mandelH()[9], 1e-9);
    }

    @Test
    void refusesUnequalReplicatesTooFewCellsAndBadLevels() {
        assertThrows(IllegalArgumentException.class,
                () -> PrecisionLevelEvaluation.of(new double[][] {{1, 2}, {1, 2, 3}, {2, 3}}));
        assertThrows(IllegalArgumentException.class,
                () -> PrecisionLevelEvaluation.of(new double[][] {{1, 2}, {2, 3}}, new boolean[] {true, false}, 0.05, 0.01));
        assertThrows(IllegalArgumentException.class,
                () -> PrecisionLevelEvaluation.of(new double[][] {{1, 2}, {2, 3}, {3, 5}}, new boolean[3], 0.01, 0.05));
    }

    @Test
    void equalMeansAndZeroSpreadsAreReportedNotThrown() {
        Result r = PrecisionLevelEvaluation.of(new double[][] {{1, 1}, {1, 1}, {1, 1}});
        assertTrue(Double.isNaN(r.mandelH()[0]));
        assertTrue(Double.isNaN(r.mandelK()[0]));
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("zero-spread-sds")));
        assertEquals(0.0, r.precision().reproducibilitySd(), 0.0);
    }
}
