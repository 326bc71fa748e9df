package org.roundtable.platform;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The fast text of doubles against the slow forms it replaces: {@link Double#toString(double)} of Java 17 (the
 * reference: the characters must be the same, and they must read back as the same double) and
 * {@link NumberFormats#plain(Double, int)}. Random doubles from a seeded generator; edge cases by hand.
 */
class DoubleTextTest {

    private final DoubleText text = new DoubleText();
    private final byte[] buffer = new byte[400];

    private String java(double v) {
        return new String(buffer, 0, text.appendJava(v, buffer, 0), StandardCharsets.US_ASCII);
    }

    private String plain(double v, int decimals) {
        return new String(buffer, 0, text.appendPlain(v, decimals, buffer, 0), StandardCharsets.US_ASCII);
    }

    private void assertSameAsJava(double v) {
        String fast = java(v);
        assertEquals(Double.toString(v), fast, () -> "bits " + Long.toHexString(Double.doubleToRawLongBits(v)));
        if (Double.isFinite(v)) {
            assertEquals(Double.doubleToLongBits(v), Double.doubleToLongBits(Double.parseDouble(fast)), fast);
        }
    }

    private void assertSameAsNumberFormats(double v, int decimals) {
        assertEquals(NumberFormats.plain(v, decimals), plain(v, decimals), () -> v + " at " + decimals);
    }

    /** Doubles of every kind: any bit pattern, and numbers of the sizes results, statistics and scores have. */
    private static double randomDouble(SplittableRandom random, int kind) {
        return switch (kind) {
            case 0 -> Double.longBitsToDouble(random.nextLong());
            case 1 -> random.nextDouble() * Math.pow(10, random.nextInt(-12, 13));
            case 2 -> (random.nextDouble() - 0.5) * 20;
            default -> Math.round(random.nextDouble() * 1e6) / Math.pow(10, random.nextInt(0, 9));
        };
    }

    @Test
    void twoMillionRandomDoublesReadAsJava17DoubleToStringWritesThemAndReadBackTheSame() {
        SplittableRandom random = new SplittableRandom(20261202);
        for (int i = 0; i < 2_000_000; i++) {
            assertSameAsJava(randomDouble(random, i % 4));
        }
    }

    @Test
    void halfAMillionRandomDoublesPrintAsNumberFormatsPrintsThemAtAnyDecimals() {
        SplittableRandom random = new SplittableRandom(17);
        for (int i = 0; i < 500_000; i++) {
            double v = randomDouble(random, i % 4);
            if (Math.abs(v) < 1e30 || !Double.isFinite(v)) {
                assertSameAsNumberFormats(v, random.nextInt(0, 14));
            }
        }
    }

    private static List<Double> edgeCases() {
        List<Double> values = new ArrayList<>(List.of(0.0, -0.0, Double.MIN_VALUE, -Double.MIN_VALUE,
                2 * Double.MIN_VALUE, 3 * Double.MIN_VALUE, 10 * Double.MIN_VALUE, Double.MIN_NORMAL,
                Math.nextDown(Double.MIN_NORMAL), Math.nextUp(Double.MIN_NORMAL), Double.MAX_VALUE,
                -Double.MAX_VALUE, Math.nextDown(Double.MAX_VALUE), 9007199254740992.0, 9007199254740993.0,
                Math.nextDown(9007199254740992.0), 4503599627370496.0, Math.nextUp(4503599627370496.0), 1e7,
                Math.nextDown(1e7), Math.nextUp(1e7), 1e-3, Math.nextDown(1e-3), Math.nextUp(1e-3), 0.1, 0.2, 0.3,
                0.1 + 0.2, 1.0 / 3, 2.0 / 3, 0.125, 0.005, 1.005, 2.5, 9.995, 99.995, 0.0005, 2e23, 1e23, 8.41e21,
                5e-324, 2.82879384806159e17, 1.387364135037754e18, 1.45800632428665e17, 2.0e-3, 1.0e-5,
                123456789012345680.0, 0.05000690258976824, 1.2897910341183131E-5));
        for (int e = -325; e <= 308; e++) {
            double p = Double.parseDouble("1e" + e);
            values.add(p);
            values.add(Math.nextUp(p));
            values.add(Math.nextDown(p));
            values.add(Double.parseDouble("9.5e" + e));
            values.add(Double.parseDouble("5e" + e));
        }
        for (int e = -1074; e <= 1023; e++) {
            double p = Math.scalb(1.0, e);
            values.add(p);
            values.add(Math.nextUp(p));
            values.add(Math.nextDown(p));
            values.add(3 * p);
        }
        return values;
    }

    @Test
    void subnormalsPowersOfTenAndOfTwoTheLimitsAndTheSwitchToAnExponentReadAsJavaWritesThem() {
        for (double v : edgeCases()) {
            assertSameAsJava(v);
            assertSameAsJava(-v);
        }
        assertSameAsJava(Double.NaN);
        assertSameAsJava(Double.POSITIVE_INFINITY);
        assertSameAsJava(Double.NEGATIVE_INFINITY);
    }

    @Test
    void theEdgeCasesPrintAsNumberFormatsPrintsThem() {
        for (double v : edgeCases()) {
            for (int decimals = 0; decimals <= 13; decimals++) {
                assertSameAsNumberFormats(v, decimals);
                assertSameAsNumberFormats(-v, decimals);
            }
        }
        assertEquals("", plain(Double.NaN, 2));
        assertEquals("", plain(Double.POSITIVE_INFINITY, 2));
        assertEquals("0.00", plain(-0.004, 2));
        assertEquals("-0.13", plain(-0.125, 2));
        assertEquals("1.01", plain(1.005, 2));
        assertEquals("10.00", plain(9.995, 2));
        assertEquals("0.01", plain(0.005, 2));
        assertEquals("0.0000129", plain(1.2897910341183131E-5, 7));
        assertEquals("3", plain(2.5, 0));
    }

    @Test
    void textIsAppendedAtTheGivenPlace() {
        byte[] out = "x=..........".getBytes(StandardCharsets.US_ASCII);
        int end = text.appendJava(0.5, out, 2);
        assertEquals("x=0.5", new String(out, 0, end, StandardCharsets.US_ASCII));
        end = text.appendPlain(0.5, 2, out, end);
        assertEquals("x=0.50.50", new String(out, 0, end, StandardCharsets.US_ASCII));
    }
}
