package org.roundtable.report.model;

import java.util.Objects;

/**
 * Homogeneity and stability result of the test item for one measurand.
 *
 * @param measurandId the {@link MeasurandSection#id()} the check belongs to
 * @param betweenSampleSd between-sample standard deviation s_s
 * @param homogeneityLimit the criterion s_s was compared with (e.g. 0.3·σ_pt)
 * @param homogeneous whether the item passed the homogeneity check
 * @param stabilityDifference absolute difference between the stability and homogeneity means
 * @param stabilityLimit the criterion the difference was compared with (e.g. 0.3·σ_pt)
 * @param stable whether the item passed the stability check
 * @param note free text, e.g. "10 discs in duplicate, spark OES"; may be empty
 */
public record ItemCheck(String measurandId, double betweenSampleSd, double homogeneityLimit, boolean homogeneous,
        double stabilityDifference, double stabilityLimit, boolean stable, String note) {

    public ItemCheck {
        Objects.requireNonNull(measurandId, "measurandId");
        note = note == null ? "" : note;
    }
}
