package org.roundtable.statistics;

/**
 * Data sets shared by the statistics tests. Each accessor returns a fresh copy.
 */
public final class DemoData {

    private static final double[] CREOSOTE = {24.140, 20.155, 19.500, 20.300, 20.705, 17.570,
        20.100, 20.940, 21.185};

    private static final double[] MANGANESE = {0.742, 0.751, 0.748, 0.739, 0.755, 0.746, 0.744,
        0.750, 0.747, 0.741, 0.753, 0.745, 0.749, 0.738, 0.752, 0.743, 0.746, 0.790, 0.772, 0.748};

    private DemoData() {
    }

    /**
     * Creosote cell means: ISO 5725-5:1998 example, as quoted in a public statistics-package
     * example (secondary, not checked against the standard).
     */
    public static double[] creosote() {
        return CREOSOTE.clone();
    }

    /** Mn in low-alloy steel, % m/m, p = 20: constructed demo data (two high results, L18 and L19). */
    public static double[] manganese() {
        return MANGANESE.clone();
    }
}
