package org.roundtable.statistics.score;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The two boundary rules differ only at exactly |z| = 2 and |z| = 3. Bands of the first rule: ISO/IEC
 * 17043:2010 Annex B (B.4.1.1); the second rule is a plan's convention (common practice, no source). The
 * scores are exact decimal arithmetic on the band limits (no tolerance).
 */
class BoundaryRuleTest {

    @ParameterizedTest(name = "z = {0}: {1} / {2}")
    @CsvSource({
        "0.0, satisfactory, satisfactory",
        "1.9999999, satisfactory, satisfactory",
        "2.0, satisfactory, questionable",
        "-2.0, satisfactory, questionable",
        "2.0000001, questionable, questionable",
        "2.9999999, questionable, questionable",
        "3.0, unsatisfactory, questionable",
        "-3.0, unsatisfactory, questionable",
        "3.0000001, unsatisfactory, unsatisfactory",
    })
    void theRulesAgreeExceptAtExactlyTwoAndThree(double z, String toTwoFromThree, String belowTwoAboveThree) {
        assertEquals(toTwoFromThree, BoundaryRule.SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3.classify(z).word());
        assertEquals(belowTwoAboveThree, BoundaryRule.SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3.classify(z).word());
        assertEquals(Scores.classifyZ(z), BoundaryRule.DEFAULT.classify(z));
    }

    @ParameterizedTest
    @CsvSource({"NaN", "Infinity"})
    void aScoreThatIsNotFiniteIsRefusedByBothRules(double z) {
        for (BoundaryRule rule : BoundaryRule.values()) {
            assertThrows(IllegalArgumentException.class, () -> rule.classify(z));
        }
    }
}
