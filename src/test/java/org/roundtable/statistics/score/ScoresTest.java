package org.roundtable.statistics.score;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvFileSource;
import org.junit.jupiter.params.provider.CsvSource;

class ScoresTest {

    static final double X_PT = 0.7475547640;
    static final double U_PT = 0.0017573609;
    static final double SIGMA_PT = 0.010;

    @ParameterizedTest(name = "{0}: z {4}, z'' {5}, zeta {6}, En {7} ({8}/{9})")
    @CsvFileSource(resources = "/statistics/score/manganese-scores.csv")
    void manganeseScoresMatchIndependentArithmetic(String lab, double x, double u, double bigU,
            double z, double zPrime, double zeta, double en, Classification zClass, Classification enClass) {
        double tol = 1e-6;
        assertEquals(z, Scores.z(x, X_PT, SIGMA_PT).getAsDouble(), tol, "z");
        assertEquals(zPrime, Scores.zPrime(x, X_PT, SIGMA_PT, U_PT).getAsDouble(), tol, "z'");
        assertEquals(zeta, Scores.zeta(x, X_PT, u, U_PT).getAsDouble(), tol, "zeta");
        assertEquals(en, Scores.en(x, X_PT, bigU, 2 * U_PT).getAsDouble(), tol, "En");
        assertEquals(zClass, Scores.classifyZ(z));
        assertEquals(enClass, Scores.classifyEn(en));
    }

    @Test
    void manganeseUncertaintyOfTheAssignedValueIsNegligible() {
        // CALC: u(x_pt)/sigma_pt = 0.175736 <= 0.3 (ISO 13528:2015 9.2.1 criterion); abs 1e-6
        ScoreSelection.Choice c = ScoreSelection.choose(U_PT, SIGMA_PT);
        assertEquals(ScoreKind.Z, c.kind());
        assertEquals(0.175736, c.ratio(), 1e-6);
        assertTrue(c.reason().contains("z used"));
    }

    @Test
    void largeUncertaintyOfTheAssignedValueSelectsZPrime() {
        ScoreSelection.Choice c = ScoreSelection.choose(0.0031, 0.010);
        assertEquals(ScoreKind.Z_PRIME, c.kind());
        // boundary: equality selects z (common practice, no source)
        assertEquals(ScoreKind.Z, ScoreSelection.choose(0.3, 1.0).kind());
    }

    @ParameterizedTest(name = "|z| = {0} is {1}")
    @CsvSource({
        // boundary rule, classified unrounded (ISO/IEC 17043:2010 Annex B bands; arithmetic)
        "2.0, SATISFACTORY", "-2.0, SATISFACTORY", "2.0000001, QUESTIONABLE",
        "2.9999999, QUESTIONABLE", "3.0, UNSATISFACTORY", "-3.0, UNSATISFACTORY", "0, SATISFACTORY"})
    void zBoundariesAreClassifiedUnrounded(double z, Classification expected) {
        assertEquals(expected, Scores.classifyZ(z));
    }

    @ParameterizedTest(name = "|En| = {0} is {1}")
    @CsvSource({"1.0, SATISFACTORY", "-1.0, SATISFACTORY", "1.0000001, UNSATISFACTORY"})
    void enBoundariesAreClassifiedUnrounded(double en, Classification expected) {
        assertEquals(expected, Scores.classifyEn(en));
    }

    @Test
    void undefinedScoresAreNotScoredRatherThanInfiniteOrNan() {
        assertFalse(Scores.z(1, 1, 0).isPresent());
        assertFalse(Scores.z(Double.NaN, 1, 1).isPresent());
        assertFalse(Scores.zeta(1.2, 1, 0, 0).isPresent());
        assertFalse(Scores.zeta(1.2, 1, Double.NaN, 0.1).isPresent());
        assertFalse(Scores.en(1.2, 1, -1, 0.1).isPresent());
        assertFalse(Scores.zPrime(1.2, 1, 0, 0).isPresent());
        assertFalse(Scores.percentDifference(1, 0).isPresent());
        assertThrows(IllegalArgumentException.class, () -> Scores.classifyZ(Double.NaN));
    }

    @Test
    void differenceAndPercentDifferenceArePlainArithmetic() {
        // arithmetic, no source
        assertEquals(0.02, Scores.difference(1.02, 1.0).getAsDouble(), 1e-15);
        assertEquals(2.0, Scores.percentDifference(1.02, 1.0).getAsDouble(), 1e-12);
        assertEquals(-5.0, Scores.percentDifference(0.95, 1.0).getAsDouble(), 1e-12);
    }

    @Test
    void lessThanBelowTheAssignedValueIsInconsistent() {
        assertEquals(CensoredResult.Consistency.INCONSISTENT, CensoredResult.classifyLessThan(0.5, 0.75));
        assertEquals(CensoredResult.Consistency.CONSISTENT, CensoredResult.classifyLessThan(0.8, 0.75));
        // our boundary rule: equality is consistent
        assertEquals(CensoredResult.Consistency.CONSISTENT, CensoredResult.classifyLessThan(0.75, 0.75));
    }

    @Test
    void combinedScoresOfFourZScores() {
        // CALC: RSZ = 2.000000, SSZ = 8.740000, chi2(4) 0.95/0.99 = 9.4877/13.2767 (Python and R,
        // no published source); abs 1e-4
        CombinedScores.Result r = CombinedScores.combine(ScoreKind.Z, new double[] {1.2, -0.8, 2.1, 1.5});
        assertEquals(2.0, r.rescaledSum(), 1e-4);
        assertEquals(8.74, r.sumOfSquares(), 1e-4);
        assertEquals(9.4877, r.chiSquared95(), 1e-4);
        assertEquals(13.2767, r.chiSquared99(), 1e-4);
        assertEquals(Classification.SATISFACTORY, r.rescaledSumClass());
        assertEquals(Classification.SATISFACTORY, r.sumOfSquaresClass());
        assertTrue(r.caveat().contains("independent"));
    }

    @ParameterizedTest(name = "chi-squared quantiles for m = {0}: {1} / {2}")
    @CsvSource({
        // CALC: R qchisq(c(.95,.99), m), no published source; abs 1e-4
        "2, 5.9915, 9.2103", "3, 7.8147, 11.3449", "5, 11.0705, 15.0863", "6, 12.5916, 16.8119"})
    void chiSquaredQuantilesOfTheSumOfSquares(int m, double q95, double q99) {
        CombinedScores.Result r = CombinedScores.combine(ScoreKind.Z, new double[m]);
        assertEquals(q95, r.chiSquared95(), 1e-4);
        assertEquals(q99, r.chiSquared99(), 1e-4);
    }

    @Test
    void combiningScoresOfDifferentKindsIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> CombinedScores.combine(List.of(
                new CombinedScores.Score(ScoreKind.Z, 1), new CombinedScores.Score(ScoreKind.ZETA, 1))));
        assertThrows(IllegalArgumentException.class, () -> CombinedScores.combine(ScoreKind.EN, new double[] {1}));
    }
}
