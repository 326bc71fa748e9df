package org.roundtable.submission.intake;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.function.Function;
import java.util.regex.Pattern;

/**
 * The one validation path of all channels: turns {@link RawRow}s into {@link ReportedResult}s, collecting every
 * problem and warning.
 *
 * <p>Cell rules, in this order for each cell:
 * <ol>
 *   <li>longer than {@link Limits#maxCellChars()} → {@code value.too-long};</li>
 *   <li>text starting with {@code = + - @}, tab or CR → {@code value.formula-prefix} (ASVS 5.0.0 1.2.10); in a numeric
 *       column a minus followed by a number is a negative number instead (see the result rules);</li>
 *   <li>any other control character (line feed, NUL …) → {@code value.control-character}.</li>
 * </ol>
 * Numbers are plain decimals: digits with at most one decimal separator ({@code 0.12}, {@code .5}); {@code NaN},
 * {@code Inf}, {@code Infinity}, {@code ∞} → {@code value.not-finite}; {@code 1e-3} → {@code value.exponent-not-allowed};
 * anything else → {@code value.not-a-number}. A decimal comma is accepted only where the {@link NumberStyle} allows
 * it. A value {@code <0.005} (spaces allowed after {@code <}) is a "less than" result with that limit.
 *
 * <p>Result rules: a negative value or replicate value → {@code value.negative} naming the measurand, unless the
 * measurand's rule allows negative results ({@link MeasurandRule#negativeAllowed()}, blank-corrected trace elements);
 * a negative U, k or "less than" limit → {@code value.negative} always; above 100 % or 1 000 000 mg/kg (or, where
 * negative values are allowed, below −100 %) → {@code value.above-100-percent}; U ≤ 0 →
 * {@code uncertainty.not-positive}; k outside 1 … 4 → {@code coverage-factor.out-of-range}; replicate count outside
 * 1 … maximum → {@code replicates.out-of-range}; replicate values not matching the count →
 * {@code replicates.count-mismatch}; the same (measurand, item) twice → {@code row.duplicate-measurand}.
 *
 * <p>Warnings (only on otherwise valid uploads): value outside the expected range, U larger than the value, decimals
 * differing from those requested, measurand of the round not reported.
 */
final class ResultValidator {

    /** How decimal separators are accepted. */
    enum NumberStyle {
        /** Only a decimal point (comma-separated CSV, JSON). */
        POINT_ONLY,
        /** Point or comma, but one of them throughout the file (semicolon-separated CSV). */
        POINT_OR_COMMA_CONSISTENT,
        /** Point or comma in each cell (XLSX text cells). */
        POINT_OR_COMMA
    }

    private static final Pattern PLAIN_DECIMAL = Pattern.compile("[0-9]+(?:[.,][0-9]+)?|[.,][0-9]+");
    private static final Pattern EXPONENT = Pattern.compile("(?:[0-9]+(?:[.,][0-9]*)?|[.,][0-9]+)[eE][+-]?[0-9]+");
    private static final Pattern NOT_FINITE = Pattern.compile("[+-]?(?:nan|inf|infinity|∞|1\\.#inf|1\\.#ind)",
            Pattern.CASE_INSENSITIVE);
    private static final Pattern WHOLE_NUMBER = Pattern.compile("[0-9]{1,9}");

    private final UploadRules rules;
    private final Limits limits;
    private final NumberStyle numberStyle;
    private final Function<UploadColumn, String> columnName;

    private final List<IntakeProblem> problems = new ArrayList<>();
    private final List<IntakeWarning> warnings = new ArrayList<>();
    private Character decimalSeparator;

    /** The outcome of validating all rows. */
    record Outcome(List<ReportedResult> results, List<IntakeWarning> warnings, List<IntakeProblem> problems,
                   Character decimalSeparator) {
    }

    ResultValidator(UploadRules rules, Limits limits, NumberStyle numberStyle,
                    Function<UploadColumn, String> columnName) {
        this.rules = rules;
        this.limits = limits;
        this.numberStyle = numberStyle;
        this.columnName = columnName;
    }

    /** Validates every row; {@code earlierProblems} (from the reader) are kept in front of the row problems. */
    Outcome validate(List<RawRow> rows, List<IntakeProblem> earlierProblems) {
        problems.addAll(earlierProblems);
        List<ReportedResult> results = new ArrayList<>();
        Set<String> reported = new HashSet<>();
        for (RawRow row : rows) {
            ReportedResult result = validateRow(row);
            if (result == null) {
                continue;
            }
            String key = result.measurand() + "\u0000" + result.item();
            if (!reported.add(key)) {
                problems.add(IntakeProblem.of(row.row(), columnName.apply(UploadColumn.MEASURAND),
                        result.measurand(), IntakeKey.ROW_DUPLICATE_MEASURAND, result.measurand()
                                + " is reported more than once for item " + result.item() + "."));
                continue;
            }
            results.add(result);
        }
        if (problems.isEmpty() && results.isEmpty()) {
            problems.add(IntakeProblem.ofFile(IntakeKey.FILE_NO_RESULTS, "The upload contains no results."));
        }
        if (problems.isEmpty()) {
            for (MeasurandRule rule : rules.measurands()) {
                for (String item : rules.itemLabels()) {
                    if (!reported.contains(rule.element() + "\u0000" + item)) {
                        warnings.add(IntakeWarning.of(0, null, rule.element(),
                                IntakeKey.WARNING_MEASURAND_NOT_REPORTED, rule.element() + " is not reported"
                                        + (rules.paired() ? " for item " + item : "") + "."));
                    }
                }
            }
        }
        return new Outcome(results, List.copyOf(warnings), List.copyOf(problems), decimalSeparator);
    }

    private ReportedResult validateRow(RawRow raw) {
        int problemsBefore = problems.size();
        int row = raw.row();
        Map<UploadColumn, String> cells = raw.cells();

        MeasurandRule rule = null;
        String measurand = textCell(row, UploadColumn.MEASURAND, cells, true);
        if (measurand != null) {
            rule = measurandRule(row, measurand);
        }

        String item = textCell(row, UploadColumn.ITEM, cells, rules.paired());
        if (item == null && !rules.paired() && !cells.containsKey(UploadColumn.ITEM)) {
            item = rules.itemLabels().get(0);
        } else if (item != null && !rules.itemLabels().contains(item)) {
            problems.add(problem(row, UploadColumn.ITEM, item, IntakeKey.ITEM_UNKNOWN,
                    "The item '" + Texts.shown(item) + "' is not one of " + rules.itemLabels() + "."));
            item = null;
        }

        MassFractionUnit unit = null;
        String unitText = textCell(row, UploadColumn.UNIT, cells, true);
        if (unitText != null) {
            unit = unit(row, unitText, rule);
        }

        MethodGroup method = null;
        String methodText = textCell(row, UploadColumn.METHOD, cells, true);
        if (methodText != null) {
            method = method(row, methodText, rule);
        }

        Numbers numbers = numbers(row, cells, rule == null ? null : rule.element(),
                rule == null || rule.lessThanAllowed(), rule != null && rule.negativeAllowed(), unit);
        String valueText = numbers.valueText();
        ReportedNumber value = numbers.value();
        boolean lessThan = numbers.lessThan();
        ReportedNumber uncertainty = numbers.expandedUncertainty();
        ReportedNumber coverageFactor = numbers.coverageFactor();
        boolean coverageFactorReported = numbers.coverageFactorReported();

        Integer replicateCount = null;
        String replicatesText = cellText(row, UploadColumn.REPLICATES, cells, true, true);
        if (replicatesText != null) {
            replicateCount = replicateCount(row, replicatesText);
        }

        List<ReportedNumber> replicateValues = replicateValues(row, raw.replicateValues(), unit, replicateCount,
                rule == null ? null : rule.element(), rule != null && rule.negativeAllowed());

        if (problems.size() > problemsBefore || rule == null || item == null || unit == null || method == null
                || value == null || replicateCount == null || replicateValues == null) {
            return null;
        }
        BigDecimal massFraction = unit.convert(value.value(), rule.canonicalUnit());
        ReportedResult result = new ReportedResult(row, rule.element(), item, valueText, value, lessThan, unit,
                rule.canonicalUnit(), massFraction, Optional.ofNullable(uncertainty), coverageFactor,
                coverageFactorReported, method, replicateCount, replicateValues);
        addWarnings(result, rule);
        return result;
    }

    /**
     * A result's numbers as reported: the value ({@code <number} a "less than" result), U and k, each null when
     * absent or refused (with its problem).
     */
    record Numbers(String valueText, ReportedNumber value, boolean lessThan, ReportedNumber expandedUncertainty,
                   ReportedNumber coverageFactor, boolean coverageFactorReported) {
    }

    /**
     * The number rules of one result, whatever the channel: the cell rules, a plain decimal, a "less than" result
     * only where allowed, a negative value only where the measurand allows it (never U or k), at most 100 %, U not
     * zero, k between 1 and 4. {@code measurand} names the measurand in messages (null when unknown).
     */
    Numbers numbers(int row, Map<UploadColumn, String> cells, String measurand, boolean lessThanAllowed,
                    boolean negativeAllowed, MassFractionUnit unit) {
        String valueText = cellText(row, UploadColumn.VALUE, cells, true, true);
        ReportedNumber value = null;
        boolean lessThan = false;
        if (valueText != null) {
            String numberText = valueText;
            if (valueText.startsWith("<")) {
                lessThan = true;
                numberText = Texts.trimSpaces(valueText.substring(1));
                if (!lessThanAllowed) {
                    problems.add(problem(row, UploadColumn.VALUE, valueText, IntakeKey.VALUE_LESS_THAN_NOT_ALLOWED,
                            "A 'less than' result is not allowed for " + measurand + "; report a number."));
                }
            }
            if (lessThan && numberText.startsWith("-")) {
                // a detection limit is never negative, whether or not the measurand allows negative values
                problems.add(problem(row, UploadColumn.VALUE, valueText, IntakeKey.VALUE_NEGATIVE,
                        "A 'less than' limit cannot be negative."));
            } else {
                value = number(row, UploadColumn.VALUE, numberText, measurand, negativeAllowed && !lessThan);
            }
            if (value != null) {
                checkAtMost100Percent(row, UploadColumn.VALUE, value, unit);
            }
        }

        ReportedNumber uncertainty = null;
        String uncertaintyText = cellText(row, UploadColumn.EXPANDED_UNCERTAINTY, cells, false, true);
        if (uncertaintyText != null) {
            uncertainty = number(row, UploadColumn.EXPANDED_UNCERTAINTY, uncertaintyText, measurand, false);
            if (uncertainty != null && uncertainty.value().signum() == 0) {
                problems.add(problem(row, UploadColumn.EXPANDED_UNCERTAINTY, uncertaintyText,
                        IntakeKey.UNCERTAINTY_NOT_POSITIVE, "An expanded uncertainty of zero is not possible; "
                                + "leave the cell empty if you do not state one."));
                uncertainty = null;
            } else if (uncertainty != null) {
                checkAtMost100Percent(row, UploadColumn.EXPANDED_UNCERTAINTY, uncertainty, unit);
            }
        }

        ReportedNumber coverageFactor = ReportedResult.DEFAULT_COVERAGE_FACTOR;
        boolean coverageFactorReported = false;
        String coverageText = cellText(row, UploadColumn.COVERAGE_FACTOR, cells, false, true);
        if (coverageText != null) {
            ReportedNumber k = number(row, UploadColumn.COVERAGE_FACTOR, coverageText, measurand, false);
            if (k != null && !ResultRanges.coverageFactorInRange(k.value())) {
                problems.add(problem(row, UploadColumn.COVERAGE_FACTOR, coverageText,
                        IntakeKey.COVERAGE_FACTOR_OUT_OF_RANGE, ResultRanges.coverageFactorMessage()));
            } else if (k != null) {
                coverageFactor = k;
                coverageFactorReported = true;
            }
        }
        return new Numbers(valueText, value, lessThan, uncertainty, coverageFactor, coverageFactorReported);
    }

    /** The problems found since the last call, removed from this validator (for row-by-row use). */
    List<IntakeProblem> takeProblems() {
        List<IntakeProblem> taken = List.copyOf(problems);
        problems.clear();
        return taken;
    }

    private MeasurandRule measurandRule(int row, String measurand) {
        if (!ChemicalElements.isSymbol(measurand)) {
            String hint = ChemicalElements.symbolIgnoringCase(measurand)
                    .map(symbol -> " Did you mean " + symbol + "? Symbols are case-sensitive.")
                    .orElse("");
            problems.add(problem(row, UploadColumn.MEASURAND, measurand, IntakeKey.MEASURAND_UNKNOWN_ELEMENT,
                    "'" + Texts.shown(measurand) + "' is not a chemical element symbol." + hint));
            return null;
        }
        Optional<MeasurandRule> rule = rules.measurand(measurand);
        if (rule.isEmpty()) {
            problems.add(problem(row, UploadColumn.MEASURAND, measurand, IntakeKey.MEASURAND_NOT_IN_ROUND,
                    measurand + " is not a measurand of this round."));
            return null;
        }
        return rule.get();
    }

    private MassFractionUnit unit(int row, String unitText, MeasurandRule rule) {
        Optional<MassFractionUnit> unit = MassFractionUnit.fromSymbol(unitText);
        if (unit.isEmpty()) {
            problems.add(problem(row, UploadColumn.UNIT, unitText, IntakeKey.UNIT_UNKNOWN,
                    "The unit '" + Texts.shown(unitText) + "' is not recognised; write % or mg/kg."));
            return null;
        }
        if (rule != null && !rule.allowedUnits().contains(unit.get())) {
            problems.add(problem(row, UploadColumn.UNIT, unitText, IntakeKey.UNIT_NOT_ALLOWED,
                    "The unit " + unitText + " is not allowed for " + rule.element() + "; report in "
                            + rule.canonicalUnit().symbol() + "."));
            return null;
        }
        return unit.get();
    }

    private MethodGroup method(int row, String methodText, MeasurandRule rule) {
        Optional<MethodGroup> method = MethodGroup.fromCode(methodText);
        if (method.isEmpty()) {
            problems.add(problem(row, UploadColumn.METHOD, methodText, IntakeKey.METHOD_UNKNOWN,
                    "The method group '" + Texts.shown(methodText) + "' is not known; use one of "
                            + methodCodes() + "."));
            return null;
        }
        if (rule != null && !rule.allowedMethods().contains(method.get())) {
            problems.add(problem(row, UploadColumn.METHOD, methodText, IntakeKey.METHOD_NOT_ALLOWED,
                    "The method group " + method.get().code() + " is not allowed for " + rule.element() + "."));
            return null;
        }
        return method.get();
    }

    private Integer replicateCount(int row, String text) {
        if (text.startsWith("-") && WHOLE_NUMBER.matcher(text.substring(1)).matches()) {
            problems.add(problem(row, UploadColumn.REPLICATES, text, IntakeKey.VALUE_NEGATIVE,
                    "The replicate count cannot be negative."));
            return null;
        }
        if (!WHOLE_NUMBER.matcher(text).matches()) {
            problems.add(problem(row, UploadColumn.REPLICATES, text, IntakeKey.VALUE_NOT_AN_INTEGER,
                    "The replicate count must be a whole number."));
            return null;
        }
        int count = Integer.parseInt(text);
        if (count < 1 || count > rules.maximumReplicates()) {
            problems.add(problem(row, UploadColumn.REPLICATES, text, IntakeKey.REPLICATES_OUT_OF_RANGE,
                    "The replicate count must lie between 1 and " + rules.maximumReplicates() + "."));
            return null;
        }
        return count;
    }

    private List<ReportedNumber> replicateValues(int row, List<String> pieces, MassFractionUnit unit,
                                                 Integer replicateCount, String measurand,
                                                 boolean negativeAllowed) {
        if (pieces == null) {
            return List.of();
        }
        String joined = String.join("|", pieces);
        if (joined.length() > limits.maxCellChars()) {
            problems.add(problem(row, UploadColumn.REPLICATE_VALUES, joined, IntakeKey.VALUE_TOO_LONG,
                    "The replicate values are longer than " + limits.maxCellChars() + " characters."));
            return null;
        }
        List<ReportedNumber> values = new ArrayList<>();
        boolean valid = true;
        for (String piece : pieces) {
            String text = Texts.trimSpaces(piece);
            if (text.isEmpty()) {
                problems.add(problem(row, UploadColumn.REPLICATE_VALUES, joined, IntakeKey.VALUE_MISSING,
                        "A replicate value is empty; separate the values with a single |."));
                valid = false;
                continue;
            }
            if (!checkCell(row, UploadColumn.REPLICATE_VALUES, text, true)) {
                valid = false;
                continue;
            }
            ReportedNumber number = number(row, UploadColumn.REPLICATE_VALUES, text, measurand, negativeAllowed);
            if (number == null || !checkAtMost100Percent(row, UploadColumn.REPLICATE_VALUES, number, unit)) {
                valid = false;
                continue;
            }
            values.add(number);
        }
        if (valid && replicateCount != null && values.size() != replicateCount) {
            problems.add(problem(row, UploadColumn.REPLICATE_VALUES, joined, IntakeKey.REPLICATES_COUNT_MISMATCH,
                    values.size() + " replicate values are given but the replicate count is " + replicateCount
                            + "."));
            valid = false;
        }
        return valid ? values : null;
    }

    private boolean checkAtMost100Percent(int row, UploadColumn column, ReportedNumber number, MassFractionUnit unit) {
        // a negative value (where the plan allows one) is a blank-corrected result: its size is bounded alike
        if (unit != null && unit.isAbove100Percent(number.value().abs())) {
            problems.add(problem(row, column, number.asReported(), IntakeKey.VALUE_ABOVE_100_PERCENT,
                    number.asReported() + " " + unit.symbol() + (number.value().signum() < 0
                            ? " is below −100 %, which is impossible for a blank-corrected mass fraction."
                            : " is more than 100 %, which is impossible for a mass fraction.")));
            return false;
        }
        return true;
    }

    private void addWarnings(ReportedResult result, MeasurandRule rule) {
        int row = result.row();
        String element = rule.element();
        String unitSymbol = rule.canonicalUnit().symbol();
        if (!result.lessThan() && (result.massFraction().compareTo(rule.expectedLow()) < 0
                || result.massFraction().compareTo(rule.expectedHigh()) > 0)) {
            warnings.add(warning(row, UploadColumn.VALUE, result.valueAsReported(),
                    IntakeKey.WARNING_OUTSIDE_EXPECTED_RANGE, element + " = " + result.valueAsReported() + " "
                            + result.unit().symbol() + " lies outside the expected range "
                            + rule.expectedLow().toPlainString() + " to " + rule.expectedHigh().toPlainString() + " "
                            + unitSymbol + ". Please check the value and the unit."));
        }
        if (!result.lessThan() && result.expandedUncertainty().isPresent()
                && result.expandedUncertainty().get().value().compareTo(result.value().value().abs()) > 0) {
            warnings.add(warning(row, UploadColumn.EXPANDED_UNCERTAINTY,
                    result.expandedUncertainty().get().asReported(), IntakeKey.WARNING_UNCERTAINTY_LARGER_THAN_VALUE,
                    "The expanded uncertainty of " + element + " is larger than the value."));
        }
        if (!result.lessThan() && result.unit() == rule.canonicalUnit()
                && Math.max(result.value().value().scale(), 0) != rule.reportingDecimals()) {
            warnings.add(warning(row, UploadColumn.VALUE, result.valueAsReported(), IntakeKey.WARNING_REPORTING_DIGITS,
                    element + " is reported with " + Math.max(result.value().value().scale(), 0)
                            + " decimals; the round asks for " + rule.reportingDecimals() + " in " + unitSymbol
                            + "."));
        }
    }

    /** A required or optional text cell after the cell rules; {@code null} when empty or invalid. */
    private String textCell(int row, UploadColumn column, Map<UploadColumn, String> cells, boolean required) {
        return cellText(row, column, cells, required, false);
    }

    private String cellText(int row, UploadColumn column, Map<UploadColumn, String> cells, boolean required,
                            boolean numeric) {
        String raw = cells.get(column);
        String text = raw == null ? "" : Texts.trimSpaces(raw);
        if (text.isEmpty()) {
            if (required) {
                problems.add(problem(row, column, null, IntakeKey.VALUE_MISSING,
                        "The " + columnName.apply(column) + " is missing."));
            }
            return null;
        }
        return checkCell(row, column, text, numeric) ? text : null;
    }

    /** Applies the length, formula-prefix and control-character rules; false (with a problem) when one fails. */
    private boolean checkCell(int row, UploadColumn column, String text, boolean numeric) {
        if (text.length() > limits.maxCellChars()) {
            problems.add(problem(row, column, text, IntakeKey.VALUE_TOO_LONG,
                    "The cell is longer than " + limits.maxCellChars() + " characters."));
            return false;
        }
        char first = text.charAt(0);
        boolean negativeNumber = numeric && first == '-' && text.length() > 1
                && (PLAIN_DECIMAL.matcher(text.substring(1)).matches()
                || EXPONENT.matcher(text.substring(1)).matches()
                || NOT_FINITE.matcher(text).matches());
        boolean signedInfinity = numeric && first == '+' && NOT_FINITE.matcher(text).matches();
        if ((first == '=' || first == '+' || first == '-' || first == '@' || first == '\t' || first == '\r')
                && !negativeNumber && !signedInfinity) {
            problems.add(problem(row, column, text, IntakeKey.VALUE_FORMULA_PREFIX,
                    "The cell starts with '" + Texts.shown(String.valueOf(first)) + "', which spreadsheets treat as "
                            + "a formula; remove it."));
            return false;
        }
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c < 0x20 || c == 0x7f) {
                problems.add(problem(row, column, text, IntakeKey.VALUE_CONTROL_CHARACTER,
                        "The cell contains a line break or control character (code " + (int) c + ")."));
                return false;
            }
        }
        return true;
    }

    /**
     * Parses a plain decimal; {@code null} (with a problem) when it is not one. A negative number is accepted only
     * when {@code negativeAllowed} (a value or replicate value of a measurand that allows negative results);
     * otherwise it is refused, naming the measurand when there is one.
     */
    private ReportedNumber number(int row, UploadColumn column, String text, String measurand,
                                  boolean negativeAllowed) {
        if (NOT_FINITE.matcher(text).matches()) {
            problems.add(problem(row, column, text, IntakeKey.VALUE_NOT_FINITE,
                    "'" + text + "' is not a finite number."));
            return null;
        }
        boolean negative = text.startsWith("-");
        if (negative && !negativeAllowed) {
            problems.add(problem(row, column, text, IntakeKey.VALUE_NEGATIVE, negativeMessage(column, text,
                    measurand)));
            return null;
        }
        String digits = negative ? text.substring(1) : text;
        if (PLAIN_DECIMAL.matcher(digits).matches()) {
            char separator = text.indexOf(',') >= 0 ? ',' : text.indexOf('.') >= 0 ? '.' : 0;
            if (separator == ',' && numberStyle == NumberStyle.POINT_ONLY) {
                problems.add(problem(row, column, text, IntakeKey.VALUE_DECIMAL_COMMA_NOT_ALLOWED,
                        "A decimal comma is only allowed in a semicolon-separated file; write " + text.replace(',', '.')
                                + "."));
                return null;
            }
            if (separator != 0) {
                if (decimalSeparator == null) {
                    decimalSeparator = separator;
                } else if (decimalSeparator != separator && numberStyle == NumberStyle.POINT_OR_COMMA_CONSISTENT) {
                    problems.add(problem(row, column, text, IntakeKey.VALUE_MIXED_DECIMAL_SEPARATORS,
                            "This value uses '" + separator + "' but earlier values use '" + decimalSeparator
                                    + "' as decimal separator."));
                    return null;
                }
            }
            return new ReportedNumber(text, new BigDecimal(text.replace(',', '.')));
        }
        if (EXPONENT.matcher(digits).matches()) {
            problems.add(problem(row, column, text, IntakeKey.VALUE_EXPONENT_NOT_ALLOWED,
                    "Write " + text + " as a plain decimal number, without an exponent."));
            return null;
        }
        problems.add(problem(row, column, text, IntakeKey.VALUE_NOT_A_NUMBER,
                "'" + Texts.shown(text) + "' is not a decimal number."));
        return null;
    }

    /**
     * Why a negative number is refused: for a value or replicate value of a known measurand, that the round's plan
     * does not accept negative results of it; for an uncertainty or coverage factor, that they are never negative.
     */
    static String negativeMessage(UploadColumn column, String text, String measurand) {
        return switch (column) {
            case EXPANDED_UNCERTAINTY -> "An expanded uncertainty cannot be negative.";
            case COVERAGE_FACTOR -> "A coverage factor cannot be negative.";
            default -> measurand == null
                    ? "A mass fraction cannot be negative."
                    : measurand + " = " + text + " is negative; the round's plan does not accept negative "
                            + "results for " + measurand + ". Check the sign, or ask the coordinator "
                            + "whether negative blank-corrected results are accepted.";
        };
    }

    private IntakeProblem problem(int row, UploadColumn column, String value, IntakeKey key, String message) {
        return IntakeProblem.of(row, columnName.apply(column), value, key, message);
    }

    private IntakeWarning warning(int row, UploadColumn column, String value, IntakeKey key, String message) {
        return IntakeWarning.of(row, columnName.apply(column), value, key, message);
    }

    private static String methodCodes() {
        List<String> codes = new ArrayList<>();
        for (MethodGroup group : MethodGroup.values()) {
            codes.add(group.code());
        }
        return String.join(", ", codes);
    }
}
