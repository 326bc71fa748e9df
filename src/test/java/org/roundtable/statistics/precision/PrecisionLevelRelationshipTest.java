package org.roundtable.statistics.precision;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.roundtable.statistics.precision.PrecisionLevelRelationship.Fit;
import org.roundtable.statistics.precision.PrecisionLevelRelationship.Model;

class PrecisionLevelRelationshipTest {

    private static final double[] M = {0.05, 0.2, 0.8, 1.5};
    private static final double[] S = {0.0025, 0.0036, 0.0085, 0.0141};

    @Test
    void proportionalFitIsTheMeanRatioOfSdToLevel() {
        // hand arithmetic (ISO 5725-2:1994 7.5, weights 1/ŝ², from memory): b = mean(s/m)
        Fit f = PrecisionLevelRelationship.fit(Model.PROPORTIONAL, new double[] {1, 2, 4}, new double[] {0.01, 0.03, 0.05});
        assertEquals(0.0125, f.slope(), 1e-15);
        assertArrayEquals(new double[] {-0.0025, 0.005, 0}, f.residuals(), 1e-15);
        // CALC: python3 -c "import numpy as np; print(np.mean(s/m))" with M and S above
        assertEquals(0.02200625, PrecisionLevelRelationship.fit(Model.PROPORTIONAL, M, S).slope(), 1e-14);
    }

    @Test
    void linearFitMatchesIteratedWeightedLeastSquares() {
        // CALC (NumPy 2.4): w = 1/s²; 200 times: solve (XᵀWX)β = XᵀWs, w = 1/(c + d·m)²
        Fit f = PrecisionLevelRelationship.fit(Model.LINEAR, M, S);
        assertEquals(0.00207375333672, f.intercept(), 1e-13);
        assertEquals(0.00798366237138, f.slope(), 1e-13);
        assertArrayEquals(new double[] {2.70635447e-05, -7.04858110e-05, 3.93167662e-05, 5.07531062e-05},
                f.residuals(), 1e-12);
        assertTrue(f.warnings().isEmpty(), f.warnings().toString());
    }

    @Test
    void powerFitIsOrdinaryLeastSquaresOnDecimalLogarithms() {
        // hand arithmetic: lg m = 0, 1, 2 and lg s = 0, 1, 3 give d = 1.5, c = 4/3 − 1.5 = −1/6
        Fit f = PrecisionLevelRelationship.fit(Model.POWER, new double[] {1, 10, 100}, new double[] {1, 10, 1000});
        assertEquals(1.5, f.slope(), 1e-14);
        assertEquals(-1.0 / 6, f.intercept(), 1e-14);
        // CALC: numpy.polyfit(log10(M), log10(S), 1)
        Fit g = PrecisionLevelRelationship.fit(Model.POWER, M, S);
        assertEquals(0.509624337519, g.slope(), 1e-11);
        assertEquals(-1.9970558668, g.intercept(), 1e-10);
        assertEquals(g.fitted()[2], g.predict(0.8), 1e-15);
    }

    @Test
    void exactRelationshipsAreRecoveredWithZeroResiduals() {
        double[] m = {0.1, 0.5, 1.0, 2.0};
        double[] lin = new double[4];
        double[] pow = new double[4];
        for (int j = 0; j < 4; j++) {
            lin[j] = 0.001 + 0.01 * m[j];
            pow[j] = 0.01 * Math.pow(m[j], 0.7);
        }
        Fit l = PrecisionLevelRelationship.fit(Model.LINEAR, m, lin);
        assertEquals(0.001, l.intercept(), 1e-15);
        assertEquals(0.01, l.slope(), 1e-15);
        Fit p = PrecisionLevelRelationship.fit(Model.POWER, m, pow);
        assertEquals(0.7, p.slope(), 1e-12);
        assertEquals(0.0, p.relativeResidualRms(), 1e-12);
    }

    @Test
    void fitAllLeavesOutModelsTheDataCannotSupport() {
        List<Fit> two = PrecisionLevelRelationship.fitAll(new double[] {1, 2}, new double[] {0.1, 0.2});
        assertEquals(List.of(Model.PROPORTIONAL), two.stream().map(Fit::model).toList());
        assertEquals(3, PrecisionLevelRelationship.fitAll(M, S).size());
        assertThrows(IllegalArgumentException.class,
                () -> PrecisionLevelRelationship.fit(Model.POWER, new double[] {1, 2, 3}, new double[] {0.1, 0, 0.3}));
        assertThrows(IllegalArgumentException.class,
                () -> PrecisionLevelRelationship.fit(Model.LINEAR, new double[] {1, 1, 1}, new double[] {0.1, 0.2, 0.3}));
    }
}
