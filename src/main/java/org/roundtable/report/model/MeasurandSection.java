package org.roundtable.report.model;

import java.util.List;
import java.util.Objects;
import org.roundtable.statistics.score.ScoreKind;

/**
 * Everything the report shows for one measurand on one item.
 *
 * @param id unique key within the report, e.g. {@code Mn} or {@code Mn-A} in a paired round
 * @param name what is measured, e.g. "Manganese"
 * @param itemLabel the item, e.g. {@code A}; may be empty
 * @param unit {@code %} (mass fraction in % m/m) or {@code mg/kg}
 * @param reportingDigits decimal places used to print values of this measurand
 * @param n number of results used in the statistics
 * @param assignedValue x_pt
 * @param assignedValueMethod how x_pt was set, e.g. "robust mean of participants' results (Algorithm A)"
 * @param assignedValueUncertainty standard uncertainty u(x_pt)
 * @param sigmaPt standard deviation for proficiency assessment σ_pt
 * @param sigmaPtMethod how σ_pt was set, e.g. "fixed in the plan from earlier rounds"
 * @param robust robust statistics of the results
 * @param methodGroups statistics per method group
 * @param warnings warnings raised by the evaluation (e.g. "u(x_pt) &gt; 0.3 σ_pt"); may be empty
 * @param scoreKind the score used to classify performance
 * @param scoreChoiceReason why that score was used
 * @param results the participants' results, in any order
 * @param scoreDecimals decimals scores are printed with (the plan's; they were classified as printed)
 */
public record MeasurandSection(String id, String name, String itemLabel, String unit, int reportingDigits, int n,
        double assignedValue, String assignedValueMethod, double assignedValueUncertainty,
        double sigmaPt, String sigmaPtMethod, RobustStatistics robust, List<MethodGroupStatistics> methodGroups,
        List<String> warnings, ScoreKind scoreKind, String scoreChoiceReason, List<ParticipantResult> results,
        int scoreDecimals) {

    /** A section whose scores print with the default two decimals. */
    public MeasurandSection(String id, String name, String itemLabel, String unit, int reportingDigits, int n,
            double assignedValue, String assignedValueMethod, double assignedValueUncertainty,
            double sigmaPt, String sigmaPtMethod, RobustStatistics robust, List<MethodGroupStatistics> methodGroups,
            List<String> warnings, ScoreKind scoreKind, String scoreChoiceReason, List<ParticipantResult> results) {
        this(id, name, itemLabel, unit, reportingDigits, n, assignedValue, assignedValueMethod, assignedValueUncertainty,
                sigmaPt, sigmaPtMethod, robust, methodGroups, warnings, scoreKind, scoreChoiceReason, results,
                org.roundtable.platform.NumberFormats.DEFAULT_SCORE_DECIMALS);
    }

    public MeasurandSection {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(robust, "robust");
        Objects.requireNonNull(scoreKind, "scoreKind");
        if (scoreDecimals < 0 || scoreDecimals > 6) {
            throw new IllegalArgumentException("scoreDecimals out of range: " + scoreDecimals);
        }
        if (reportingDigits < 0 || reportingDigits > 8) {
            throw new IllegalArgumentException("reportingDigits out of range: " + reportingDigits);
        }
        itemLabel = itemLabel == null ? "" : itemLabel;
        assignedValueMethod = assignedValueMethod == null ? "" : assignedValueMethod;
        sigmaPtMethod = sigmaPtMethod == null ? "" : sigmaPtMethod;
        scoreChoiceReason = scoreChoiceReason == null ? "" : scoreChoiceReason;
        methodGroups = List.copyOf(methodGroups);
        warnings = List.copyOf(warnings);
        results = List.copyOf(results);
    }

    /** Title used in headings, e.g. "Mn, manganese (item A)". */
    public String title() {
        return itemLabel.isEmpty() ? name : name + " (item " + itemLabel + ")";
    }
}
