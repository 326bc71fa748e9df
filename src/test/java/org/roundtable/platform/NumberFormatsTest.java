package org.roundtable.platform;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** The product's number rules: rounding half away from zero, digits per kind, no exponent. Common practice, no source. */
class NumberFormatsTest {

    @ParameterizedTest(name = "{0} at {1} decimals prints {2}")
    @CsvSource({
            "0.125, 2, 0.13",
            "-0.125, 2, \u22120.13",
            "2.5, 0, 3",
            "-2.5, 0, \u22123",
            "-0.004, 2, 0.00",
            "1.005, 2, 1.01",
            "0.00029598268952, 5, 0.00030",
    })
    void roundsHalfAwayFromZeroFromTheShortestDecimal(double value, int decimals, String expected) {
        assertEquals(expected, NumberFormats.decimal(value, decimals));
    }

    @Test
    void statisticsCarryOneDigitMoreThanResults() {
        assertEquals("0.152", NumberFormats.result(0.15234, 3));
        assertEquals("0.1523", NumberFormats.statistic(0.15234, 3));
    }

    @Test
    void machineFormsUseAnAsciiMinusAndNeverAnExponent() {
        assertEquals("-0.37", NumberFormats.plainScore(-0.3666666666666679, 2));
        assertEquals("0.0002959826895276144", NumberFormats.full(2.959826895276144E-4));
        assertEquals("-0.3666666666666679", NumberFormats.full(-0.3666666666666679));
        assertEquals("12000000", NumberFormats.full(1.2E7));
        assertEquals("", NumberFormats.plain(null, 2));
        assertEquals(NumberFormats.NONE, NumberFormats.decimal(Double.NaN, 2));
    }

    @ParameterizedTest(name = "{0} at {1} significant digits prints {2}")
    @CsvSource({
            "0.01335989289173295, 3, 0.0134",
            "12.5, 2, 13",
            "1234.5, 4, 1235",
            "1234.5, 3, 1230",
            "-0.000123456, 2, \u22120.00012",
            "40.0, 3, 40.0",
    })
    void sharesAndRatiosPrintWithSignificantDigits(double value, int significant, String expected) {
        assertEquals(expected, NumberFormats.significant(value, significant));
    }

    @Test
    void signedScoresShowPlusOnlyAboveZero() {
        assertEquals("+1.25", NumberFormats.signedScore(1.25, 2));
        assertEquals("\u22120.40", NumberFormats.signedScore(-0.4, 2));
        assertEquals("0.00", NumberFormats.signedScore(-0.001, 2));
    }
}
