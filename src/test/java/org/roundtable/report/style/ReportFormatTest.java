package org.roundtable.report.style;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

/** Display rounding and signs. Expected values: round half up on the shortest decimal form, common practice, no source. */
class ReportFormatTest {

    @ParameterizedTest
    @CsvSource({
        "0.748, 3, 0.748",
        "0.7485, 3, 0.749",
        "0.125, 2, 0.13",
        "86.4, 0, 86",
        "-2.3, 2, \u22122.30",
        "-0.001, 2, 0.00",
        "3.5199, 2, 3.52",
        "1e-5, 6, 0.000010"
    })
    void valuesAreRoundedHalfUpWithATrueMinusSign(double value, int digits, String expected) {
        assertThat(ReportFormat.decimal(value, digits)).isEqualTo(expected);
    }

    @Test
    void missingAndNonFiniteNumbersPrintAsADash() {
        assertThat(ReportFormat.decimal(null, 2)).isEqualTo(ReportFormat.NONE);
        assertThat(ReportFormat.score(Double.NaN)).isEqualTo(ReportFormat.NONE);
    }

    @Test
    void signedScoresCarryAPlusOnlyWhenPositive() {
        assertThat(ReportFormat.signedScore(1.254)).isEqualTo("+1.25");
        assertThat(ReportFormat.signedScore(-0.4)).isEqualTo("\u22120.40");
        assertThat(ReportFormat.signedScore(0.001)).isEqualTo("0.00");
    }

    @Test
    void hyphenMinusBeforeADigitInFreeTextBecomesAMinusSign() {
        assertThat(ReportFormat.minusSigns("-0.012")).isEqualTo("\u22120.012");
        assertThat(ReportFormat.minusSigns("LAS-2026-2")).isEqualTo("LAS-2026-2");
        assertThat(ReportFormat.minusSigns("from -3 to 3")).isEqualTo("from \u22123 to 3");
    }
}
