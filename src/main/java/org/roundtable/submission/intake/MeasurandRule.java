package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.Objects;
import java.util.Set;

/**
 * What a round expects for one measurand.
 *
 * @param element          the element symbol, H … U (validated against {@link ChemicalElements})
 * @param canonicalUnit    the unit the round evaluates in; results are converted to it exactly
 * @param allowedUnits     units a laboratory may report in; contains {@code canonicalUnit}
 * @param reportingDecimals decimals requested in the canonical unit; a result in the canonical unit with a different
 *                         number of decimals gets the warning {@code value.reporting-digits}
 * @param expectedLow      lower end of the expected range, in the canonical unit (warning only)
 * @param expectedHigh     upper end of the expected range, in the canonical unit (warning only)
 * @param allowedMethods   method groups a laboratory may report for this measurand
 * @param lessThanAllowed  whether a "less than" result ({@code <0.005}) is accepted
 * @param negativeAllowed  whether a negative value (and negative replicate values) is a result of this measurand —
 *                         a blank-corrected trace element; otherwise a negative value is refused
 *                         ({@code value.negative}, naming the measurand). Uncertainties and coverage factors are never
 *                         negative. With it the expected range may start below zero.
 */
public record MeasurandRule(String element, MassFractionUnit canonicalUnit, Set<MassFractionUnit> allowedUnits,
                            int reportingDecimals, BigDecimal expectedLow, BigDecimal expectedHigh,
                            Set<MethodGroup> allowedMethods, boolean lessThanAllowed, boolean negativeAllowed) {

    /** A rule that refuses negative values (the default). */
    public MeasurandRule(String element, MassFractionUnit canonicalUnit, Set<MassFractionUnit> allowedUnits,
                         int reportingDecimals, BigDecimal expectedLow, BigDecimal expectedHigh,
                         Set<MethodGroup> allowedMethods, boolean lessThanAllowed) {
        this(element, canonicalUnit, allowedUnits, reportingDecimals, expectedLow, expectedHigh, allowedMethods,
                lessThanAllowed, false);
    }

    public MeasurandRule {
        Objects.requireNonNull(element, "element");
        if (!ChemicalElements.isSymbol(element)) {
            throw new IllegalArgumentException("not an element symbol from H to U: " + element);
        }
        Objects.requireNonNull(canonicalUnit, "canonicalUnit");
        allowedUnits = Set.copyOf(allowedUnits);
        if (!allowedUnits.contains(canonicalUnit)) {
            throw new IllegalArgumentException("the canonical unit must be an allowed unit: " + element);
        }
        if (reportingDecimals < 0) {
            throw new IllegalArgumentException("reportingDecimals must be >= 0");
        }
        Objects.requireNonNull(expectedLow, "expectedLow");
        Objects.requireNonNull(expectedHigh, "expectedHigh");
        if ((expectedLow.signum() < 0 && !negativeAllowed) || expectedLow.compareTo(expectedHigh) > 0) {
            throw new IllegalArgumentException("expected range must satisfy 0 <= low <= high (low may be negative "
                    + "only where negative results are allowed): " + element);
        }
        allowedMethods = Set.copyOf(allowedMethods);
        if (allowedMethods.isEmpty()) {
            throw new IllegalArgumentException("at least one method group must be allowed: " + element);
        }
    }
}
