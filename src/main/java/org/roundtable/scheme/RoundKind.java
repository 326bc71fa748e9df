package org.roundtable.scheme;

/** What a round is for. Stored by name in {@code round.kind}. */
public enum RoundKind {
    /** A proficiency round: assigned value, σpt and scores per laboratory. */
    PROFICIENCY_TEST,
    /**
     * An interlaboratory study of a measurement method's precision (ISO 5725-2): replicate results per level,
     * repeatability and reproducibility; no σpt and no scores.
     */
    PRECISION_EXPERIMENT
}
