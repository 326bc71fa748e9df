package org.roundtable.statistics.robust;

import org.roundtable.statistics.DemoData;
import org.roundtable.statistics.NistStrdFile;

/** Data sets shared by the robust-estimator tests. */
final class TestData {

    /** Creosote cell means (see {@link DemoData#creosote()}). */
    static final double[] CREOSOTE = DemoData.creosote();

    /** Mn round (see {@link DemoData#manganese()}). */
    static final double[] MANGANESE = DemoData.manganese();

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
