package org.roundtable.statistics;

/**
 * Standard uncertainty of the assigned value with the contributions of the proficiency test items.
 *
 * <p>Definition: {@code u(x_pt) = sqrt(u_char² + u_hom² + u_stab²)}.
 *
 * <p>Symbols: u_char standard uncertainty of the characterisation of the assigned value (e.g. U/k of a
 * certified value, or 1.25·s*&#47;√p of a consensus); u_hom between-item standard deviation s_s of the
 * homogeneity check when the items' inhomogeneity is added instead of being negligible; u_stab standard
 * uncertainty for instability of the items over the round.
 *
 * <p>Special cases: a component of 0 adds nothing; a negative or non-finite component is refused.
 *
 * @throws IllegalArgumentException (all methods) a component that is negative or not finite
 *
 * <p>References: ISO 13528:2015, clause 7 (uncertainty of the assigned value, with the homogeneity and
 * stability components of the items); ISO Guide 35:2017 (u_char, u_hom, u_stab of a property value). Both
 * from memory: the sub-clauses are not checked.
 */
public final class AssignedValueUncertainty {

    private AssignedValueUncertainty() {
    }

    /**
     * sqrt(u_char² + u_hom² + u_stab²).
     *
     * @throws IllegalArgumentException a component that is negative or not finite
     */
    public static double combined(double characterisation, double homogeneity, double stability) {
        require(characterisation, "u_char");
        require(homogeneity, "u_hom");
        require(stability, "u_stab");
        return Math.sqrt(characterisation * characterisation + homogeneity * homogeneity + stability * stability);
    }

    /**
     * Standard uncertainty for instability of the items from the stability check: the observed difference taken as
     * the half-width of a rectangular distribution.
     *
     * <p>Definition: {@code u_stab = |ȳ1 − ȳ2| / √3}.
     *
     * <p>Symbols: ȳ1 mean of the check at the start (the homogeneity data), ȳ2 mean of the items measured at or after
     * the end of the round; |ȳ1 − ȳ2| the largest difference observed (a rectangular distribution of half-width a
     * has standard deviation a/√3).
     *
     * <p>Special cases: a difference of 0 gives 0; the sign of the difference does not matter.
     *
     * @param difference ȳ1 − ȳ2 (or its absolute value)
     * @throws IllegalArgumentException a difference that is not finite
     *
     * <p>References: ISO 13528:2015, Annex B (stability check) and ISO Guide 35:2017 (uncertainty from stability
     * studies, rectangular distribution of the largest observed change); both from memory, the clauses are not
     * checked. JCGM 100:2008 (GUM), 4.3.7 (rectangular distribution, a/√3), from memory.
     */
    public static double stabilityFromDifference(double difference) {
        if (!Double.isFinite(difference)) {
            throw new IllegalArgumentException("the stability difference must be a finite number, got " + difference);
        }
        return Math.abs(difference) / Math.sqrt(3);
    }

    private static void require(double value, String name) {
        if (!(Double.isFinite(value) && value >= 0)) {
            throw new IllegalArgumentException(name + " must be a finite number >= 0, got " + value);
        }
    }
}
