package org.roundtable.statistics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.roundtable.statistics.MeasurandEvaluation.Input;
import org.roundtable.statistics.MeasurandEvaluation.ParticipantResult;
import org.roundtable.statistics.MeasurandEvaluation.Result;
import org.roundtable.statistics.score.ScoreKind;

class MeasurandEvaluationTest {

    static final double[] MANGANESE = DemoData.manganese();

    static List<ParticipantResult> results(double[] values) {
        List<ParticipantResult> list = new ArrayList<>();
        for (int i = 0; i < values.length; i++) {
            list.add(new ParticipantResult(String.format("L%02d", i + 1), Double.toString(values[i]),
                    values[i], false, 0.008, 2.0, "OES"));
        }
        return list;
    }

    static boolean hasWarning(Result r, String code) {
        return r.warnings().stream().anyMatch(w -> w.code().equals(code));
    }

    @Test
    void manganeseRoundGivesTheAlgorithmAConsensusAndZScores() {
        // CALC: x* = 0.7475547640, u(x_pt) = 0.0017573609 (Python and R, no published source)
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", results(MANGANESE), null, null, 0.010));
        assertEquals(20, r.n());
        assertEquals(0.7475547640, r.assignedValue(), 1e-9);
        assertEquals(0.0017573609, r.assignedValueUncertainty(), 1e-9);
        assertEquals(MeasurandEvaluation.AssignedValueSource.ALGORITHM_A, r.assignedValueSource());
        assertEquals(ScoreKind.Z, r.scoreUsed());
        assertEquals(28, r.iterations());
        assertTrue(r.converged());
        // L19 (index 18) 0.772: z = 2.444524, questionable; L18 0.790: z = 4.244524 (CALC, abs 1e-6)
        assertEquals(2.444524, r.scores().get(18).z(), 1e-6);
        assertEquals("questionable", r.scores().get(18).classification());
        assertEquals(4.244524, r.scores().get(17).z(), 1e-6);
        assertEquals("unsatisfactory", r.scores().get(17).classification());
        assertTrue(hasWarning(r, "zeta-en-biased"));
        assertFalse(hasWarning(r, "few-participants"));
        assertFalse(hasWarning(r, "sigma-pt-data-derived"));
    }

    @Test
    void withoutSigmaPtTheRobustSdIsUsedAndWarned() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", results(MANGANESE), null, null, null));
        assertEquals(MeasurandEvaluation.SigmaPtSource.ROBUST_SD, r.sigmaPtSource());
        assertEquals(r.robustSd(), r.sigmaPt());
        assertTrue(hasWarning(r, "sigma-pt-data-derived"));
        // u(x_pt)/s* = 1.25/sqrt(20) = 0.2795 <= 0.3 -> z
        assertEquals(ScoreKind.Z, r.scoreUsed());
    }

    @Test
    void givenAssignedValueUsesHalfItsExpandedUncertaintyAndNoBiasWarning() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", results(MANGANESE), 0.750, 0.008, 0.010));
        assertEquals(0.750, r.assignedValue());
        assertEquals(0.004, r.assignedValueUncertainty(), 1e-15);
        // u/sigma = 0.4 > 0.3 -> z'
        assertEquals(ScoreKind.Z_PRIME, r.scoreUsed());
        assertFalse(hasWarning(r, "zeta-en-biased"));
        // arithmetic (no source): L01 0.742, U = 0.008, k = 2: zeta = -0.008/sqrt(0.004^2 + 0.004^2), En = -0.008/sqrt(0.008^2 + 0.008^2)
        assertEquals(-0.008 / Math.sqrt(2 * 0.004 * 0.004), r.scores().get(0).zeta(), 1e-9);
        assertEquals(-0.008 / Math.sqrt(2 * 0.008 * 0.008), r.scores().get(0).en(), 1e-9);
    }

    @Test
    void censoredResultsAreLeftOutNotScoredAndClassified() {
        List<ParticipantResult> list = results(MANGANESE);
        list.add(new ParticipantResult("L21", "<0.5", 0.5, true, null, null, null));
        list.add(new ParticipantResult("L22", "<1", 1.0, true, null, null, null));
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", list, null, null, 0.010));
        assertEquals(20, r.n());
        assertEquals(2, r.censored());
        assertEquals(0.7475547640, r.assignedValue(), 1e-9);
        assertNull(r.scores().get(20).z());
        assertNull(r.scores().get(20).value());
        assertEquals("inconsistent", r.scores().get(20).classification());
        assertEquals("consistent", r.scores().get(21).classification());
        assertFalse(hasWarning(r, "censored-share"));
    }

    @Test
    void aLargeCensoredShareIsWarned() {
        List<ParticipantResult> list = results(new double[] {1.0, 1.1, 0.9, 1.05, 0.95});
        list.add(new ParticipantResult("C1", "<0.5", 0.5, true, null, null, null));
        list.add(new ParticipantResult("C2", "<0.5", 0.5, true, null, null, null));
        Result r = MeasurandEvaluation.evaluate(new Input("Pb", "mg/kg", list, null, null, null));
        assertTrue(hasWarning(r, "censored-share"));
        assertTrue(hasWarning(r, "few-participants"));
    }

    @Test
    void zeroSpreadGivesNoConsensusAndNoScores() {
        Result r = MeasurandEvaluation.evaluate(new Input("Si", "% m/m",
                results(new double[] {5.0, 5.0, 5.0, 5.1, 4.9}), null, null, null));
        assertTrue(hasWarning(r, "zero-spread"));
        assertNull(r.assignedValue());
        assertNull(r.sigmaPt());
        assertNull(r.robustSd());
        assertEquals(0.0, r.madE());
        r.scores().forEach(s -> {
            assertNull(s.z());
            assertNull(s.classification());
        });
    }

    @Test
    void zeroSpreadWithAGivenPlanStillScores() {
        Result r = MeasurandEvaluation.evaluate(new Input("Si", "% m/m",
                results(new double[] {5.0, 5.0, 5.0, 5.1, 4.9}), 5.0, 0.0, 0.05));
        // arithmetic: (5.1 - 5.0) / 0.05 = 2.0, satisfactory at the boundary
        assertEquals(2.0, r.scores().get(3).z(), 1e-9);
        assertEquals("satisfactory", r.scores().get(3).classification());
    }

    @Test
    void oneResultIsReportedButNotScored() {
        Result r = MeasurandEvaluation.evaluate(new Input("Cr", "% m/m", results(new double[] {18.1}), null, null, null));
        assertEquals(1, r.n());
        assertEquals(18.1, r.median());
        assertNull(r.robustMean());
        assertNull(r.iterations());
        assertTrue(hasWarning(r, "too-few-values"));
        assertNull(r.scores().get(0).z());
    }

    @Test
    void twoPopulationsAreWarnedAsMultimodal() {
        double[] values = new double[24];
        for (int i = 0; i < 12; i++) {
            values[i] = 1.00 + 0.002 * (i - 6);
            values[12 + i] = 1.10 + 0.002 * (i - 6);
        }
        Result r = MeasurandEvaluation.evaluate(new Input("Cu", "% m/m", results(values), null, null, null));
        assertTrue(hasWarning(r, "multimodal"));
    }

    @Test
    void aResultExcludedFromTheStatisticsChangesNothingButIsStillScored() {
        // a blunder (decimal point slipped: 7.48 for 0.748) left out of the statistics: every statistic equals
        // the evaluation of the 20 others exactly, and the blunder is scored against their x_pt
        Result without = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", results(MANGANESE), null, null, 0.010));
        List<ParticipantResult> with = new ArrayList<>(results(MANGANESE));
        with.add(new ParticipantResult("L21", "7.48", 7.48, false, 0.008, 2.0, "OES").excluded());
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", with, null, null, 0.010));

        assertEquals(20, r.n());
        assertEquals(1, r.excludedFromStatistics());
        assertEquals(without.assignedValue(), r.assignedValue(), 0.0);
        assertEquals(without.assignedValueUncertainty(), r.assignedValueUncertainty(), 0.0);
        assertEquals(without.median(), r.median(), 0.0);
        assertEquals(without.nIqr(), r.nIqr(), 0.0);
        assertEquals(21, r.scores().size());
        // arithmetic: z = (7.48 − x*)/0.010 with x* of the 20 others
        assertEquals((7.48 - without.assignedValue()) / 0.010, r.scores().get(20).z(), 1e-9);
        assertEquals("unsatisfactory", r.scores().get(20).classification());
    }

    @Test
    void onlyAnExcludedResultWithUncertaintyGivesNoBiasWarning() {
        // ζ of a result outside the consensus is not biased by it
        List<ParticipantResult> list = new ArrayList<>();
        for (int i = 0; i < MANGANESE.length; i++) {
            list.add(new ParticipantResult("L" + i, Double.toString(MANGANESE[i]), MANGANESE[i], false, null, null, null));
        }
        list.add(new ParticipantResult("L21", "0.9", 0.9, false, 0.008, 2.0, null).excluded());
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", list, null, null, 0.010));
        assertFalse(hasWarning(r, "zeta-en-biased"));
        assertTrue(r.scores().get(20).zeta() != null);
    }

    @Test
    void thePlanRulesChooseQuartilesStoppingAndBands() {
        MeasurandEvaluation.Rules legacy = new MeasurandEvaluation.Rules(
                org.roundtable.statistics.robust.QuartileRule.HYNDMAN_FAN_6,
                org.roundtable.statistics.robust.AlgorithmA.StoppingRule.THIRD_SIGNIFICANT_FIGURE,
                org.roundtable.statistics.score.BoundaryRule.SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3);
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "% m/m", results(MANGANESE), null, null, 0.010, legacy));
        // CALC (statistics reference §14.2): nIQR of the Mn data with R quantile(type = 6): 0.00630105 (rel 1e-8)
        assertEquals(0.00630105, r.nIqr(), 0.00630105 * 1e-8);
        // CALC (AlgorithmATest, legacy rule): 6 iterations, x* 0.7475538 (abs 1e-7)
        assertEquals(6, r.iterations());
        assertEquals(0.7475538, r.assignedValue(), 1e-7);
        assertEquals(legacy.quartileRule(), r.quartileRule());
        assertEquals(legacy.stoppingRule(), r.stoppingRule());
        assertEquals(legacy.boundaryRule(), r.boundaryRule());
    }

    @Test
    void aSigmaPtThePlanCannotGiveIsNeverReplacedByTheRobustSd() {
        // invented values about 0 (blank-corrected results); the plan's sigma_pt method gives none here
        double[] values = {-0.004, -0.002, 0.0, 0.002, 0.004, -0.001, 0.001, -0.003, 0.003, 0.0};
        Result r = MeasurandEvaluation.evaluate(new Input("Cu", "%", results(values), null, null, null,
                MeasurandEvaluation.Rules.DEFAULT, MeasurandEvaluation.Decimals.NONE,
                MeasurandEvaluation.SmallRounds.DEFAULT, "Horwitz is not defined at x_pt = 0"));
        assertNull(r.sigmaPt());
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("no-sigma-pt")
                && w.message().contains("Horwitz is not defined at x_pt = 0")));
        assertTrue(r.warnings().stream().noneMatch(w -> w.code().equals("sigma-pt-data-derived")));
        assertTrue(r.scores().stream().allMatch(s -> s.z() == null && s.zPrime() == null));
        // the robust statistics of the negative values are computed all the same: x* = 0 by symmetry
        assertEquals(0.0, r.assignedValue(), 1e-15);
    }
}
