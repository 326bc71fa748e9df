package org.roundtable.statistics.sigma;

import org.roundtable.statistics.Checks;

/**
 * Helpers for the standard deviation for proficiency assessment σ_pt.
 *
 * <p>Definitions:
 * <ul>
 * <li>fixed: σ_pt given by expert judgement (ISO 13528:2015, 8.2);</li>
 * <li>percentage of the assigned value: {@code σ_pt = (P/100)·|x_pt|};</li>
 * <li>Horwitz: {@code σ_H = 0.02·c^0.8495}, c the mass fraction as a pure number;</li>
 * <li>Thompson-modified Horwitz: {@code 0.22·c} for {@code c < 1.2e-7};
 * {@code 0.02·c^0.8495} for {@code 1.2e-7 ≤ c ≤ 0.138}; {@code 0.01·c^0.5} for
 * {@code c > 0.138} (boundaries: the middle branch includes both limits);</li>
 * <li>from a precision experiment: {@code σ_pt = sqrt(σ_R² − σ_r²·(1 − 1/n))} when
 * participants report the mean of n replicates (ISO 13528:2015, 8.5).</li>
 * </ul>
 *
 * <p>Symbols: c mass fraction (1 % m/m → 0.01, 1 mg/kg → 1e-6); σ_R, σ_r reproducibility and
 * repeatability SD; n replicates per reported result. The unit-aware methods convert the value
 * to c, apply the function and convert σ back to the measurand's unit.
 *
 * <p>Special cases: the Horwitz functions are defined for 0 &lt; c ≤ 1; c ≤ 0 (a consensus of blank-corrected
 * results may be negative) is refused with a message that says so. A negative
 * {@code σ_R² − σ_r²(1 − 1/n)} (σ_r &gt; σ_R) is refused.
 *
 * @throws IllegalArgumentException (all methods) arguments outside their domain
 *
 * <p>References: Horwitz W., Kamps L.R., Boyer K.W. (1980) J. Assoc. Off. Anal. Chem.
 * 63:1344–1354; Thompson M. (2000) Recent trends in inter-laboratory precision at ppb and sub-ppb
 * concentrations in relation to fitness for purpose criteria in proficiency testing. Analyst
 * 125:385–386; ISO 13528:2015, clause 8 (8.2 fixed, 8.5 from a precision experiment).
 */
public final class SigmaPt {

    /** Horwitz exponent (rounds 1 − 0.5·log10 2 = 0.849485). */
    public static final double HORWITZ_EXPONENT = 0.8495;
    /** Horwitz coefficient. */
    public static final double HORWITZ_COEFFICIENT = 0.02;
    /** Lower limit of Thompson's middle (Horwitz) branch. */
    public static final double THOMPSON_LOWER_LIMIT = 1.2e-7;
    /** Upper limit of Thompson's middle (Horwitz) branch. */
    public static final double THOMPSON_UPPER_LIMIT = 0.138;
    /** Relative SD below the lower limit (22 %). */
    public static final double THOMPSON_LOW_RSD = 0.22;
    /** Coefficient above the upper limit: σ = 0.01·c^0.5. */
    public static final double THOMPSON_HIGH_COEFFICIENT = 0.01;

    private SigmaPt() {
    }

    /** A fixed σ_pt, checked to be finite and &gt; 0. */
    public static double fixed(double sigmaPt) {
        Checks.requirePositive(sigmaPt, "sigma_pt");
        return sigmaPt;
    }

    /** {@code σ_pt = (percent/100)·|x_pt|}. */
    public static double percentOfAssigned(double percent, double assigned) {
        Checks.requirePositive(percent, "percent");
        Checks.requireFinite(assigned, "assigned value");
        double sigma = percent / 100 * Math.abs(assigned);
        Checks.requirePositive(sigma, "sigma_pt from a percentage of the assigned value");
        return sigma;
    }

    /** Horwitz σ_H = 0.02·c^0.8495 for a pure mass fraction c in (0, 1]. */
    public static double horwitz(double massFraction) {
        requireMassFraction(massFraction);
        return HORWITZ_COEFFICIENT * Math.pow(massFraction, HORWITZ_EXPONENT);
    }

    /**
     * Horwitz relative SD in percent in its other published form, {@code 2^(1 − 0.5·log10 c)}
     * (differs from 0.02·c^0.8495/c in the fifth digit).
     */
    public static double horwitzRsdPercentPowerOfTwoForm(double massFraction) {
        requireMassFraction(massFraction);
        return Math.pow(2, 1 - 0.5 * Math.log10(massFraction));
    }

    /** Thompson-modified Horwitz σ for a pure mass fraction c in (0, 1]. */
    public static double thompsonHorwitz(double massFraction) {
        requireMassFraction(massFraction);
        if (massFraction < THOMPSON_LOWER_LIMIT) {
            return THOMPSON_LOW_RSD * massFraction;
        }
        if (massFraction <= THOMPSON_UPPER_LIMIT) {
            return HORWITZ_COEFFICIENT * Math.pow(massFraction, HORWITZ_EXPONENT);
        }
        return THOMPSON_HIGH_COEFFICIENT * Math.sqrt(massFraction);
    }

    /** Horwitz σ for a value in the given unit, returned in the same unit. */
    public static double horwitz(double value, MassFractionUnit unit) {
        double c = value * unit.toMassFraction();
        return horwitz(c) / unit.toMassFraction();
    }

    /** Thompson-modified Horwitz σ for a value in the given unit, returned in the same unit. */
    public static double thompsonHorwitz(double value, MassFractionUnit unit) {
        double c = value * unit.toMassFraction();
        return thompsonHorwitz(c) / unit.toMassFraction();
    }

    /**
     * σ_pt from reproducibility and repeatability SDs when results are means of n replicates:
     * {@code sqrt(σ_R² − σ_r²(1 − 1/n))}.
     */
    public static double fromPrecision(double reproducibilitySd, double repeatabilitySd, int replicates) {
        Checks.requirePositive(reproducibilitySd, "sigma_R");
        if (!(Double.isFinite(repeatabilitySd) && repeatabilitySd >= 0)) {
            throw new IllegalArgumentException("sigma_r must be a finite number >= 0, got " + repeatabilitySd);
        }
        if (replicates < 1) {
            throw new IllegalArgumentException("n must be >= 1, got " + replicates);
        }
        double variance = reproducibilitySd * reproducibilitySd
                - repeatabilitySd * repeatabilitySd * (1 - 1.0 / replicates);
        if (!(variance > 0)) {
            throw new IllegalArgumentException("sigma_R^2 - sigma_r^2(1 - 1/n) is not positive:"
                    + " sigma_r exceeds sigma_R");
        }
        return Math.sqrt(variance);
    }

    private static void requireMassFraction(double c) {
        if (Double.isFinite(c) && c <= 0) {
            throw new IllegalArgumentException("the Horwitz function is not defined for a mass fraction of zero or"
                    + " below, got " + c + " (a consensus of blank-corrected results can be negative): use a fixed"
                    + " sigma_pt");
        }
        if (!(Double.isFinite(c) && c > 0 && c <= 1)) {
            throw new IllegalArgumentException("mass fraction must be in (0, 1], got " + c
                    + " (convert % by dividing by 100, mg/kg by multiplying by 1e-6)");
        }
    }
}
