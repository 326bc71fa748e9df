package org.roundtable.statistics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.statistics.MeasurandEvaluation.Decimals;
import org.roundtable.statistics.MeasurandEvaluation.Input;
import org.roundtable.statistics.MeasurandEvaluation.ParticipantResult;
import org.roundtable.statistics.MeasurandEvaluation.Result;
import org.roundtable.statistics.MeasurandEvaluation.Rules;
import org.roundtable.statistics.MeasurandEvaluation.SmallRounds;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.QuartileRule;
import org.roundtable.statistics.score.BoundaryRule;
import org.roundtable.statistics.score.ScoreKind;
import org.roundtable.statistics.score.ScoreSelection;
import org.roundtable.statistics.score.Scores;

/**
 * Verdicts an assessor can re-check by hand from the printed decimals: scores are classified as printed (rounded half
 * away from zero to the plan's score decimals), the z/z′ choice is exact where its inputs are decimals, En takes both
 * uncertainties at one coverage factor, small rounds are not scored against their own consensus.
 *
 * <p>Check values: the results lie exactly on ±2σpt and ±3σpt in decimal arithmetic (x = x_pt ± c·σpt, hand
 * arithmetic); the bands are ISO/IEC 17043:2010 Annex B (B.4.1.1) and ISO 13528:2015 9.3–9.7; u(x_pt) ≤ 0.3σpt is
 * ISO 13528:2015 9.2.1. Exact, no tolerance.
 */
class VerdictRulesTest {

    private static final Rules OTHER_BOUNDARY = new Rules(QuartileRule.DEFAULT, AlgorithmA.StoppingRule.FULL_CONVERGENCE,
            BoundaryRule.SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3);

    /** x_pt, σpt, a result exactly c·σpt away in decimal, c, the verdict under each boundary rule. */
    static Stream<Arguments> resultsOnTheBoundaries() {
        return Stream.of(
                Arguments.of("0.150", "0.005", "0.160", 2, "satisfactory", "questionable"),
                Arguments.of("0.150", "0.005", "0.135", -3, "unsatisfactory", "questionable"),
                Arguments.of("0.150", "0.005", "0.140", -2, "satisfactory", "questionable"),
                Arguments.of("0.150", "0.005", "0.165", 3, "unsatisfactory", "questionable"),
                Arguments.of("0.80", "0.018", "0.836", 2, "satisfactory", "questionable"),
                Arguments.of("0.80", "0.018", "0.746", -3, "unsatisfactory", "questionable"),
                Arguments.of("1.1", "0.03", "1.16", 2, "satisfactory", "questionable"),
                Arguments.of("1.1", "0.03", "1.01", -3, "unsatisfactory", "questionable"),
                Arguments.of("12.7", "0.35", "13.4", 2, "satisfactory", "questionable"),
                Arguments.of("12.7", "0.35", "11.65", -3, "unsatisfactory", "questionable"),
                Arguments.of("0.3", "0.1", "0.5", 2, "satisfactory", "questionable"),
                Arguments.of("0.3", "0.1", "0.6", 3, "unsatisfactory", "questionable"));
    }

    @ParameterizedTest(name = "x_pt {0}, σpt {1}, x {2}: z = {3}")
    @MethodSource("resultsOnTheBoundaries")
    void aResultExactlyOnABoundaryIsClassifiedAsPrintedUnderBothRules(String xpt, String sigma, String x, int c,
            String toTwoFromThree, String belowTwoAboveThree) {
        // the decimal check: x − x_pt is exactly c·σpt
        assertEquals(0, new BigDecimal(x).subtract(new BigDecimal(xpt))
                .compareTo(new BigDecimal(sigma).multiply(BigDecimal.valueOf(c))));
        List<ParticipantResult> one = List.of(new ParticipantResult("L01", x, Double.parseDouble(x), false, null,
                null, null));
        Result r = MeasurandEvaluation.evaluate(new Input("Cu", "%", one, Double.parseDouble(xpt), 0.0,
                Double.parseDouble(sigma)));
        assertEquals(toTwoFromThree, r.scores().get(0).classification());
        assertEquals("%.2f".formatted((double) c), "%.2f".formatted(r.scores().get(0).z()));
        Result other = MeasurandEvaluation.evaluate(new Input("Cu", "%", one, Double.parseDouble(xpt), 0.0,
                Double.parseDouble(sigma), OTHER_BOUNDARY));
        assertEquals(belowTwoAboveThree, other.scores().get(0).classification());
    }

    @Test
    void theBoundaryCasesIncludeBinaryScoresOnBothSidesOfTheLimit() {
        // (0.160 − 0.150)/0.005 = 2.0000000000000018 and (0.135 − 0.150)/0.005 = −2.999999999999997 in binary:
        // classified unrounded they were questionable; as printed (2.00, −3.00) they are on the boundaries
        assertTrue(Scores.z(0.160, 0.150, 0.005).getAsDouble() > 2);
        assertTrue(Scores.z(0.135, 0.150, 0.005).getAsDouble() > -3);
        assertEquals("questionable", Scores.classifyZ(Scores.z(0.160, 0.150, 0.005).getAsDouble()).word());
        assertEquals("satisfactory", BoundaryRule.DEFAULT.classifyAsPrinted(2.0000000000000018, 2).word());
        assertEquals("unsatisfactory", BoundaryRule.DEFAULT.classifyAsPrinted(-2.999999999999997, 2).word());
        // half away from zero: 2.005 prints 2.01 at two decimals, −2.995 prints −3.00 (hand arithmetic)
        assertEquals("questionable", BoundaryRule.DEFAULT.classifyAsPrinted(2.005, 2).word());
        assertEquals("unsatisfactory", BoundaryRule.DEFAULT.classifyAsPrinted(-2.995, 2).word());
        assertEquals("satisfactory", BoundaryRule.DEFAULT.classifyAsPrinted(2.004, 2).word());
        // with one decimal 2.04 prints 2.0: satisfactory
        assertEquals("satisfactory", BoundaryRule.DEFAULT.classifyAsPrinted(2.04, 1).word());
    }

    @Test
    void uOfTheAssignedValueExactlyThreeTenthsOfSigmaPtSelectsZ() {
        // U = 0.0108 at k = 2 gives u = 0.0054 = 0.3 · 0.018 exactly (hand arithmetic); in binary 0.0054/0.018
        // = 0.30000000000000004
        assertTrue(0.0054 / 0.018 > 0.3);
        assertEquals(ScoreKind.Z, ScoreSelection.chooseExact(new BigDecimal("0.0108"), new BigDecimal("2"),
                new BigDecimal("0.018")).kind());
        assertEquals(ScoreKind.Z_PRIME, ScoreSelection.chooseExact(new BigDecimal("0.0109"), new BigDecimal("2"),
                new BigDecimal("0.018")).kind());
        // U = 0.0162 at k = 3 gives u = 0.0054 too
        assertEquals(ScoreKind.Z, ScoreSelection.chooseExact(new BigDecimal("0.0162"), new BigDecimal("3"),
                new BigDecimal("0.018")).kind());
        // doubles: within the relative tolerance 1e-12
        assertEquals(ScoreKind.Z, ScoreSelection.choose(0.0108 / 2, 0.018).kind());
        assertEquals(ScoreKind.Z_PRIME, ScoreSelection.choose(0.0054 * (1 + 1e-9), 0.018).kind());

        List<ParticipantResult> one = List.of(new ParticipantResult("L01", "0.81", 0.81, false, null, null, null));
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", one, 0.80, 0.0108, 0.018, Rules.DEFAULT,
                new Decimals(new BigDecimal("0.0108"), new BigDecimal("2"), new BigDecimal("0.018")),
                SmallRounds.DEFAULT));
        assertEquals(ScoreKind.Z, r.scoreUsed());
    }

    @Test
    void anEnOfExactlyOneIsSatisfactory() {
        // x − x_pt = 0.010, sqrt(0.006² + 0.008²) = 0.010 exactly in decimal (a 3-4-5 triangle); binary gives
        // 1.0000000000000009
        double en = Scores.en(0.160, 0.150, 0.008, 0.006).getAsDouble();
        assertTrue(en > 1);
        assertEquals("unsatisfactory", Scores.classifyEn(en).word());
        assertEquals("satisfactory", Scores.classifyEnAsPrinted(en, 2).word());
        assertEquals("unsatisfactory", Scores.classifyEnAsPrinted(1.005, 2).word());
    }

    @Test
    void enIsTheSameWhateverCoverageFactorTheLaboratoryStatedItsUncertaintyAt() {
        // u = 0.004 stated as U = 0.004 (k = 1), 0.008 (k = 2), 0.012 (k = 3): with both at k = 2,
        // En = 0.010/sqrt(0.008² + 0.006²) = 1 (hand arithmetic)
        List<ParticipantResult> labs = List.of(
                new ParticipantResult("L01", "0.160", 0.160, false, 0.004, 1.0, null),
                new ParticipantResult("L02", "0.160", 0.160, false, 0.008, 2.0, null),
                new ParticipantResult("L03", "0.160", 0.160, false, 0.012, 3.0, null));
        Result r = MeasurandEvaluation.evaluate(new Input("Cu", "%", labs, 0.150, 0.006, 0.005));
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            assertEquals(1.0, s.en(), 1e-12, s.participant());
        }
        // at the plan's k = 3: En = 0.010/sqrt(0.012² + 0.009²) = 0.6667 (hand arithmetic)
        Rules atThree = new Rules(QuartileRule.DEFAULT, AlgorithmA.StoppingRule.FULL_CONVERGENCE, BoundaryRule.DEFAULT,
                2, 3.0);
        Result three = MeasurandEvaluation.evaluate(new Input("Cu", "%", labs, 0.150, 0.006, 0.005, atThree));
        assertEquals(0.010 / 0.015, three.scores().get(2).en(), 1e-12);
        assertEquals(3.0, three.coverageFactor());
    }

    static List<ParticipantResult> labs(double... values) {
        List<ParticipantResult> list = new ArrayList<>();
        for (int i = 0; i < values.length; i++) {
            list.add(new ParticipantResult("L%02d".formatted(i + 1), Double.toString(values[i]), values[i], false,
                    null, null, null));
        }
        return list;
    }

    @Test
    void twoResultsAreNotScoredAgainstTheirOwnConsensusAndTheRunSaysWhy() {
        // a ×10 slip: with a consensus of two the z-scores would be ±0.6236 whatever the data
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", labs(0.75, 7.5), null, null, null));
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("below-minimum")
                && w.message().contains("reference or certified value") && w.message().contains("information only")));
        assertNull(r.assignedValue());
        assertNull(r.sigmaPt());
        r.scores().forEach(s -> {
            assertNull(s.z());
            assertNull(s.classification());
        });
        assertFalse(r.informationOnly());
    }

    @Test
    void belowTheMinimumScoresForInformationOnlyCarryNoClassification() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", labs(0.74, 0.75, 0.76, 0.90), null, null, null,
                Rules.DEFAULT, Decimals.NONE, new SmallRounds(10, 10, true, null)));
        assertTrue(r.informationOnly());
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("information-only")));
        r.scores().forEach(s -> {
            assertNotNull(s.z());
            assertNull(s.classification());
        });
    }

    @Test
    void anIndependentAssignedValueAndSigmaPtScoreEvenASmallRound() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", labs(0.75, 0.80), 0.75, 0.002, 0.02));
        assertEquals("satisfactory", r.scores().get(0).classification());
        assertEquals("questionable", r.scores().get(1).classification());
        assertFalse(r.informationOnly());
    }

    @Test
    void aSubsetConsensusOfTooFewResultsIsNotScored() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", labs(0.75, 0.80), 0.75, 0.002, 0.02,
                Rules.DEFAULT, Decimals.NONE, new SmallRounds(10, 10, false, 4)));
        assertNull(r.scores().get(0).classification());
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("below-minimum")));
    }

    @Test
    void aLowerPlanMinimumLetsASmallRoundBeScored() {
        Result r = MeasurandEvaluation.evaluate(new Input("Mn", "%", labs(0.74, 0.75, 0.76, 0.75, 0.745), null, null,
                0.02, Rules.DEFAULT, Decimals.NONE, new SmallRounds(5, 10, false, null)));
        assertNotNull(r.scores().get(0).classification());
    }

    @Test
    void moreThanHalfIdenticalWithAGivenSigmaPtIsScoredAgainstTheMedian() {
        double[] values = {0.50, 0.50, 0.50, 0.50, 0.50, 0.50, 0.51, 0.49, 0.52, 0.56, 0.50, 0.50};
        Result r = MeasurandEvaluation.evaluate(new Input("Cr", "%", labs(values), null, null, 0.02));
        assertEquals(MeasurandEvaluation.AssignedValueSource.MEDIAN, r.assignedValueSource());
        assertEquals(0.50, r.assignedValue());
        assertTrue(r.warnings().stream().anyMatch(w -> w.code().equals("scored-against-median")));
        // (0.56 − 0.50)/0.02 = 3.00 as printed: unsatisfactory
        assertEquals("unsatisfactory", r.scores().get(9).classification());

        Result dataDerived = MeasurandEvaluation.evaluate(new Input("Cr", "%", labs(values), null, null, null));
        assertNull(dataDerived.scores().get(9).classification());
        assertTrue(dataDerived.warnings().stream().anyMatch(w -> w.code().equals("no-sigma-pt")
                && w.message().contains("MADe = 0") && w.message().contains("information only")));
    }
}
