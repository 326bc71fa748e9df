package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * One accepted result: a measurand on one item, as reported and parsed.
 *
 * @param row                 the row it came from (spreadsheet numbering; JSON index + 1)
 * @param measurand           the element symbol
 * @param item                the item label (the round's only label when the upload did not name one)
 * @param valueAsReported     the value cell exactly as reported, including a leading {@code <}
 * @param value               the number: the result, or for a "less than" result its limit
 * @param lessThan            whether the result is "less than" {@code value}
 * @param unit                the unit as reported
 * @param canonicalUnit       the unit the round evaluates this measurand in
 * @param massFraction        {@code value} converted exactly to {@code canonicalUnit} (1 % = 10 000 mg/kg)
 * @param expandedUncertainty the expanded uncertainty U in {@code unit}, if reported
 * @param coverageFactor      the coverage factor k; {@code 2} when not reported
 * @param coverageFactorReported whether k was given in the upload (false when the default 2 was applied)
 * @param method              the method group
 * @param replicateCount      how many replicates the value is the mean of
 * @param replicateValues     the single replicate values in {@code unit}, if reported (empty otherwise)
 */
public record ReportedResult(int row, String measurand, String item, String valueAsReported, ReportedNumber value,
                             boolean lessThan, MassFractionUnit unit, MassFractionUnit canonicalUnit,
                             BigDecimal massFraction, Optional<ReportedNumber> expandedUncertainty,
                             ReportedNumber coverageFactor, boolean coverageFactorReported, MethodGroup method,
                             int replicateCount, List<ReportedNumber> replicateValues) {

    /** The coverage factor applied when a laboratory gives none. */
    public static final ReportedNumber DEFAULT_COVERAGE_FACTOR = new ReportedNumber("2", new BigDecimal("2"));

    public ReportedResult {
        Objects.requireNonNull(measurand, "measurand");
        Objects.requireNonNull(item, "item");
        Objects.requireNonNull(value, "value");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(canonicalUnit, "canonicalUnit");
        Objects.requireNonNull(massFraction, "massFraction");
        Objects.requireNonNull(expandedUncertainty, "expandedUncertainty");
        Objects.requireNonNull(coverageFactor, "coverageFactor");
        Objects.requireNonNull(method, "method");
        replicateValues = List.copyOf(replicateValues);
    }

    /** The limit of a "less than" result, empty for a numeric result. */
    public Optional<BigDecimal> lessThanLimit() {
        return lessThan ? Optional.of(value.value()) : Optional.empty();
    }

    /** The expanded uncertainty converted exactly to the canonical unit, if reported. */
    public Optional<BigDecimal> expandedUncertaintyInCanonicalUnit() {
        return expandedUncertainty.map(u -> unit.convert(u.value(), canonicalUnit));
    }
}
