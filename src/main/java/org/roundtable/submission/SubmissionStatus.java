package org.roundtable.submission;

/**
 * Where a laboratory enrolled in a round stands with its results, for the coordinator's submissions page: its
 * first results came by the deadline ({@link #SUBMITTED}), after it ({@link #LATE}, where the round takes late
 * results), or not at all ({@link #MISSING}).
 */
public enum SubmissionStatus {
    SUBMITTED,
    LATE,
    MISSING
}
