package org.roundtable.statistics.descriptive;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.roundtable.statistics.NistStrdFile;

/**
 * Mean, SD and lag-1 autocorrelation against the certified values of the eight NIST StRD
 * univariate files (PUB: NIST Statistical Reference Datasets, certified to 15 digits or exact).
 * The assertion requires a minimum number of agreeing digits (LRE) per file.
 */
class DescriptiveNistTest {

    /**
     * file, minimum LRE for mean, SD and r(1). Measured: mean 15 everywhere; SD Lew/Lottery/NumAcc1
     * 15, Michelso 13.9, Mavro 13.1, NumAcc2 14.2, NumAcc3 9.5, NumAcc4 8.3 (1000000.1 and
     * 10000000.1 are not representable in binary); r(1) at least 13.4.
     */
    static Stream<Arguments> files() {
        return Stream.of(
                // lower difficulty
                Arguments.of("Michelso", 14.0, 13.5, 13.0),
                Arguments.of("Lew", 14.0, 14.0, 14.0),
                Arguments.of("Lottery", 14.0, 14.0, 14.0),
                Arguments.of("Mavro", 14.0, 13.0, 13.0),
                Arguments.of("NumAcc1", 14.0, 14.0, 14.0),
                // average difficulty
                Arguments.of("NumAcc2", 14.0, 14.0, 14.0),
                Arguments.of("NumAcc3", 14.0, 9.0, 14.0),
                // higher difficulty
                Arguments.of("NumAcc4", 14.0, 8.0, 14.0));
    }

    @ParameterizedTest(name = "{0}: mean, SD and r(1) agree with NIST to at least {1}/{2}/{3} digits")
    @MethodSource("files")
    void meanSdAndAutocorrelationAgreeWithNistCertifiedValues(String file, double meanDigits,
            double sdDigits, double lagDigits) {
        NistStrdFile.Univariate u = NistStrdFile.univariate(file);
        double mean = Descriptive.mean(u.data());
        double sd = Descriptive.standardDeviation(u.data());
        double lag1 = Descriptive.lag1Autocorrelation(u.data());
        double lreMean = NistStrdFile.lre(mean, u.mean());
        double lreSd = NistStrdFile.lre(sd, u.sd());
        double lreLag = NistStrdFile.lre(lag1, u.lag1());
        assertTrue(lreMean >= meanDigits, file + " mean " + mean + " LRE " + lreMean);
        assertTrue(lreSd >= sdDigits, file + " SD " + sd + " LRE " + lreSd);
        assertTrue(lreLag >= lagDigits, file + " r(1) " + lag1 + " LRE " + lreLag);
    }

    @Test
    void allEightUnivariateFilesAreParsedWithTheirStatedNumberOfObservations() {
        // NIST StRD: Michelso 100, Lew 200, Lottery 218, Mavro 50, NumAcc1 3, NumAcc2-4 1001
        int[] expected = {200, 218, 50, 100, 3, 1001, 1001, 1001};
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], NistStrdFile.univariate(NistStrdFile.UNIVARIATE.get(i)).data().length,
                    NistStrdFile.UNIVARIATE.get(i));
        }
    }

    @Test
    void creosoteCellMeansGiveMeanAndSd() {
        // CALC: computed independently in Python and R, no published source (input: ISO 5725-5:1998
        // creosote example as quoted secondarily)
        double[] x = org.roundtable.statistics.DemoData.creosote();
        assertEquals(20.5105555556, Descriptive.mean(x), 1e-10);
        assertEquals(1.7268965018, Descriptive.standardDeviation(x), 1e-10);
    }

    @Test
    void manganeseRoundGivesMeanAndSd() {
        // CALC: computed independently in Python and R, no published source (constructed data); rel 1e-9
        double[] x = org.roundtable.statistics.DemoData.manganese();
        assertEquals(0.74995, Descriptive.mean(x), 0.74995 * 1e-9);
        // SD printed to 9 significant digits: half a unit in the last digit (abs 5e-11)
        assertEquals(0.0119052178, Descriptive.standardDeviation(x), 5e-11);
    }

    @Test
    void rejectsNanAndTooFewValues() {
        assertThrows(IllegalArgumentException.class, () -> Descriptive.mean(new double[] {1, Double.NaN}));
        assertThrows(IllegalArgumentException.class, () -> Descriptive.standardDeviation(new double[] {1}));
        assertThrows(IllegalArgumentException.class, () -> Descriptive.mean(new double[0]));
        assertThrows(IllegalArgumentException.class,
                () -> Descriptive.lag1Autocorrelation(new double[] {2, 2, 2}));
    }
}
