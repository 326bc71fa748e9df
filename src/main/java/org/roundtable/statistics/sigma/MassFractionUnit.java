package org.roundtable.statistics.sigma;

/**
 * Units of mass fraction and their factor to a pure number (1 % m/m = 0.01; 1 mg/kg = 1e-6).
 */
public enum MassFractionUnit {
    /** Pure number (kg/kg). */
    MASS_FRACTION(1.0),
    /** % m/m (g/100 g). */
    PERCENT(1e-2),
    /** g/kg, ‰. */
    GRAMS_PER_KILOGRAM(1e-3),
    /** mg/kg, ppm by mass. */
    MILLIGRAMS_PER_KILOGRAM(1e-6),
    /** µg/kg, ppb by mass. */
    MICROGRAMS_PER_KILOGRAM(1e-9);

    private final double toMassFraction;

    MassFractionUnit(double toMassFraction) {
        this.toMassFraction = toMassFraction;
    }

    /** Factor converting a value in this unit to a pure mass fraction. */
    public double toMassFraction() {
        return toMassFraction;
    }
}
