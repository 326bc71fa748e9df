package org.roundtable.scheme;

/**
 * Whether a round holds laboratories' results, asked by the round's lifecycle (a round that holds results is
 * cancelled only with a reason). The submission feature answers it, so that scheme does not reach into
 * submission's tables.
 */
public interface RoundResults {

    /** The number of laboratories that have submitted at least one revision of results for the round. */
    long laboratoriesWithResults(long roundId);
}
