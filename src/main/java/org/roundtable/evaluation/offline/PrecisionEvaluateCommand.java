package org.roundtable.evaluation.offline;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.io.PrintStream;
import java.io.Reader;
import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.roundtable.precision.PrecisionCalculation;

/**
 * The precision-experiment mode of the offline {@code evaluate} command: reads a CSV of replicate results, evaluates
 * it with {@link PrecisionCalculation} (the code the server runs) and prints the same JSON the server stores for an
 * evaluation run. No database, no Quarkus.
 *
 * <pre>
 * evaluate --precision [--replicates N] [--straggler 0.05] [--outlier 0.01] [--no-fit]
 *          [--exclude LABORATORY:LEVEL:MEASURAND]... FILE.csv
 * </pre>
 *
 * <p>Input: RFC 4180 CSV, UTF-8 (a byte order mark is tolerated), '.' as decimal point, header with the columns
 * {@code laboratory,level,measurand,replicate,value} (any order; a {@code unit} column is allowed and must be the same
 * for a measurand). Levels are evaluated in the order they first appear; laboratories in code order. Every cell has
 * exactly N replicates (default: the largest replicate number in the file), as the server demands.
 *
 * <p>Exit codes: 0 done; 2 bad input (message on stderr naming row — the header is row 1 —, column and reason).
 */
public final class PrecisionEvaluateCommand {

    /** The first argument that selects this mode. */
    public static final String MODE = "--precision";

    private static final List<String> REQUIRED = List.of("laboratory", "level", "measurand", "replicate", "value");
    private static final Pattern NUMBER = Pattern.compile("[0-9]+(\\.[0-9]+)?|\\.[0-9]+");

    private PrecisionEvaluateCommand() {
    }

    /** Runs the mode with the arguments after {@code --precision}. */
    public static int run(String[] args, PrintStream out, PrintStream err) {
        try {
            Integer replicates = null;
            double straggler = 0.05;
            double outlier = 0.01;
            boolean fit = true;
            List<PrecisionCalculation.Exclusion> exclusions = new ArrayList<>();
            String file = null;
            for (int i = 0; i < args.length; i++) {
                switch (args[i]) {
                    case "--replicates" -> replicates = Integer.parseInt(value(args, ++i, "--replicates"));
                    case "--straggler" -> straggler = Double.parseDouble(value(args, ++i, "--straggler"));
                    case "--outlier" -> outlier = Double.parseDouble(value(args, ++i, "--outlier"));
                    case "--no-fit" -> fit = false;
                    case "--exclude" -> {
                        String[] parts = value(args, ++i, "--exclude").split(":", -1);
                        if (parts.length != 3) {
                            throw new EvaluateCommand.BadInput("option --exclude: write LABORATORY:LEVEL:MEASURAND");
                        }
                        exclusions.add(new PrecisionCalculation.Exclusion(parts[0], parts[1], parts[2], "excluded on the command line"));
                    }
                    default -> {
                        if (args[i].startsWith("--") || file != null) {
                            throw new EvaluateCommand.BadInput("unexpected argument '" + args[i] + "'; usage: evaluate --precision"
                                    + " [--replicates N] [--straggler A] [--outlier A] [--no-fit] [--exclude LAB:LEVEL:MEASURAND]... FILE.csv");
                        }
                        file = args[i];
                    }
                }
            }
            if (file == null) {
                throw new EvaluateCommand.BadInput("no input file; usage: evaluate --precision [options] FILE.csv");
            }
            if (!(outlier > 0 && outlier < straggler && straggler < 1)) {
                throw new EvaluateCommand.BadInput("the outlier level must be below the straggler level, both between 0 and 1");
            }
            Map<String, Map<Integer, BigDecimal>> cells = new LinkedHashMap<>();
            Map<String, Integer> firstRow = new LinkedHashMap<>();
            Set<String> levels = new LinkedHashSet<>();
            Map<String, String> units = new TreeMap<>();
            int maxReplicate = read(Path.of(file), cells, firstRow, levels, units);
            int n = replicates == null ? maxReplicate : replicates;
            List<PrecisionCalculation.Cell> list = new ArrayList<>();
            for (Map.Entry<String, Map<Integer, BigDecimal>> c : cells.entrySet()) {
                String[] key = c.getKey().split("\u0000");
                if (c.getValue().size() != n || !c.getValue().keySet().equals(range(n))) {
                    throw new EvaluateCommand.BadInput("row " + firstRow.get(c.getKey()) + ": laboratory " + key[0] + ", level "
                            + key[1] + ", " + key[2] + ": replicates " + c.getValue().keySet() + " reported; " + n + " expected (1 to " + n + ")");
                }
                double[] v = c.getValue().values().stream().mapToDouble(BigDecimal::doubleValue).toArray();
                list.add(new PrecisionCalculation.Cell(key[0], key[1], key[2], v));
            }
            Map<String, String> materials = new LinkedHashMap<>();
            levels.forEach(l -> materials.put(l, ""));
            PrecisionCalculation.Study study = PrecisionCalculation.evaluate(new PrecisionCalculation.Design(
                    List.copyOf(levels), materials, units, n, straggler, outlier, fit), list, exclusions);
            out.println(new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(study));
            out.flush();
            return EvaluateCommand.OK;
        } catch (EvaluateCommand.BadInput | IllegalArgumentException e) {
            err.println("evaluate: " + e.getMessage());
            return EvaluateCommand.BAD_INPUT;
        } catch (IOException e) {
            err.println("evaluate: " + e.getMessage());
            return EvaluateCommand.BAD_INPUT;
        }
    }

    private static Set<Integer> range(int n) {
        Set<Integer> s = new TreeSet<>();
        for (int i = 1; i <= n; i++) {
            s.add(i);
        }
        return s;
    }

    private static String value(String[] args, int i, String option) throws EvaluateCommand.BadInput {
        if (i >= args.length) {
            throw new EvaluateCommand.BadInput("option " + option + " needs a value");
        }
        return args[i];
    }

    private static int read(Path file, Map<String, Map<Integer, BigDecimal>> cells, Map<String, Integer> firstRow,
                            Set<String> levels, Map<String, String> units) throws IOException, EvaluateCommand.BadInput {
        String text = Files.readString(file, StandardCharsets.UTF_8);
        if (text.startsWith("\uFEFF")) {
            text = text.substring(1);
        }
        int max = 0;
        try (Reader reader = new java.io.StringReader(text);
             CSVParser parser = CSVFormat.RFC4180.builder().setHeader().setSkipHeaderRecord(true).get().parse(reader)) {
            for (String c : REQUIRED) {
                if (!parser.getHeaderMap().containsKey(c)) {
                    throw new EvaluateCommand.BadInput("row 1: the column '" + c + "' is missing");
                }
            }
            boolean hasUnit = parser.getHeaderMap().containsKey("unit");
            for (CSVRecord r : parser) {
                int row = (int) r.getRecordNumber() + 1;
                String lab = r.get("laboratory").strip();
                String level = r.get("level").strip();
                String measurand = r.get("measurand").strip();
                if (lab.isEmpty() || level.isEmpty() || measurand.isEmpty() || lab.contains(":")) {
                    throw new EvaluateCommand.BadInput("row " + row + ": laboratory, level and measurand must be given");
                }
                int replicate;
                try {
                    replicate = Integer.parseInt(r.get("replicate").strip());
                } catch (NumberFormatException e) {
                    throw new EvaluateCommand.BadInput("row " + row + ", column replicate: not a whole number");
                }
                String value = r.get("value").strip();
                if (!NUMBER.matcher(value).matches()) {
                    throw new EvaluateCommand.BadInput("row " + row + ", column value: '" + value + "' is not a plain decimal number");
                }
                String unit = hasUnit ? r.get("unit").strip() : "";
                String known = units.putIfAbsent(measurand, unit);
                if (known != null && !known.equals(unit)) {
                    throw new EvaluateCommand.BadInput("row " + row + ", column unit: " + measurand + " is in '" + known + "' above");
                }
                String key = lab + "\u0000" + level + "\u0000" + measurand;
                firstRow.putIfAbsent(key, row);
                levels.add(level);
                if (cells.computeIfAbsent(key, k -> new TreeMap<>()).put(replicate, new BigDecimal(value)) != null) {
                    throw new EvaluateCommand.BadInput("row " + row + ": replicate " + replicate + " of laboratory " + lab
                            + ", level " + level + ", " + measurand + " is given twice");
                }
                max = Math.max(max, replicate);
            }
        }
        if (cells.isEmpty()) {
            throw new EvaluateCommand.BadInput("the file has no result rows");
        }
        return max;
    }
}
