package org.roundtable.report.model;

import java.util.Objects;

/**
 * Summary statistics of the participants' results for one measurand.
 *
 * @param method the robust method used, e.g. "Algorithm A (ISO 13528 C.3.1)"
 * @param robustMean robust mean x*
 * @param robustSd robust standard deviation s*
 * @param median median of the results
 * @param scaledMad MADe = 1.483·MAD
 * @param normalizedIqr nIQR = 0.7413·IQR
 * @param iterations iterations the robust method needed
 * @param converged whether the robust method met its stopping rule
 */
public record RobustStatistics(String method, double robustMean, double robustSd, double median,
        double scaledMad, double normalizedIqr, int iterations, boolean converged) {

    public RobustStatistics {
        Objects.requireNonNull(method, "method");
    }
}
