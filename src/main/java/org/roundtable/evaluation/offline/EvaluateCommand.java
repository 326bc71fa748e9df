package org.roundtable.evaluation.offline;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.PrintStream;
import java.io.Reader;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.roundtable.statistics.MeasurandEvaluation;
import org.roundtable.statistics.StatisticsWarning;

/**
 * The offline {@code evaluate} command: reads a CSV of results, evaluates every measurand with
 * {@link MeasurandEvaluation} and prints JSON on stdout. No database, no Quarkus, no CDI.
 *
 * <pre>
 * evaluate [--sigma-pt MEASURAND=VALUE]... [--assigned MEASURAND=VALUE:EXPANDED_U]... FILE.csv
 * </pre>
 *
 * <p>Input: RFC 4180 CSV, UTF-8 (a byte order mark is tolerated), '.' as decimal point, a header
 * with exactly the columns {@code participant,measurand,unit,value,expanded_uncertainty,
 * coverage_factor,method} (any order). {@code value} is a number or {@code <number}; the last
 * three columns may be empty (k defaults to 2). One unit per measurand, one row per participant
 * and measurand. Command-line values are in the file's unit; an {@code --assigned} expanded
 * uncertainty is at k = 2.
 *
 * <p>Exit codes: 0 done; 2 bad input (message on stderr naming row — the header is row 1 —,
 * column and reason).
 */
public final class EvaluateCommand {

    /** Exit code for success. */
    public static final int OK = 0;
    /** Exit code for bad input or bad options. */
    public static final int BAD_INPUT = 2;

    static final List<String> COLUMNS = List.of("participant", "measurand", "unit", "value",
            "expanded_uncertainty", "coverage_factor", "method");

    private static final String USAGE = "usage: evaluate [--sigma-pt MEASURAND=VALUE]..."
            + " [--assigned MEASURAND=VALUE:EXPANDED_U]... FILE.csv";
    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");

    private EvaluateCommand() {
    }

    /** Signals bad input; the message names row, column and reason where they apply. */
    static final class BadInput extends Exception {
        private static final long serialVersionUID = 1L;

        BadInput(String message) {
            super(message);
        }
    }

    private record Assigned(double value, double expandedUncertainty) {
    }

    /**
     * Runs the command.
     *
     * @param args the arguments after the word {@code evaluate}
     * @param out  receives the JSON
     * @param err  receives messages
     * @return exit code: 0 done, 2 bad input
     */
    public static int run(String[] args, PrintStream out, PrintStream err) {
        if (args.length > 0 && PrecisionEvaluateCommand.MODE.equals(args[0])) {
            return PrecisionEvaluateCommand.run(java.util.Arrays.copyOfRange(args, 1, args.length), out, err);
        }
        try {
            Map<String, Double> sigmas = new LinkedHashMap<>();
            Map<String, Assigned> assigned = new LinkedHashMap<>();
            String file = parseArguments(args, sigmas, assigned);
            Map<String, List<MeasurandEvaluation.ParticipantResult>> byMeasurand = new LinkedHashMap<>();
            Map<String, String> units = new HashMap<>();
            readCsv(Path.of(file), byMeasurand, units);
            for (String m : sigmas.keySet()) {
                if (!byMeasurand.containsKey(m)) {
                    throw new BadInput("option --sigma-pt: measurand '" + m + "' is not in " + file);
                }
            }
            for (String m : assigned.keySet()) {
                if (!byMeasurand.containsKey(m)) {
                    throw new BadInput("option --assigned: measurand '" + m + "' is not in " + file);
                }
            }
            ObjectMapper mapper = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
            ObjectNode root = mapper.createObjectNode();
            ArrayNode measurands = root.putArray("measurands");
            for (Map.Entry<String, List<MeasurandEvaluation.ParticipantResult>> e : byMeasurand.entrySet()) {
                String m = e.getKey();
                Assigned a = assigned.get(m);
                MeasurandEvaluation.Result r = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(
                        m, units.get(m), e.getValue(), a == null ? null : a.value(),
                        a == null ? null : a.expandedUncertainty(), sigmas.get(m)));
                measurands.add(toJson(mapper, r));
                for (StatisticsWarning w : r.warnings()) {
                    err.println("warning: " + m + ": " + w.code() + ": " + w.message());
                }
            }
            out.println(mapper.writeValueAsString(root));
            out.flush();
            return OK;
        } catch (BadInput e) {
            err.println("evaluate: " + e.getMessage());
            return BAD_INPUT;
        } catch (IOException e) {
            err.println("evaluate: " + e.getMessage());
            return BAD_INPUT;
        }
    }

    private static String parseArguments(String[] args, Map<String, Double> sigmas,
            Map<String, Assigned> assigned) throws BadInput {
        String file = null;
        for (int i = 0; i < args.length; i++) {
            String arg = args[i];
            String option = arg;
            String value = null;
            int eq = arg.indexOf('=');
            if (arg.startsWith("--") && eq > 0) {
                option = arg.substring(0, eq);
                value = arg.substring(eq + 1);
            }
            switch (option) {
                case "--sigma-pt", "--assigned" -> {
                    if (value == null) {
                        if (i + 1 >= args.length) {
                            throw new BadInput("option " + option + " needs a value. " + USAGE);
                        }
                        value = args[++i];
                    }
                    int sep = value.lastIndexOf('=');
                    if (sep <= 0) {
                        throw new BadInput("option " + option + " '" + value + "': expected MEASURAND="
                                + (option.equals("--assigned") ? "VALUE:EXPANDED_U" : "VALUE"));
                    }
                    String measurand = value.substring(0, sep).trim();
                    String number = value.substring(sep + 1).trim();
                    if (option.equals("--sigma-pt")) {
                        double s = parseOptionNumber(option, measurand, number);
                        if (!(s > 0)) {
                            throw new BadInput("option --sigma-pt " + measurand + ": sigma_pt must be > 0, got " + number);
                        }
                        if (sigmas.put(measurand, s) != null) {
                            throw new BadInput("option --sigma-pt given twice for measurand '" + measurand + "'");
                        }
                    } else {
                        int colon = number.indexOf(':');
                        if (colon < 0) {
                            throw new BadInput("option --assigned " + measurand + ": expected VALUE:EXPANDED_U, got '"
                                    + number + "'");
                        }
                        double x = parseOptionNumber(option, measurand, number.substring(0, colon).trim());
                        double u = parseOptionNumber(option, measurand, number.substring(colon + 1).trim());
                        if (u < 0) {
                            throw new BadInput("option --assigned " + measurand + ": expanded uncertainty must be >= 0");
                        }
                        if (assigned.put(measurand, new Assigned(x, u)) != null) {
                            throw new BadInput("option --assigned given twice for measurand '" + measurand + "'");
                        }
                    }
                }
                default -> {
                    if (arg.startsWith("-") && !arg.equals("-")) {
                        throw new BadInput("unknown option '" + arg + "'. " + USAGE);
                    }
                    if (file != null) {
                        throw new BadInput("more than one input file ('" + file + "', '" + arg + "'). " + USAGE);
                    }
                    file = arg;
                }
            }
        }
        if (file == null) {
            throw new BadInput("no input file. " + USAGE);
        }
        return file;
    }

    private static double parseOptionNumber(String option, String measurand, String text) throws BadInput {
        if (!NUMBER.matcher(text).matches()) {
            throw new BadInput("option " + option + " " + measurand + ": '" + text + "' is not a number"
                    + " (use '.' as decimal point)");
        }
        double v = Double.parseDouble(text);
        if (!Double.isFinite(v)) {
            throw new BadInput("option " + option + " " + measurand + ": '" + text + "' is out of range");
        }
        return v;
    }

    private static void readCsv(Path file, Map<String, List<MeasurandEvaluation.ParticipantResult>> byMeasurand,
            Map<String, String> units) throws BadInput {
        String text;
        try (InputStream in = Files.newInputStream(file)) {
            byte[] bytes = in.readAllBytes();
            text = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT)
                    .decode(java.nio.ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            throw new BadInput(file + ": not valid UTF-8");
        } catch (IOException e) {
            throw new BadInput(file + ": cannot read file (" + e.getClass().getSimpleName() + ": "
                    + e.getMessage() + ")");
        }
        if (text.startsWith("\uFEFF")) {
            text = text.substring(1);
        }
        CSVFormat format = CSVFormat.RFC4180.builder().setIgnoreSurroundingSpaces(false).get();
        Map<String, Integer> rowOf = new HashMap<>();
        Map<String, Integer> unitRow = new HashMap<>();
        try (Reader reader = new java.io.StringReader(text); CSVParser parser = CSVParser.parse(reader, format)) {
            Map<String, Integer> index = null;
            for (CSVRecord record : parser) {
                long row = record.getRecordNumber();
                if (index == null) {
                    index = header(record);
                    continue;
                }
                if (record.size() == 1 && record.get(0).isBlank()) {
                    continue; // blank line
                }
                if (record.size() != COLUMNS.size()) {
                    throw new BadInput("row " + row + ": has " + record.size() + " fields, the header has "
                            + COLUMNS.size());
                }
                String participant = field(record, index, "participant");
                String measurand = field(record, index, "measurand");
                String unit = field(record, index, "unit");
                String reported = field(record, index, "value");
                String uText = field(record, index, "expanded_uncertainty");
                String kText = field(record, index, "coverage_factor");
                String method = field(record, index, "method");
                requireNonEmpty(row, "participant", participant);
                requireNonEmpty(row, "measurand", measurand);
                requireNonEmpty(row, "unit", unit);
                requireNonEmpty(row, "value", reported);
                boolean lessThan = reported.startsWith("<");
                String numberText = lessThan ? reported.substring(1).trim() : reported;
                double value = parseNumber(row, "value", numberText, lessThan
                        ? "expected '<' followed by a number" : "expected a number or '<number'");
                Double u = null;
                if (!uText.isEmpty()) {
                    u = parseNumber(row, "expanded_uncertainty", uText, "expected a number");
                    if (u < 0) {
                        throw new BadInput("row " + row + ", column expanded_uncertainty: must be >= 0, got '" + uText + "'");
                    }
                }
                Double k = null;
                if (!kText.isEmpty()) {
                    k = parseNumber(row, "coverage_factor", kText, "expected a number");
                    if (!(k > 0)) {
                        throw new BadInput("row " + row + ", column coverage_factor: must be > 0, got '" + kText + "'");
                    }
                    if (u == null) {
                        throw new BadInput("row " + row + ", column coverage_factor: given without an expanded_uncertainty");
                    }
                }
                String previousUnit = units.putIfAbsent(measurand, unit);
                if (previousUnit == null) {
                    unitRow.put(measurand, (int) row);
                } else if (!previousUnit.equals(unit)) {
                    throw new BadInput("row " + row + ", column unit: '" + unit + "' differs from '" + previousUnit
                            + "' (row " + unitRow.get(measurand) + ") for measurand '" + measurand
                            + "'; one unit per measurand");
                }
                Integer earlier = rowOf.putIfAbsent(participant + "\u0000" + measurand, (int) row);
                if (earlier != null) {
                    throw new BadInput("row " + row + ", column participant: duplicate result of '" + participant
                            + "' for measurand '" + measurand + "' (first in row " + earlier + ")");
                }
                byMeasurand.computeIfAbsent(measurand, m -> new ArrayList<>()).add(
                        new MeasurandEvaluation.ParticipantResult(participant, reported, value, lessThan, u, k,
                                method.isEmpty() ? null : method));
            }
            if (index == null) {
                throw new BadInput("row 1: the file is empty; expected the header " + String.join(",", COLUMNS));
            }
        } catch (java.io.UncheckedIOException | IllegalStateException e) {
            throw new BadInput(file + ": not valid CSV (" + e.getMessage() + ")");
        } catch (IOException e) {
            throw new BadInput(file + ": not valid CSV (" + e.getMessage() + ")");
        }
    }

    private static Map<String, Integer> header(CSVRecord record) throws BadInput {
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < record.size(); i++) {
            String name = record.get(i).trim();
            if (!COLUMNS.contains(name)) {
                throw new BadInput("row 1, column " + (i + 1) + ": unknown column '" + name + "'; expected "
                        + String.join(",", COLUMNS));
            }
            if (index.put(name, i) != null) {
                throw new BadInput("row 1, column " + (i + 1) + ": column '" + name + "' appears twice");
            }
        }
        for (String c : COLUMNS) {
            if (!index.containsKey(c)) {
                throw new BadInput("row 1: missing column '" + c + "'; expected " + String.join(",", COLUMNS));
            }
        }
        return index;
    }

    private static String field(CSVRecord record, Map<String, Integer> index, String column) {
        return record.get(index.get(column)).trim();
    }

    private static void requireNonEmpty(long row, String column, String text) throws BadInput {
        if (text.isEmpty()) {
            throw new BadInput("row " + row + ", column " + column + ": must not be empty");
        }
    }

    private static double parseNumber(long row, String column, String text, String expectation) throws BadInput {
        if (!NUMBER.matcher(text).matches()) {
            throw new BadInput("row " + row + ", column " + column + ": '" + text + "' is not a number ("
                    + expectation + ", '.' as decimal point)");
        }
        double v = Double.parseDouble(text);
        if (!Double.isFinite(v)) {
            throw new BadInput("row " + row + ", column " + column + ": '" + text + "' is out of range");
        }
        return v;
    }

    private static ObjectNode toJson(ObjectMapper mapper, MeasurandEvaluation.Result r) {
        ObjectNode n = mapper.createObjectNode();
        n.put("measurand", r.measurand());
        n.put("unit", r.unit());
        n.put("n", r.n());
        n.put("censored", r.censored());
        n.put("median", r.median());
        n.put("madE", r.madE());
        n.put("nIqr", r.nIqr());
        n.put("robustMean", r.robustMean());
        n.put("robustSd", r.robustSd());
        n.put("iterations", r.iterations());
        n.put("converged", r.converged());
        n.put("assignedValue", r.assignedValue());
        n.put("assignedValueUncertainty", r.assignedValueUncertainty());
        n.put("sigmaPt", r.sigmaPt());
        n.put("sigmaPtSource", r.sigmaPtSource() == null ? null
                : r.sigmaPtSource() == MeasurandEvaluation.SigmaPtSource.GIVEN ? "given" : "robustSd");
        n.put("scoreUsed", r.scoreUsed() == null ? null : r.scoreUsed().jsonName());
        n.put("scoreUsedReason", r.scoreUsedReason());
        ArrayNode warnings = n.putArray("warnings");
        for (StatisticsWarning w : r.warnings()) {
            warnings.addObject().put("code", w.code()).put("message", w.message());
        }
        ArrayNode scores = n.putArray("scores");
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            ObjectNode o = scores.addObject();
            o.put("participant", s.participant());
            o.put("reported", s.reported());
            o.put("value", s.value());
            o.put("z", s.z());
            o.put("zPrime", s.zPrime());
            o.put("zeta", s.zeta());
            o.put("en", s.en());
            o.put("classification", s.classification());
        }
        return n;
    }

}
