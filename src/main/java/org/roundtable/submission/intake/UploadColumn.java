package org.roundtable.submission.intake;

import java.util.Locale;
import java.util.Optional;

/**
 * The columns of our upload format, with their CSV/XLSX header name and JSON field name.
 *
 * <p>CSV/XLSX header names are compared without regard to case, and a space or hyphen counts as an underscore
 * ({@code Expanded Uncertainty} = {@code expanded_uncertainty}). Column order is free.
 * <ul>
 *   <li>{@code measurand} (required): element symbol, e.g. {@code Mn};</li>
 *   <li>{@code item} (required when the round has a pair of items, else optional): item label;</li>
 *   <li>{@code value} (required): decimal number, or {@code <limit} for a "less than" result;</li>
 *   <li>{@code unit} (required): {@code %} or {@code mg/kg};</li>
 *   <li>{@code expanded_uncertainty} (optional column, cell may be empty): U, same unit as the value;</li>
 *   <li>{@code coverage_factor} (optional, default 2): k, between 1 and 4;</li>
 *   <li>{@code method} (required): method group code, see {@link MethodGroup};</li>
 *   <li>{@code replicates} (required): whole number 1 … the round's maximum;</li>
 *   <li>{@code replicate_values} (optional): the replicate values separated by {@code |}, as many as
 *       {@code replicates}.</li>
 * </ul>
 */
enum UploadColumn {
    MEASURAND("measurand", "measurand", false),
    ITEM("item", "item", false),
    VALUE("value", "value", true),
    UNIT("unit", "unit", false),
    EXPANDED_UNCERTAINTY("expanded_uncertainty", "expandedUncertainty", true),
    COVERAGE_FACTOR("coverage_factor", "coverageFactor", true),
    METHOD("method", "method", false),
    REPLICATES("replicates", "replicates", true),
    REPLICATE_VALUES("replicate_values", "replicateValues", true);

    private final String headerName;
    private final String jsonName;
    private final boolean numeric;

    UploadColumn(String headerName, String jsonName, boolean numeric) {
        this.headerName = headerName;
        this.jsonName = jsonName;
        this.numeric = numeric;
    }

    String headerName() {
        return headerName;
    }

    String jsonName() {
        return jsonName;
    }

    /** Numeric columns: a leading minus means a negative number; in text columns it is a formula prefix. */
    boolean numeric() {
        return numeric;
    }

    /** Whether the column must be present (the item column only in a paired round). */
    boolean required(UploadRules rules) {
        return switch (this) {
            case MEASURAND, VALUE, UNIT, METHOD, REPLICATES -> true;
            case ITEM -> rules.paired();
            default -> false;
        };
    }

    static Optional<UploadColumn> fromHeader(String header) {
        String normalised = header.trim().toLowerCase(Locale.ROOT).replace(' ', '_').replace('-', '_');
        for (UploadColumn column : values()) {
            if (column.headerName.equals(normalised)) {
                return Optional.of(column);
            }
        }
        return Optional.empty();
    }

    static Optional<UploadColumn> fromJsonField(String field) {
        for (UploadColumn column : values()) {
            if (column.jsonName.equals(field)) {
                return Optional.of(column);
            }
        }
        return Optional.empty();
    }
}
