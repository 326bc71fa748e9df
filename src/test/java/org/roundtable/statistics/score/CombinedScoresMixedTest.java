package org.roundtable.statistics.score;

import org.junit.jupiter.api.Test;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** z and z′ as one series (the score used per result), as a laboratory's history combines them. */
class CombinedScoresMixedTest {

    @Test
    void zAndZPrimeCombineAsOneSeries() {
        // hand computation, common practice, no source: RSZ = (1.0 + 2.5 − 2.0)/√3 = 0.8660254;
        // SSZ = 1 + 6.25 + 4 = 11.25; χ²₃ quantiles 7.8147 / 11.3449 (R: qchisq(c(.95,.99), 3)); abs 1e-6 / 1e-4
        CombinedScores.Result r = CombinedScores.combine(List.of(new CombinedScores.Score(ScoreKind.Z, 1.0),
                new CombinedScores.Score(ScoreKind.Z_PRIME, 2.5), new CombinedScores.Score(ScoreKind.Z, -2.0)));
        assertEquals(0.8660254, r.rescaledSum(), 1e-6);
        assertEquals(11.25, r.sumOfSquares(), 1e-12);
        assertEquals(11.3449, r.chiSquared99(), 1e-4);
        assertEquals(Classification.QUESTIONABLE, r.sumOfSquaresClass());
        assertEquals(ScoreKind.Z_PRIME, r.kind());
        assertEquals(3, r.count());
    }

    @Test
    void zetaIsNotMixedWithZNorEnCombined() {
        assertThrows(IllegalArgumentException.class, () -> CombinedScores.combine(List.of(
                new CombinedScores.Score(ScoreKind.Z_PRIME, 1), new CombinedScores.Score(ScoreKind.ZETA, 1))));
        assertThrows(IllegalArgumentException.class, () -> CombinedScores.combine(List.of(
                new CombinedScores.Score(ScoreKind.EN, 1))));
    }
}
