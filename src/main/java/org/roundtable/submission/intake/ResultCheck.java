package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.EnumMap;
import java.util.List;
import java.util.Map;

/**
 * The server's validation of one result's numbers, for a channel that reads its own file — the offline
 * {@code evaluate} command: the same {@link ResultValidator} code (cell rules, plain decimals, "less than", negative
 * values only where the measurand allows them, at most 100 %, U not zero, k between 1 and 4), so that the same bad
 * row gets the same problem key and the same message from the server's upload and from {@code evaluate}.
 *
 * <p>One instance reads one file, row after row (it remembers the file's decimal separator, as the upload does); it
 * is not thread-safe. Columns are named as in the upload's CSV header ({@code value}, {@code expanded_uncertainty},
 * {@code coverage_factor}).
 */
public final class ResultCheck {

    /**
     * A result's checked numbers.
     *
     * @param value               the value (the limit of a "less than" result)
     * @param lessThan            whether the value was reported as {@code <number}
     * @param expandedUncertainty U, or null when not stated
     * @param coverageFactor      k, or null when not stated
     */
    public record Numbers(BigDecimal value, boolean lessThan, BigDecimal expandedUncertainty,
                          BigDecimal coverageFactor) {
    }

    /** Either the checked numbers or the problems of the row (in the upload's order), never both. */
    public record Outcome(Numbers numbers, List<IntakeProblem> problems) {
    }

    private final ResultValidator validator;

    /**
     * A check for one file.
     *
     * @param semicolonSeparated whether the file is separated by ';' — then a decimal comma is accepted, one
     *                           separator throughout the file, as in the upload
     */
    public ResultCheck(boolean semicolonSeparated) {
        this.validator = new ResultValidator(null, Limits.defaults(), semicolonSeparated
                ? ResultValidator.NumberStyle.POINT_OR_COMMA_CONSISTENT : ResultValidator.NumberStyle.POINT_ONLY,
                UploadColumn::headerName);
    }

    /**
     * Checks one result's numbers by the upload's rules.
     *
     * @param row                 the row number named in problems (the header is row 1)
     * @param measurand           the measurand as named in messages
     * @param negativeAllowed     whether a negative value is a result of this measurand (the plan's choice)
     * @param unit                the unit as written; the 100 % rule applies to {@code %} and {@code mg/kg}
     * @param value               the value cell, {@code <number} for a "less than" result
     * @param expandedUncertainty the U cell, empty when not stated
     * @param coverageFactor      the k cell, empty when not stated
     */
    public Outcome check(int row, String measurand, boolean negativeAllowed, String unit, String value,
                         String expandedUncertainty, String coverageFactor) {
        Map<UploadColumn, String> cells = new EnumMap<>(UploadColumn.class);
        cells.put(UploadColumn.VALUE, value);
        cells.put(UploadColumn.EXPANDED_UNCERTAINTY, expandedUncertainty);
        cells.put(UploadColumn.COVERAGE_FACTOR, coverageFactor);
        ResultValidator.Numbers n = validator.numbers(row, cells, measurand, true, negativeAllowed,
                MassFractionUnit.fromSymbol(unit).orElse(null));
        List<IntakeProblem> problems = validator.takeProblems();
        if (!problems.isEmpty()) {
            return new Outcome(null, problems);
        }
        return new Outcome(new Numbers(n.value().value(), n.lessThan(),
                n.expandedUncertainty() == null ? null : n.expandedUncertainty().value(),
                n.coverageFactorReported() ? n.coverageFactor().value() : null), List.of());
    }
}
