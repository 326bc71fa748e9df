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

    private static void require(double value, String name) {
        if (!(Double.isFinite(value) && value >= 0)) {
            throw new IllegalArgumentException(name + " must be a finite number >= 0, got " + value);
        }
    }
}
