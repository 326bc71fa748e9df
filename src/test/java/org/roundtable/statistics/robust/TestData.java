package org.roundtable.statistics.robust;

import org.roundtable.statistics.NistStrdFile;

/** Data sets shared by the robust-estimator tests. */
final class TestData {

    /**
     * Creosote cell means: ISO 5725-5:1998 example, as quoted in a public statistics-package
     * example (secondary, not checked against the standard).
     */
    static final double[] CREOSOTE = {24.140, 20.155, 19.500, 20.300, 20.705, 17.570, 20.100,
        20.940, 21.185};

    /** Mn in low-alloy steel, % m/m, p = 20: constructed demo data. */
    static final double[] MANGANESE = {0.742, 0.751, 0.748, 0.739, 0.755, 0.746, 0.744, 0.750,
        0.747, 0.741, 0.753, 0.745, 0.749, 0.738, 0.752, 0.743, 0.746, 0.790, 0.772, 0.748};

    /** Five values, more than half identical: constructed. */
    static final double[] MOSTLY_EQUAL = {5.0, 5.0, 5.0, 5.1, 4.9};

    private TestData() {
    }

    static double[] named(String name) {
        return switch (name) {
            case "creosote" -> CREOSOTE;
            case "manganese" -> MANGANESE;
            case "1 2 3 4 100" -> new double[] {1, 2, 3, 4, 100};
            case "10.1 10.2 10.6" -> new double[] {10.1, 10.2, 10.6};
            case "10.1 10.3" -> new double[] {10.1, 10.3};
            default -> NistStrdFile.univariate(name).data();
        };
    }
}
