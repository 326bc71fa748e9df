package org.roundtable.statistics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class AssignedValueUncertaintyTest {

    @Test
    void theComponentsAddInQuadrature() {
        // DER (one-line formula): sqrt(0.03² + 0.04² + 0) = 0.05 exactly in decimal; abs 1e-15
        assertEquals(0.05, AssignedValueUncertainty.combined(0.03, 0.04, 0), 1e-15);
        // u_char = U/2 = 0.02 of a certified value with U = 0.04, u_hom = s_s = 0.01169045 (the project's
        // statistics reference §14.8, constructed Cr, CALC); CALC:
        // python3 -c 'import math; print(math.sqrt(0.02**2 + 0.01169045**2))' -> 0.023166066157... (rel 1e-9)
        assertEquals(0.023166066157, AssignedValueUncertainty.combined(0.02, 0.01169045, 0), 0.023166066157 * 1e-9);
    }

    @Test
    void zeroComponentsAddNothing() {
        assertEquals(0.0123, AssignedValueUncertainty.combined(0.0123, 0, 0), 0.0);
        assertEquals(0.0, AssignedValueUncertainty.combined(0, 0, 0), 0.0);
    }

    @Test
    void aNegativeOrUndefinedComponentIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> AssignedValueUncertainty.combined(-0.1, 0, 0));
        assertThrows(IllegalArgumentException.class, () -> AssignedValueUncertainty.combined(0.1, Double.NaN, 0));
        assertThrows(IllegalArgumentException.class,
                () -> AssignedValueUncertainty.combined(0.1, 0, Double.POSITIVE_INFINITY));
    }

    @Test
    void theStabilityDifferenceIsTheHalfWidthOfARectangularDistribution() {
        // |ȳ1 − ȳ2| = 0.011 of the project's statistics reference §14.9 (constructed Cr, CALC); u_stab = |Δ|/√3
        // (ISO 13528:2015 / ISO Guide 35:2017 practice, from memory); CALC:
        // python3 -c 'import math; print(0.011/math.sqrt(3))' -> 0.006350852961085883 (rel 1e-12)
        assertEquals(0.006350852961085883, AssignedValueUncertainty.stabilityFromDifference(0.011), 0.00635085296 * 1e-12);
        assertEquals(0.006350852961085883, AssignedValueUncertainty.stabilityFromDifference(-0.011), 0.00635085296 * 1e-12);
        assertEquals(0.0, AssignedValueUncertainty.stabilityFromDifference(0), 0.0);
        assertThrows(IllegalArgumentException.class, () -> AssignedValueUncertainty.stabilityFromDifference(Double.NaN));
        // with u_char = 0.028 and u_hom² = s_s² = 0.000136666667 (§14.8, CALC): u(x_pt)² = 0.000784 + 0.000136666667
        // + 0.000121/3 = 0.000961, u(x_pt) = 0.031 (CALC, rel 1e-9)
        assertEquals(0.031, AssignedValueUncertainty.combined(0.028, Math.sqrt(0.000136666666667),
                AssignedValueUncertainty.stabilityFromDifference(0.011)), 0.031 * 1e-9);
    }
}
