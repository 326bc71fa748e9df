package org.roundtable.report.model;

import java.util.Objects;

/**
 * Statistics of one method group (e.g. spark OES, combustion) for one measurand.
 *
 * @param methodGroup the method group's name
 * @param n number of results in the group
 * @param median median of the group's results
 * @param robustMean robust mean of the group, {@code null} when the group is too small
 * @param robustSd robust standard deviation of the group, {@code null} when the group is too small
 */
public record MethodGroupStatistics(String methodGroup, int n, double median, Double robustMean, Double robustSd) {

    public MethodGroupStatistics {
        Objects.requireNonNull(methodGroup, "methodGroup");
    }
}
