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
 * <p>Special cases: equality selects z. Where u(x_pt) and σ_pt both come from decimals (a plan's
 * or the command line's U(x_pt), its k and σ_pt), {@link #chooseExact} compares them exactly in
 * decimal as {@code U ≤ 0.3·k·σ_pt} (so u = U/k = 0.3·σ_pt is never lost to binary rounding).
 * Otherwise {@link #choose} compares the doubles with a relative tolerance of
 * {@value #RELATIVE_TOLERANCE}: {@code u ≤ 0.3·σ_pt·(1 + 1e-12)} — far below any digit a plan or
 * report states, far above the few ulps binary arithmetic adds (our choice, no source).
 *
 * @throws IllegalArgumentException if σ_pt is not &gt; 0 or u(x_pt) is negative or not finite
 *
 * <p>References: ISO 13528:2015, 9.2.1 (criterion u(x_pt) ≤ 0.3σ_pt) and 9.5 (z′).
 */
public final class ScoreSelection {

    /** Factor of the negligibility criterion u(x_pt) ≤ 0.3·σ_pt. */
    public static final double NEGLIGIBLE_UNCERTAINTY_FACTOR = 0.3;
    /** Relative tolerance of the comparison of doubles in {@link #choose}. */
    public static final double RELATIVE_TOLERANCE = 1e-12;
    private static final java.math.BigDecimal FACTOR = new java.math.BigDecimal("0.3");

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
        return choice(assignedUncertainty <= NEGLIGIBLE_UNCERTAINTY_FACTOR * sigmaPt * (1 + RELATIVE_TOLERANCE), ratio);
    }

    /**
     * Selects z or z′ exactly in decimal: z when {@code U(x_pt) ≤ 0.3·k·σ_pt}, i.e. u(x_pt) = U/k ≤ 0.3·σ_pt.
     *
     * @param assignedExpandedUncertainty U(x_pt) as a decimal, ≥ 0
     * @param coverageFactor              its k, &gt; 0
     * @param sigmaPt                     σ_pt as a decimal, &gt; 0
     * @throws IllegalArgumentException a null, negative or zero input where it must be positive
     */
    public static Choice chooseExact(java.math.BigDecimal assignedExpandedUncertainty,
            java.math.BigDecimal coverageFactor, java.math.BigDecimal sigmaPt) {
        if (sigmaPt == null || sigmaPt.signum() <= 0) {
            throw new IllegalArgumentException("sigma_pt must be > 0, got " + sigmaPt);
        }
        if (coverageFactor == null || coverageFactor.signum() <= 0) {
            throw new IllegalArgumentException("k must be > 0, got " + coverageFactor);
        }
        if (assignedExpandedUncertainty == null || assignedExpandedUncertainty.signum() < 0) {
            throw new IllegalArgumentException("U(x_pt) must be >= 0, got " + assignedExpandedUncertainty);
        }
        boolean negligible = assignedExpandedUncertainty.compareTo(FACTOR.multiply(coverageFactor).multiply(sigmaPt)) <= 0;
        double ratio = assignedExpandedUncertainty.doubleValue() / coverageFactor.doubleValue() / sigmaPt.doubleValue();
        return choice(negligible, ratio);
    }

    private static Choice choice(boolean negligible, double ratio) {
        if (negligible) {
            return new Choice(ScoreKind.Z, ratio, String.format(java.util.Locale.ROOT,
                    "u(x_pt)/sigma_pt = %.4g <= 0.3: uncertainty of the assigned value negligible, z used", ratio));
        }
        return new Choice(ScoreKind.Z_PRIME, ratio, String.format(java.util.Locale.ROOT,
                "u(x_pt)/sigma_pt = %.4g > 0.3: uncertainty of the assigned value not negligible, z' used", ratio));
    }
}
