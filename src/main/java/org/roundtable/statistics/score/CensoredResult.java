package org.roundtable.statistics.score;

/**
 * Consistency of a "less than" result ({@code <X}) with the assigned value.
 *
 * <p>Definition: a result reported as {@code <X} claims the true value lies below X. It is
 * <em>inconsistent</em> when {@code X < x_pt} (the assigned value is excluded by the claim) and
 * <em>consistent</em> otherwise. Boundary rule (ours): {@code X = x_pt} counts as consistent,
 * since limits are reported rounded.
 *
 * <p>Special cases: censored results are excluded from the robust statistics and never scored
 * (z, ζ, En are undefined for them).
 *
 * <p>References: ISO 13528:2015, 5.5.3 and 6.3 (treatment of censored results; sub-clauses from
 * memory); common practice for the consistency rule, no source.
 */
public final class CensoredResult {

    /** Consistency of a less-than result. */
    public enum Consistency {
        CONSISTENT("consistent"),
        INCONSISTENT("inconsistent");

        private final String word;

        Consistency(String word) {
            this.word = word;
        }

        /** Lower-case word used in JSON and reports. */
        public String word() {
            return word;
        }
    }

    private CensoredResult() {
    }

    /**
     * Classifies {@code <limit} against the assigned value.
     *
     * @throws IllegalArgumentException if an argument is not finite
     */
    public static Consistency classifyLessThan(double limit, double assigned) {
        if (!Double.isFinite(limit) || !Double.isFinite(assigned)) {
            throw new IllegalArgumentException("limit and assigned value must be finite");
        }
        return limit < assigned ? Consistency.INCONSISTENT : Consistency.CONSISTENT;
    }
}
