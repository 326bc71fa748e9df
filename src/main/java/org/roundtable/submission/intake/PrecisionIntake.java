package org.roundtable.submission.intake;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import java.util.TreeMap;
import java.util.regex.Pattern;

/**
 * Reads a laboratory's replicate results for a precision experiment (ISO 5725-2), all or nothing, through the same
 * file readers as {@link ResultIntake}: CSV and XLSX (file, encoding, delimiter, workbook and size rules of
 * {@link CsvUploadReader} and {@link XlsxUploadReader}) and JSON ({@code {"results": [...]}}, the strict mapper of
 * {@link JsonUploadReader}).
 *
 * <p>Columns (CSV/XLSX header names, any order, case-insensitive; JSON field names the same):
 * {@code level} (required, one of the study's level labels), {@code measurand} (required, an element of the study),
 * {@code replicate} (required, 1 … the study's replicates), {@code value} (required, a plain non-negative decimal),
 * {@code unit} (optional, {@code %} or {@code mg/kg}; the measurand's unit when empty). One row per replicate.
 *
 * <p>Rules: cell rules as in {@link ResultValidator} (length, formula prefix, control characters, plain decimals,
 * decimal comma only in semicolon CSV or XLSX); the same (level, measurand, replicate) twice →
 * {@code row.duplicate-replicate}; a level and measurand with a number of replicates other than the study's →
 * {@code replicates.wrong-number}, on the first row of that level and measurand, the message naming all its rows.
 * A level and measurand not reported at all is a warning ({@code level.not-reported}): ISO 5725-2 allows missing
 * cells.
 */
public final class PrecisionIntake {

    /** What the study allows: its level labels, its measurands with their units, the replicates per cell. */
    public record Rules(List<String> levels, Map<String, MassFractionUnit> measurands, int replicates) {

        public Rules {
            levels = List.copyOf(levels);
            measurands = Map.copyOf(measurands);
        }
    }

    /**
     * One replicate result as reported and parsed.
     *
     * @param value the number in the measurand's unit (converted exactly)
     */
    public record Replicate(int row, String level, String measurand, int replicate, ReportedNumber reported,
                            MassFractionUnit unit, BigDecimal value) {
    }

    /** The outcome: accepted with every replicate and the canonical payload, or rejected with every problem. */
    public sealed interface Outcome permits Accepted, Rejected {
        Detection detection();
    }

    /** Every row was valid. */
    public record Accepted(List<Replicate> replicates, List<IntakeWarning> warnings, Detection detection,
                           String canonicalJson, String sha256) implements Outcome {
        public Accepted {
            replicates = List.copyOf(replicates);
            warnings = List.copyOf(warnings);
        }
    }

    /** Nothing may be stored. */
    public record Rejected(List<IntakeProblem> problems, Detection detection) implements Outcome {
        public Rejected {
            problems = List.copyOf(problems);
        }
    }

    private enum Column { LEVEL, MEASURAND, REPLICATE, VALUE, UNIT }

    private static final Pattern PLAIN_DECIMAL = Pattern.compile("[0-9]+(?:[.,][0-9]+)?|[.,][0-9]+");
    private static final Pattern WHOLE = Pattern.compile("[0-9]{1,3}");

    private final Limits limits;
    private final JsonMapper jsonMapper;

    public PrecisionIntake() {
        this(Limits.defaults());
    }

    public PrecisionIntake(Limits limits) {
        this.limits = Objects.requireNonNull(limits, "limits");
        this.jsonMapper = JsonUploadReader.strictMapper(limits);
    }

    /** Validates an upload held in memory. */
    public Outcome read(byte[] content, UploadFormat format, Rules rules) {
        if (content.length > limits.maxFileBytes()) {
            return new Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_TOO_LARGE,
                    "The file is larger than " + limits.maxFileBytes() + " bytes.")), Detection.of(format));
        }
        List<IntakeProblem> problems = new ArrayList<>();
        Detection detection = Detection.of(format);
        try {
            List<Map<Column, String>> rows = new ArrayList<>();
            List<Integer> rowNumbers = new ArrayList<>();
            boolean commaAllowed;
            switch (format) {
                case CSV -> {
                    CsvUploadReader reader = new CsvUploadReader(limits);
                    try {
                        table(reader.read(content, problems), true, rows, rowNumbers, problems);
                    } finally {
                        detection = reader.detection();
                    }
                    commaAllowed = detection.delimiter() != null && detection.delimiter() == ';';
                }
                case XLSX -> {
                    XlsxUploadReader reader = new XlsxUploadReader(limits);
                    try {
                        table(reader.read(content), false, rows, rowNumbers, problems);
                    } finally {
                        detection = reader.detection();
                    }
                    commaAllowed = true;
                }
                default -> {
                    json(content, rows, rowNumbers, problems);
                    detection = detection.withEncoding("UTF-8", false);
                    commaAllowed = false;
                }
            }
            return validate(rows, rowNumbers, rules, commaAllowed, problems, detection);
        } catch (UploadRejectedException e) {
            return new Rejected(e.problems(), detection);
        } catch (RuntimeException e) {
            return new Rejected(List.of(IntakeProblem.ofFile(IntakeKey.FILE_UNREADABLE, "The file could not be read.")),
                    detection);
        }
    }

    private static Column column(String name) {
        String n = name.trim().toLowerCase(Locale.ROOT).replace(' ', '_').replace('-', '_');
        for (Column c : Column.values()) {
            if (c.name().toLowerCase(Locale.ROOT).equals(n)) {
                return c;
            }
        }
        return null;
    }

    private static String name(Column c) {
        return c.name().toLowerCase(Locale.ROOT);
    }

    private void table(Table table, boolean strictCellCount, List<Map<Column, String>> rows, List<Integer> rowNumbers,
                       List<IntakeProblem> problems) throws UploadRejectedException {
        List<IntakeProblem> header = new ArrayList<>();
        Column[] at = new Column[table.header().size()];
        Map<Column, Integer> seen = new HashMap<>();
        for (int i = 0; i < at.length; i++) {
            String text = Texts.trimSpaces(table.header().get(i));
            if (text.isEmpty()) {
                continue;
            }
            Column c = column(text);
            if (c == null) {
                header.add(IntakeProblem.of(table.headerRow(), text, text, IntakeKey.HEADER_UNKNOWN_COLUMN,
                        "The column '" + Texts.shown(text) + "' is not part of the precision experiment format"
                                + " (level, measurand, replicate, value, unit)."));
            } else if (seen.put(c, i) != null) {
                header.add(IntakeProblem.of(table.headerRow(), name(c), text, IntakeKey.HEADER_DUPLICATE_COLUMN,
                        "The column '" + name(c) + "' appears more than once."));
            } else {
                at[i] = c;
            }
        }
        for (Column c : List.of(Column.LEVEL, Column.MEASURAND, Column.REPLICATE, Column.VALUE)) {
            if (!seen.containsKey(c)) {
                header.add(IntakeProblem.of(table.headerRow(), name(c), null, IntakeKey.HEADER_MISSING_COLUMN,
                        "The required column '" + name(c) + "' is missing from the header row."));
            }
        }
        if (!header.isEmpty()) {
            throw new UploadRejectedException(header);
        }
        for (Table.Row row : table.rows()) {
            if (strictCellCount ? row.cells().size() != at.length : row.cells().size() > at.length
                    && !Table.isBlank(row.cells().subList(at.length, row.cells().size()))) {
                problems.add(IntakeProblem.of(row.row(), null, null, IntakeKey.ROW_COLUMN_COUNT,
                        "The row has " + row.cells().size() + " cells but the header has " + at.length + "."));
                continue;
            }
            Map<Column, String> cells = new HashMap<>();
            for (int i = 0; i < Math.min(at.length, row.cells().size()); i++) {
                if (at[i] != null && !Texts.trimSpaces(row.cells().get(i)).isEmpty()) {
                    cells.put(at[i], Texts.trimSpaces(row.cells().get(i)));
                }
            }
            rows.add(cells);
            rowNumbers.add(row.row());
        }
    }

    private void json(byte[] content, List<Map<Column, String>> rows, List<Integer> rowNumbers,
                      List<IntakeProblem> problems) throws UploadRejectedException {
        JsonNode root;
        try {
            root = jsonMapper.readTree(new String(content, StandardCharsets.UTF_8));
        } catch (Exception e) {
            throw new UploadRejectedException(List.of(IntakeProblem.ofFile(IntakeKey.JSON_MALFORMED,
                    "The JSON text is not well-formed.")));
        }
        if (root == null || !root.isObject() || !root.path("results").isArray()) {
            throw new UploadRejectedException(List.of(IntakeProblem.ofFile(IntakeKey.JSON_STRUCTURE,
                    "Expected an object with a 'results' array.")));
        }
        JsonNode results = root.get("results");
        if (results.size() > limits.maxDataRows()) {
            throw new UploadRejectedException(List.of(IntakeProblem.ofFile(IntakeKey.FILE_TOO_MANY_ROWS,
                    "The upload has more than " + limits.maxDataRows() + " results.")));
        }
        for (int i = 0; i < results.size(); i++) {
            JsonNode element = results.get(i);
            Map<Column, String> cells = new HashMap<>();
            if (!element.isObject()) {
                problems.add(IntakeProblem.of(i + 1, null, null, IntakeKey.JSON_STRUCTURE, "Result " + (i + 1) + " is not a JSON object."));
                continue;
            }
            var fields = element.fields();
            while (fields.hasNext()) {
                var f = fields.next();
                Column c = column(f.getKey());
                if (c == null || !f.getKey().equals(name(c))) {
                    problems.add(IntakeProblem.of(i + 1, f.getKey(), null, IntakeKey.JSON_UNKNOWN_FIELD,
                            "The field '" + Texts.shown(f.getKey()) + "' is not part of the format."));
                } else if (f.getValue().isValueNode() && !f.getValue().isNull()) {
                    cells.put(c, f.getValue().isNumber() ? f.getValue().decimalValue().toPlainString() : f.getValue().asText());
                } else if (!f.getValue().isNull()) {
                    problems.add(IntakeProblem.of(i + 1, f.getKey(), null, IntakeKey.JSON_WRONG_TYPE,
                            "The field '" + f.getKey() + "' must be a string or number."));
                }
            }
            rows.add(cells);
            rowNumbers.add(i + 1);
        }
    }

    private Outcome validate(List<Map<Column, String>> rows, List<Integer> rowNumbers, Rules rules,
                             boolean commaAllowed, List<IntakeProblem> problems, Detection detection) {
        if (rows.isEmpty() && problems.isEmpty()) {
            problems.add(IntakeProblem.ofFile(IntakeKey.FILE_NO_RESULTS, "The file has no result rows."));
        }
        List<Replicate> accepted = new ArrayList<>();
        Map<String, List<Integer>> rowsOfCell = new LinkedHashMap<>();
        Map<String, Integer> seen = new HashMap<>();
        for (int i = 0; i < rows.size(); i++) {
            int row = rowNumbers.get(i);
            Map<Column, String> cells = rows.get(i);
            int before = problems.size();
            String level = text(row, Column.LEVEL, cells, problems);
            String measurand = text(row, Column.MEASURAND, cells, problems);
            String replicateText = text(row, Column.REPLICATE, cells, problems);
            String valueText = text(row, Column.VALUE, cells, problems);
            String unitText = cells.get(Column.UNIT);
            if (problems.size() > before) {
                continue;
            }
            if (!rules.levels().contains(level)) {
                problems.add(IntakeProblem.of(row, "level", level, IntakeKey.LEVEL_UNKNOWN,
                        "'" + Texts.shown(level) + "' is not a level of this study (" + String.join(", ", rules.levels()) + ")."));
            }
            MassFractionUnit canonical = rules.measurands().get(measurand);
            if (canonical == null) {
                problems.add(IntakeProblem.of(row, "measurand", measurand, IntakeKey.MEASURAND_NOT_IN_ROUND,
                        "'" + Texts.shown(measurand) + "' is not a measurand of this study ("
                                + String.join(", ", new TreeMap<>(rules.measurands()).keySet()) + ")."));
            }
            Integer replicate = null;
            if (!WHOLE.matcher(replicateText).matches()) {
                problems.add(IntakeProblem.of(row, "replicate", replicateText, IntakeKey.VALUE_NOT_AN_INTEGER,
                        "The replicate is a whole number from 1 to " + rules.replicates() + "."));
            } else {
                replicate = Integer.parseInt(replicateText);
                if (replicate < 1 || replicate > rules.replicates()) {
                    problems.add(IntakeProblem.of(row, "replicate", replicateText, IntakeKey.REPLICATE_OUT_OF_RANGE,
                            "This study asks for " + rules.replicates() + " replicates: number them 1 to "
                                    + rules.replicates() + "."));
                    replicate = null;
                }
            }
            ReportedNumber number = number(row, valueText, commaAllowed, problems);
            MassFractionUnit unit = canonical;
            if (unitText != null) {
                unit = MassFractionUnit.fromSymbol(unitText).orElse(null);
                if (unit == null) {
                    problems.add(IntakeProblem.of(row, "unit", unitText, IntakeKey.UNIT_UNKNOWN,
                            "'" + Texts.shown(unitText) + "' is not a unit; use % or mg/kg."));
                }
            }
            if (problems.size() > before || canonical == null || unit == null || number == null || replicate == null) {
                continue;
            }
            if (unit.isAbove100Percent(number.value())) {
                problems.add(IntakeProblem.of(row, "value", valueText, IntakeKey.VALUE_ABOVE_100_PERCENT,
                        "A mass fraction cannot exceed 100 % (1 000 000 mg/kg)."));
                continue;
            }
            String key = level + "|" + measurand + "|" + replicate;
            Integer earlier = seen.putIfAbsent(key, row);
            if (earlier != null) {
                problems.add(IntakeProblem.of(row, "replicate", replicateText, IntakeKey.ROW_DUPLICATE_REPLICATE,
                        "Replicate " + replicate + " of " + measurand + " at level " + level + " is already in row "
                                + earlier + "."));
                continue;
            }
            rowsOfCell.computeIfAbsent(level + "|" + measurand, k -> new ArrayList<>()).add(row);
            accepted.add(new Replicate(row, level, measurand, replicate, number, unit, unit.convert(number.value(), canonical)));
        }
        for (Map.Entry<String, List<Integer>> cell : rowsOfCell.entrySet()) {
            List<Integer> at = cell.getValue();
            if (at.size() != rules.replicates()) {
                String[] lm = cell.getKey().split("\\|");
                problems.add(IntakeProblem.of(at.get(0), "replicate", null, IntakeKey.REPLICATES_WRONG_NUMBER,
                        "Level " + lm[0] + ", " + lm[1] + ": " + at.size() + (at.size() == 1 ? " replicate" : " replicates")
                                + " reported (" + (at.size() == 1 ? "row " : "rows ")
                                + String.join(", ", at.stream().map(String::valueOf).toList())
                                + "); this study asks for exactly " + rules.replicates() + "."));
            }
        }
        if (!problems.isEmpty()) {
            List<IntakeProblem> sorted = new ArrayList<>(problems);
            sorted.sort(Comparator.comparingInt(IntakeProblem::row));
            return new Rejected(sorted, detection);
        }
        List<IntakeWarning> warnings = new ArrayList<>();
        for (String level : rules.levels()) {
            for (String m : new TreeMap<>(rules.measurands()).keySet()) {
                if (!rowsOfCell.containsKey(level + "|" + m)) {
                    warnings.add(IntakeWarning.of(0, "level", level, IntakeKey.WARNING_LEVEL_NOT_REPORTED,
                            m + " at level " + level + " is not reported."));
                }
            }
        }
        List<Replicate> ordered = new ArrayList<>(accepted);
        ordered.sort(Comparator.comparing(Replicate::level).thenComparing(Replicate::measurand)
                .thenComparingInt(Replicate::replicate));
        String json = canonicalJson(ordered);
        return new Accepted(accepted, warnings, detection, json,
                org.roundtable.submission.intake.CanonicalPayload.sha256Hex(json));
    }

    /** Canonical payload: the replicates sorted by level, measurand, replicate, with the value's decimal text. */
    static String canonicalJson(List<Replicate> sorted) {
        StringBuilder out = new StringBuilder("{\"format\":\"roundtable-precision-results-1\",\"results\":[");
        for (int i = 0; i < sorted.size(); i++) {
            Replicate r = sorted.get(i);
            out.append(i == 0 ? "" : ",").append("{\"level\":\"").append(r.level()).append("\",\"measurand\":\"")
                    .append(r.measurand()).append("\",\"replicate\":").append(r.replicate()).append(",\"unit\":\"")
                    .append(r.unit().symbol()).append("\",\"value\":\"").append(r.reported().decimalText()).append("\"}");
        }
        return out.append("]}").toString();
    }

    private String text(int row, Column c, Map<Column, String> cells, List<IntakeProblem> problems) {
        String text = cells.get(c);
        if (text == null || text.isEmpty()) {
            problems.add(IntakeProblem.of(row, name(c), null, IntakeKey.VALUE_MISSING, "The " + name(c) + " is missing."));
            return null;
        }
        if (text.length() > limits.maxCellChars()) {
            problems.add(IntakeProblem.of(row, name(c), text, IntakeKey.VALUE_TOO_LONG,
                    "The cell is longer than " + limits.maxCellChars() + " characters."));
            return null;
        }
        char first = text.charAt(0);
        if (first == '=' || first == '+' || first == '@' || (first == '-' && c != Column.VALUE)) {
            problems.add(IntakeProblem.of(row, name(c), text, IntakeKey.VALUE_FORMULA_PREFIX,
                    "The cell starts with '" + first + "', which spreadsheets treat as a formula; remove it."));
            return null;
        }
        for (int i = 0; i < text.length(); i++) {
            if (text.charAt(i) < 0x20 || text.charAt(i) == 0x7f) {
                problems.add(IntakeProblem.of(row, name(c), text, IntakeKey.VALUE_CONTROL_CHARACTER,
                        "The cell contains a line break or control character."));
                return null;
            }
        }
        return text;
    }

    private static ReportedNumber number(int row, String text, boolean commaAllowed, List<IntakeProblem> problems) {
        if (text.startsWith("-")) {
            problems.add(IntakeProblem.of(row, "value", text, IntakeKey.VALUE_NEGATIVE, "A mass fraction cannot be negative."));
            return null;
        }
        if (!PLAIN_DECIMAL.matcher(text).matches()) {
            problems.add(IntakeProblem.of(row, "value", text, IntakeKey.VALUE_NOT_A_NUMBER,
                    "'" + Texts.shown(text) + "' is not a plain decimal number."));
            return null;
        }
        if (text.indexOf(',') >= 0 && !commaAllowed) {
            problems.add(IntakeProblem.of(row, "value", text, IntakeKey.VALUE_DECIMAL_COMMA_NOT_ALLOWED,
                    "A decimal comma is only allowed in a semicolon-separated file; write " + text.replace(',', '.') + "."));
            return null;
        }
        return new ReportedNumber(text, new BigDecimal(text.replace(',', '.')));
    }

    /** The set of column names, for documentation and templates. */
    public static Set<String> columns() {
        return Set.of("level", "measurand", "replicate", "value", "unit");
    }
}
