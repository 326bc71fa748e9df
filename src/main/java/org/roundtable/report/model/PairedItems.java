package org.roundtable.report.model;

import java.util.Objects;

/**
 * Two measurand sections measured on a pair of similar items, shown together in a Youden plot.
 *
 * @param firstMeasurandId {@link MeasurandSection#id()} of the result on the first item (x axis)
 * @param secondMeasurandId {@link MeasurandSection#id()} of the result on the second item (y axis)
 */
public record PairedItems(String firstMeasurandId, String secondMeasurandId) {

    public PairedItems {
        Objects.requireNonNull(firstMeasurandId, "firstMeasurandId");
        Objects.requireNonNull(secondMeasurandId, "secondMeasurandId");
    }
}
