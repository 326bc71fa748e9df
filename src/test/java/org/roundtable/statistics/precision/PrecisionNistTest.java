package org.roundtable.statistics.precision;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.statistics.NistStrdFile;

/**
 * One-way ANOVA against the certified values of the eleven NIST StRD ANOVA files (PUB), and ISO
 * 5725-2 precision statistics derived exactly from their certified mean squares (DER).
 */
class PrecisionNistTest {

    /**
     * file, minimum LRE (digits) over SS, MS, F, R² and residual SD. Measured: SiRstv 13.1,
     * SmLs01-03 14.2-15, SmLs04-06 9.9-10.1, AtmWtAg 10.2, SmLs07-09 3.9-4.0. SmLs07-09 hold values
     * such as 1000000000000.4, whose spacing in double precision (1.2e-4) leaves only about four
     * significant digits of the deviations: no double-precision algorithm can do better.
     */
    static Stream<Arguments> anovaFiles() {
        return Stream.of(
                // lower difficulty
                Arguments.of("SiRstv", 13.0), Arguments.of("SmLs01", 14.0),
                Arguments.of("SmLs02", 14.0), Arguments.of("SmLs03", 14.0),
                // average difficulty (7 constant leading digits)
                Arguments.of("SmLs04", 9.5), Arguments.of("SmLs05", 9.5),
                Arguments.of("SmLs06", 9.5), Arguments.of("AtmWtAg", 10.0),
                // higher difficulty (13 constant leading digits)
                Arguments.of("SmLs07", 3.5), Arguments.of("SmLs08", 3.5),
                Arguments.of("SmLs09", 3.5));
    }

    @ParameterizedTest(name = "{0}: ANOVA table agrees with NIST to at least {1} digits (LRE)")
    @MethodSource("anovaFiles")
    void anovaAgreesWithNistCertifiedValues(String file, double digits) {
        NistStrdFile.Anova n = NistStrdFile.anova(file);
        OneWayAnova.Result a = OneWayAnova.of(n.groups());
        assertEquals(n.dfBetween(), a.dfBetween());
        assertEquals(n.dfWithin(), a.dfWithin());
        check(file, "SS between", a.ssBetween(), n.ssBetween(), digits);
        check(file, "SS within", a.ssWithin(), n.ssWithin(), digits);
        check(file, "MS between", a.msBetween(), n.msBetween(), digits);
        check(file, "MS within", a.msWithin(), n.msWithin(), digits);
        check(file, "F", a.f(), n.f(), digits);
        check(file, "R squared", a.rSquared(), n.rSquared(), digits);
        check(file, "residual SD", a.residualSd(), n.residualSd(), digits);
    }

    private static void check(String file, String what, double computed, double certified, double digits) {
        double lre = NistStrdFile.lre(computed, certified);
        assertTrue(lre >= digits, String.format("%s %s: computed %.15g, certified %.15g, LRE %.1f < %.1f",
                file, what, computed, certified, lre, digits));
    }

    /** file, s_r, s_L^2, s_L, s_R, r, R, relative tolerance. */
    static Stream<Arguments> precisionFiles() {
        // DER: derived exactly from the NIST StRD certified mean squares (s_r = certified residual SD, PUB)
        Object[] smls1 = {0.1, 1.0 / 105, 0.0975900072949, 0.139727626201, 0.28, 0.391237353363};
        Object[] smls2 = {0.1, 2.0 / 201, 0.0997509336108, 0.141245349503, 0.28, 0.395486978608};
        Object[] smls3 = {0.1, 20.0 / 2001, 0.0999750093711, 0.141403686298, 0.28, 0.395930321635};
        return Stream.of(
                Arguments.of("SiRstv", 0.104076068334656, 0.00039094748, 0.0197723918634, 0.105937601823,
                        0.2914129913, 0.2966252851, 1e-10),
                row("SmLs01", smls1, 1e-10), row("SmLs04", smls1, 1e-9), row("SmLs07", smls1, 1e-3),
                row("SmLs02", smls2, 1e-10), row("SmLs05", smls2, 1e-9), row("SmLs08", smls2, 1e-3),
                row("SmLs03", smls3, 1e-10), row("SmLs06", smls3, 1e-9), row("SmLs09", smls3, 1e-3),
                Arguments.of("AtmWtAg", 1.51048314446410E-05, 1.42091080918e-10, 1.19201963456e-05,
                        1.92418038107e-05, 4.229352804e-05, 5.387705067e-05, 1e-8));
    }

    private static Arguments row(String file, Object[] v, double tol) {
        return Arguments.of(file, v[0], v[1], v[2], v[3], v[4], v[5], tol);
    }

    @ParameterizedTest(name = "{0}: s_r {1}, s_L {3}, s_R {4}, r {5}, R {6} (rel {7})")
    @MethodSource("precisionFiles")
    void precisionStatisticsMatchValuesDerivedFromNistMeanSquares(String file, double sr, double sL2,
            double sL, double sR, double r, double bigR, double tol) {
        PrecisionExperiment.Result p = PrecisionExperiment.of(NistStrdFile.anova(file).groups());
        // the printed DER values of s_L^2 carry 11 significant digits: compare at most to 1e-10
        double t = Math.max(tol, 1e-10);
        assertEquals(sr, p.repeatabilitySd(), sr * t, "s_r");
        assertEquals(sL2, p.betweenLaboratoryVariance(), sL2 * t, "s_L^2");
        assertEquals(sL, p.betweenLaboratorySd(), sL * t, "s_L");
        assertEquals(sR, p.reproducibilitySd(), sR * t, "s_R");
        // r and R are printed to 10 significant digits: half a unit in the last digit is rel 2e-10
        double tLimits = Math.max(t, 2e-10);
        assertEquals(r, p.repeatabilityLimit(), r * tLimits, "r");
        assertEquals(bigR, p.reproducibilityLimit(), bigR * tLimits, "R");
    }
}
