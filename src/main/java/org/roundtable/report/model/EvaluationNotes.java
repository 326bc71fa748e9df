package org.roundtable.report.model;

import java.util.List;
import java.util.Objects;

/**
 * How the evaluation was done.
 *
 * @param methods statistical methods used, one sentence each
 * @param stoppingRule the stopping rule of the iterative robust method
 * @param boundaryRule how scores on a classification boundary are treated
 * @param quartileRule the quartile definition used for nIQR
 * @param lateResultPolicy what happens to results received after the deadline
 * @param exclusions results excluded from the statistics, with reasons
 */
public record EvaluationNotes(List<String> methods, String stoppingRule, String boundaryRule, String quartileRule,
        String lateResultPolicy, List<Exclusion> exclusions) {

    public EvaluationNotes {
        methods = List.copyOf(methods);
        Objects.requireNonNull(stoppingRule, "stoppingRule");
        Objects.requireNonNull(boundaryRule, "boundaryRule");
        Objects.requireNonNull(quartileRule, "quartileRule");
        lateResultPolicy = lateResultPolicy == null ? "" : lateResultPolicy;
        exclusions = List.copyOf(exclusions);
    }
}
