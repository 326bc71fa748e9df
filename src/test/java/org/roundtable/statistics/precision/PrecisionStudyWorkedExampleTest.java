package org.roundtable.statistics.precision;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The whole study evaluation ({@link PrecisionStudyEvaluation}) on the worked example of
 * {@code src/test/resources/precision/sirstv-precision-study.csv}: the NIST StRD SiRstv data as a
 * precision experiment of 5 laboratories × 1 level × 5 replicates (see the README beside it). No ISO
 * 5725-2 worked example with printed results is available to the project; the check values are those
 * of the project's statistics reference, section 14.11 (DER from NIST's certified mean squares, and
 * CALC for h, k, Cochran and Grubbs) and 14.10 (CALC critical values), each named at its check.
 */
class PrecisionStudyWorkedExampleTest {

    /** The fixture's cells, laboratory by laboratory in file order. */
    static double[][] cells() {
        try (InputStream in = PrecisionStudyWorkedExampleTest.class.getResourceAsStream("/precision/sirstv-precision-study.csv")) {
            Map<String, List<Double>> byLab = new LinkedHashMap<>();
            String[] lines = new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n");
            for (int i = 1; i < lines.length; i++) {
                String[] f = lines[i].strip().split(",");
                byLab.computeIfAbsent(f[0], k -> new ArrayList<>()).add(Double.parseDouble(f[4]));
            }
            return byLab.values().stream().map(v -> v.stream().mapToDouble(Double::doubleValue).toArray())
                    .toArray(double[][]::new);
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void theStudyEvaluationOfTheSirstvExampleGivesThePublishedAndDerivedPrecisionValues() {
        double[][] cells = cells();
        PrecisionStudyEvaluation.Result study = PrecisionStudyEvaluation.of(
                List.of(new PrecisionStudyEvaluation.LevelInput("SiRstv", cells, new boolean[cells.length])),
                0.05, 0.01, true);
        assertEquals(1, study.levels().size());
        // one level: no precision-level relationship is fitted (PrecisionStudyEvaluation's documented special case)
        assertTrue(study.repeatabilityFits().isEmpty());
        PrecisionLevelEvaluation.Result r = study.levels().get(0).result();
        PrecisionExperiment.Result p = r.precision();
        assertEquals(5, r.retainedCells());
        // statistics reference 14.11, SiRstv row: s_r PUB (NIST certified residual SD), the rest DER; rel 1e-10
        assertEquals(0.104076068334656, p.repeatabilitySd(), 0.104076068334656 * 1e-10, "s_r");
        assertEquals(0.0197723918634, p.betweenLaboratorySd(), 0.0197723918634 * 1e-10, "s_L");
        assertEquals(0.105937601823, p.reproducibilitySd(), 0.105937601823 * 1e-10, "s_R");
        // 14.11: r = 2.8 s_r, R = 2.8 s_R printed to 10 significant digits (rel 2e-10)
        assertEquals(0.2914129913, p.repeatabilityLimit(), 0.2914129913 * 2e-10, "r");
        assertEquals(0.2966252851, p.reproducibilityLimit(), 0.2966252851 * 2e-10, "R");
        // 14.11, paragraph "Also from SiRstv" (CALC, inputs PUB): cell means (abs 1e-9 on 5-decimal exact means)
        assertArrayEquals(new double[] {196.24308, 196.24430, 196.16702, 196.14814, 196.14324}, r.cellMeans(), 1e-9);
        // same paragraph: Mandel h and k (abs 1e-4)
        assertArrayEquals(new double[] {1.0663, 1.0905, -0.4377, -0.8111, -0.9080}, r.mandelH(), 1e-4, "h");
        assertArrayEquals(new double[] {0.8405, 1.3257, 0.9005, 1.0014, 0.8498}, r.mandelK(), 1e-4, "k");
        // same paragraph: Cochran C = 0.351503 (abs 1e-6), the largest variance is laboratory 2's (k = 1.3257)
        assertEquals(0.351503, r.cochran().statistic(), 1e-6, "Cochran C");
        assertEquals(1, r.cochranCell());
        // 14.10, "Cochran p = 5, n = 5: 0.632894/0.544034" (CALC, abs 1e-6)
        assertEquals(0.544034, r.cochran().critical5(), 1e-6, "Cochran 5 %");
        assertEquals(0.632894, r.cochran().critical1(), 1e-6, "Cochran 1 %");
        assertEquals(OutlierVerdict.ACCEPTED, r.cochran().verdict());
        // 14.11 paragraph: Grubbs on the cell means G_max = 1.090451, G_min = 0.907971 (abs 1e-6)
        assertEquals(1.090451, r.grubbs().singleHigh().statistic(), 1e-6, "Grubbs highest");
        assertEquals(0.907971, r.grubbs().singleLow().statistic(), 1e-6, "Grubbs lowest");
        // 14.10, Grubbs p = 5: 1.7637 (1 %) / 1.7150 (5 %) (CALC, abs 1e-4)
        assertEquals(1.7150, r.grubbs().singleHigh().critical5(), 1e-4, "Grubbs 5 %");
        assertEquals(1.7637, r.grubbs().singleHigh().critical1(), 1e-4, "Grubbs 1 %");
        assertEquals(OutlierVerdict.ACCEPTED, r.grubbs().singleHigh().verdict());
        assertEquals(OutlierVerdict.ACCEPTED, r.grubbs().singleLow().verdict());
        // 14.10, Mandel h p = 5: 1.7150 (1 %) / 1.5712 (5 %); k p = 5, n = 5: 1.649293 / 1.464813 (CALC)
        assertEquals(1.5712, r.hStragglerLine(), 1e-4, "h 5 %");
        assertEquals(1.7150, r.hOutlierLine(), 1e-4, "h 1 %");
        assertEquals(1.464813, r.kStragglerLine(), 1e-6, "k 5 %");
        assertEquals(1.649293, r.kOutlierLine(), 1e-6, "k 1 %");
        // nothing exceeds a 5 % value, so nothing is flagged (the decision rule of the reference's section 13)
        assertTrue(r.flags().isEmpty(), r.flags().toString());
    }
}
