package org.roundtable.statistics.score;

/**
 * Chooses between z and z′ by the negligibility criterion for the uncertainty of the assigned
 * value, and records why.
 *
 * <p>Definition: if {@code u(x_pt) ≤ 0.3·σ_pt} the uncertainty of the assigned value is
 * negligible and z is used; otherwise z′ is used.
 *
 * <p>Symbols: u(x_pt) standard uncertainty of the assigned value; σ_pt standard deviation for
 * proficiency assessment; 0.3 the negligibility factor.
 *
 * <p>Special cases: the comparison is made on unrounded values; equality selects z.
 *
 * @throws IllegalArgumentException if σ_pt is not &gt; 0 or u(x_pt) is negative or not finite
 *
 * <p>References: ISO 13528:2015, 9.2.1 (criterion u(x_pt) ≤ 0.3σ_pt) and 9.5 (z′).
 */
public final class ScoreSelection {

    /** Factor of the negligibility criterion u(x_pt) ≤ 0.3·σ_pt. */
    public static final double NEGLIGIBLE_UNCERTAINTY_FACTOR = 0.3;

    /**
     * The choice and its reason.
     *
     * @param kind   {@link ScoreKind#Z} or {@link ScoreKind#Z_PRIME}
     * @param ratio  u(x_pt)/σ_pt
     * @param reason sentence for the report
     */
    public record Choice(ScoreKind kind, double ratio, String reason) {
    }

    private ScoreSelection() {
    }

    /**
     * Selects z or z′.
     *
     * @throws IllegalArgumentException see class comment
     */
    public static Choice choose(double assignedUncertainty, double sigmaPt) {
        if (!(Double.isFinite(sigmaPt) && sigmaPt > 0)) {
            throw new IllegalArgumentException("sigma_pt must be a finite number > 0, got " + sigmaPt);
        }
        if (!(Double.isFinite(assignedUncertainty) && assignedUncertainty >= 0)) {
            throw new IllegalArgumentException("u(x_pt) must be a finite number >= 0, got " + assignedUncertainty);
        }
        double ratio = assignedUncertainty / sigmaPt;
        if (ratio <= NEGLIGIBLE_UNCERTAINTY_FACTOR) {
            return new Choice(ScoreKind.Z, ratio, String.format(java.util.Locale.ROOT,
                    "u(x_pt)/sigma_pt = %.4g <= 0.3: uncertainty of the assigned value negligible, z used", ratio));
        }
        return new Choice(ScoreKind.Z_PRIME, ratio, String.format(java.util.Locale.ROOT,
                "u(x_pt)/sigma_pt = %.4g > 0.3: uncertainty of the assigned value not negligible, z' used", ratio));
    }
}
