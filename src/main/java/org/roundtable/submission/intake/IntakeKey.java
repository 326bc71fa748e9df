package org.roundtable.submission.intake;

/**
 * The stable keys of every problem and warning the result intake reports.
 *
 * <p>A key never changes once released: the server maps it to a translated message, clients and the malformed-upload
 * corpus match on it. The {@link #key()} text is what appears in {@link IntakeProblem#key()} and
 * {@link IntakeWarning#key()}. Keys are grouped by prefix:
 * <ul>
 *   <li>{@code file.*} — the upload as a whole (size, encoding, type); row 0, no column;</li>
 *   <li>{@code csv.*} — CSV structure (quotes, delimiters, NUL, line length); row of the physical line;</li>
 *   <li>{@code xlsx.*} — workbook container and its parts (zip guards, macros, links, encryption);</li>
 *   <li>{@code json.*} — JSON structure;</li>
 *   <li>{@code header.*} — the header row of CSV and XLSX;</li>
 *   <li>{@code row.*}, {@code value.*}, {@code measurand.*}, {@code unit.*}, {@code method.*}, {@code item.*},
 *       {@code uncertainty.*}, {@code coverage-factor.*}, {@code replicates.*} — one cell or one result.</li>
 * </ul>
 * Warnings ({@link #isWarning()}) never reject an upload; the laboratory confirms them.
 */
public enum IntakeKey {

    // file level
    FILE_EMPTY("file.empty", "The file is empty or contains no rows."),
    FILE_TOO_LARGE("file.too-large", "The file is larger than the allowed size."),
    FILE_NOT_UTF8("file.not-utf8", "The file is not valid UTF-8 text."),
    FILE_TYPE_MISMATCH("file.type-mismatch", "The file content does not match its declared type."),
    FILE_TOO_MANY_ROWS("file.too-many-rows", "The file has more data rows than allowed."),
    FILE_NO_RESULTS("file.no-results", "The file has a header but no result rows."),
    FILE_UNREADABLE("file.unreadable", "The file could not be read."),

    // CSV structure
    CSV_UNBALANCED_QUOTE("csv.unbalanced-quote", "A quoted field is not closed."),
    CSV_TEXT_AFTER_CLOSING_QUOTE("csv.text-after-closing-quote", "Text follows the closing quote of a field."),
    CSV_MIXED_DELIMITERS("csv.mixed-delimiters", "Both comma and semicolon are used as delimiters."),
    CSV_UNSUPPORTED_DELIMITER("csv.unsupported-delimiter", "Only comma or semicolon may separate the columns."),
    CSV_NUL_BYTE("csv.nul-byte", "The file contains a NUL byte."),
    CSV_LINE_TOO_LONG("csv.line-too-long", "A line is longer than allowed."),

    // XLSX container
    XLSX_ZIP_BOMB("xlsx.zip-bomb", "The workbook unpacks to far more data than its size suggests."),
    XLSX_TOO_MANY_ENTRIES("xlsx.too-many-entries", "The workbook contains too many parts."),
    XLSX_UNSAFE_ENTRY_NAME("xlsx.unsafe-entry-name", "A part of the workbook has an unsafe path."),
    XLSX_MACRO_ENABLED("xlsx.macro-enabled", "Macro-enabled workbooks are refused."),
    XLSX_ACTIVE_CONTENT("xlsx.active-content", "Workbooks with ActiveX controls or embedded objects are refused."),
    XLSX_EXTERNAL_LINK("xlsx.external-link", "Workbooks with links to external workbooks are refused."),
    XLSX_ENCRYPTED("xlsx.encrypted", "Encrypted or password-protected workbooks are refused."),
    XLSX_LEGACY_FORMAT("xlsx.legacy-format", "The old .xls format is not accepted; save as .xlsx."),
    XLSX_XML_DOCTYPE("xlsx.xml-doctype", "A part of the workbook contains a document type declaration."),
    XLSX_INVALID_DIMENSION("xlsx.invalid-dimension", "The sheet declares a size beyond what a workbook can hold."),
    XLSX_NOT_A_WORKBOOK("xlsx.not-a-workbook", "The zip file is not an Excel workbook."),
    XLSX_CORRUPT("xlsx.corrupt", "The workbook is damaged and cannot be read."),

    // JSON structure
    JSON_MALFORMED("json.malformed", "The JSON text is not well-formed."),
    JSON_STRUCTURE("json.structure", "The JSON document does not have the expected structure."),
    JSON_UNKNOWN_FIELD("json.unknown-field", "The JSON object has a field that is not part of the format."),
    JSON_WRONG_TYPE("json.wrong-type", "The JSON field has the wrong type."),

    // header
    HEADER_MISSING_COLUMN("header.missing-column", "A required column is missing."),
    HEADER_DUPLICATE_COLUMN("header.duplicate-column", "A column appears twice in the header."),
    HEADER_UNKNOWN_COLUMN("header.unknown-column", "The header has a column that is not part of the format."),
    HEADER_EMPTY_COLUMN_NAME("header.empty-column-name", "A column with data has no name."),

    // rows and cells
    ROW_COLUMN_COUNT("row.column-count", "The row has a different number of cells than the header."),
    ROW_DUPLICATE_MEASURAND("row.duplicate-measurand", "The measurand is reported twice for the same item."),
    VALUE_MISSING("value.missing", "A required value is empty."),
    VALUE_TOO_LONG("value.too-long", "The cell is longer than allowed."),
    VALUE_CONTROL_CHARACTER("value.control-character", "The cell contains a control character or line break."),
    VALUE_FORMULA_PREFIX("value.formula-prefix", "The cell starts with a character that spreadsheets run as a formula."),
    VALUE_NOT_A_NUMBER("value.not-a-number", "The value is not a decimal number."),
    VALUE_NOT_AN_INTEGER("value.not-an-integer", "The value is not a whole number."),
    VALUE_NOT_FINITE("value.not-finite", "NaN and infinity are not results."),
    VALUE_EXPONENT_NOT_ALLOWED("value.exponent-not-allowed", "Write the value as a plain decimal, without an exponent."),
    VALUE_DECIMAL_COMMA_NOT_ALLOWED("value.decimal-comma-not-allowed",
            "A decimal comma is only allowed in semicolon-separated files."),
    VALUE_MIXED_DECIMAL_SEPARATORS("value.mixed-decimal-separators", "Decimal point and decimal comma are mixed."),
    VALUE_NEGATIVE("value.negative", "A mass fraction cannot be negative."),
    VALUE_ABOVE_100_PERCENT("value.above-100-percent", "A mass fraction cannot exceed 100 % (1 000 000 mg/kg)."),
    VALUE_LESS_THAN_NOT_ALLOWED("value.less-than-not-allowed", "A 'less than' result is not allowed for this measurand."),
    MEASURAND_UNKNOWN_ELEMENT("measurand.unknown-element", "The measurand is not a chemical element symbol."),
    MEASURAND_NOT_IN_ROUND("measurand.not-in-round", "The element is not a measurand of this round."),
    ITEM_UNKNOWN("item.unknown", "The item label is not one of this round's items."),
    UNIT_UNKNOWN("unit.unknown", "The unit is not recognised; use % or mg/kg."),
    UNIT_NOT_ALLOWED("unit.not-allowed", "The unit is not allowed for this measurand."),
    METHOD_UNKNOWN("method.unknown", "The method group is not one of the known codes."),
    METHOD_NOT_ALLOWED("method.not-allowed", "The method group is not allowed for this measurand."),
    UNCERTAINTY_NOT_POSITIVE("uncertainty.not-positive", "An expanded uncertainty must be greater than zero."),
    COVERAGE_FACTOR_OUT_OF_RANGE("coverage-factor.out-of-range", "The coverage factor must lie between 1 and 4."),
    REPLICATES_OUT_OF_RANGE("replicates.out-of-range", "The replicate count is outside the allowed range."),
    REPLICATES_COUNT_MISMATCH("replicates.count-mismatch",
            "The number of replicate values differs from the replicate count."),

    // precision experiments (ISO 5725-2): replicate rows
    LEVEL_UNKNOWN("level.unknown", "The level is not one of this study's levels."),
    REPLICATE_OUT_OF_RANGE("replicate.out-of-range", "The replicate number is outside 1 to the study's replicates."),
    ROW_DUPLICATE_REPLICATE("row.duplicate-replicate", "The same replicate is reported twice for a level and measurand."),
    REPLICATES_WRONG_NUMBER("replicates.wrong-number",
            "A level and measurand has a different number of replicates than the study asks for."),

    // warnings: the laboratory confirms them, the upload is not rejected
    WARNING_OUTSIDE_EXPECTED_RANGE("value.outside-expected-range", "The value lies outside the expected range."),
    WARNING_UNCERTAINTY_LARGER_THAN_VALUE("uncertainty.larger-than-value",
            "The expanded uncertainty is larger than the value."),
    WARNING_REPORTING_DIGITS("value.reporting-digits", "The value has a different number of decimals than requested."),
    WARNING_MEASURAND_NOT_REPORTED("measurand.not-reported", "A measurand of the round was not reported."),
    WARNING_LEVEL_NOT_REPORTED("level.not-reported", "A level and measurand of the study was not reported.");

    private final String key;
    private final String defaultMessage;

    IntakeKey(String key, String defaultMessage) {
        this.key = key;
        this.defaultMessage = defaultMessage;
    }

    /** The stable key text, e.g. {@code file.not-utf8}. */
    public String key() {
        return key;
    }

    /** A plain English sentence describing the problem in general; problems carry a more specific message. */
    public String defaultMessage() {
        return defaultMessage;
    }

    /** Whether this key is a warning the laboratory confirms rather than an error that rejects the upload. */
    public boolean isWarning() {
        return name().startsWith("WARNING_");
    }
}
