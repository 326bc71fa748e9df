package org.roundtable.evaluation.offline;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import java.util.ArrayList;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Pattern;
import java.math.BigDecimal;
import org.roundtable.platform.NumberFormats;
import org.roundtable.statistics.MeasurandEvaluation;
import org.roundtable.submission.intake.ChemicalElements;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.QuartileRule;
import org.roundtable.statistics.score.BoundaryRule;
import org.roundtable.statistics.StatisticsWarning;

/**
 * The offline {@code evaluate} command: reads a CSV of results, evaluates every measurand with
 * {@link MeasurandEvaluation} and prints JSON on stdout. No database, no Quarkus, no CDI.
 *
 * <pre>
 * evaluate [--sigma-pt MEASURAND=VALUE]... [--assigned MEASURAND=VALUE[:EXPANDED_U[:K]]]...
 *          [--score-decimals MEASURAND=N]... [--coverage-factor MEASURAND=K]...
 *          [--minimum-participants MEASURAND=N]... [--minimum-for-sigma MEASURAND=N]...
 *          [--information-only MEASURAND]... [--digits MEASURAND=N]... [--negative-allowed MEASURAND[,MEASURAND]...]...
 *          [--format json|csv] FILE.csv
 * </pre>
 *
 * <p>Output: with {@code --format json} (the default) one compact JSON object per measurand per line (JSON Lines),
 * in order of the measurands' first appearance in the file; with {@code --format csv} a header and one row per
 * score with the numbers as printed ({@link #CSV_COLUMNS}), for spreadsheets. Warnings go to stderr, and so do
 * progress lines for files of {@value #PROGRESS_ROWS} results or more.
 *
 * <p>Memory: the file is read record by record into primitive columns ({@code ResultColumns}, about 45 bytes a
 * result); measurands are evaluated a few at a time (two per core, each one's output built as text), written in
 * file order and dropped, so memory grows with the measurands in work, not with the file: 1,000,000 rows of 100
 * measurands run in a 256 MB heap.
 *
 * <p>The options are a plan's choices for one measurand, with the plan's defaults: score decimals 2 (scores are
 * classified as printed), En with both expanded uncertainties at k = 2, at least 10 results for a consensus x_pt
 * and for a data-derived σ_pt (below them nobody is scored, or, with {@code --information-only}, scores carry no
 * classification). {@code --assigned} values and {@code --sigma-pt} are kept as the decimals written, so the z/z′
 * choice compares u(x_pt) = U/k with 0.3·σ_pt exactly. {@code --digits} sets the measurand's reporting digits for
 * the printed numbers (default: the most decimals among its reported values). {@code --negative-allowed Cu,Ni} is the
 * plan's "accept negative results" for those measurands (blank-corrected trace elements); elsewhere a negative value
 * is refused, as by the server.
 *
 * <p>Input: RFC 4180 CSV, UTF-8 (a byte order mark is tolerated), LF or CRLF line ends, '.' as decimal point —
 * or, as in the server's upload, ';' as delimiter with a decimal comma —, element symbols in any case, a header
 * with exactly the columns {@code participant,measurand,unit,value,expanded_uncertainty,
 * coverage_factor,method} (any order). {@code value} is a number or {@code <number}; the last
 * three columns may be empty (k defaults to 2). One unit per measurand, one row per participant
 * and measurand. Command-line values are in the file's unit; an {@code --assigned} expanded
 * uncertainty is at k = 2. {@code value}, {@code expanded_uncertainty} and {@code coverage_factor} are checked by the
 * server's own validation ({@code submission.intake.ResultCheck}, the code the upload runs): plain decimals (no
 * exponent), no formula prefix, U not zero, and the messages are the upload's.
 *
 * <p>Exit codes: 0 done; 2 bad input (message on stderr naming row — the header is row 1 —,
 * column and reason), also a file with a header and no rows. The rules of the numbers are the server's: k between
 * 1 and 4, a mass fraction in % or mg/kg at most 100 %, negative values only where {@code --negative-allowed} names
 * the measurand; the same bad row gives the server's message.
 */
public final class EvaluateCommand {

    /** Exit code for success. */
    public static final int OK = 0;
    /** Exit code for bad input or bad options. */
    public static final int BAD_INPUT = 2;

    static final List<String> COLUMNS = List.of("participant", "measurand", "unit", "value",
            "expanded_uncertainty", "coverage_factor", "method");

    private static final String USAGE = "usage: evaluate [--sigma-pt MEASURAND=VALUE]..."
            + " [--assigned MEASURAND=VALUE:EXPANDED_U[:K]]... [--score-decimals MEASURAND=N]..."
            + " [--coverage-factor MEASURAND=K]... [--minimum-participants MEASURAND=N]..."
            + " [--minimum-for-sigma MEASURAND=N]... [--information-only MEASURAND]... [--digits MEASURAND=N]..."
            + " [--negative-allowed MEASURAND[,MEASURAND]...]... [--format json|csv] FILE.csv";
    private static final List<String> VALUED = List.of("--sigma-pt", "--assigned", "--score-decimals",
            "--coverage-factor", "--minimum-participants", "--minimum-for-sigma", "--digits");
    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");
    /** Files with at least this many results get progress lines on stderr. */
    static final int PROGRESS_ROWS = 100_000;
    /** The columns of {@code --format csv}: one row per score, the numbers as printed. */
    static final List<String> CSV_COLUMNS = List.of("measurand", "unit", "participant", "reported", "value",
            "assigned_value", "sigma_pt", "score_used", "z", "z_prime", "zeta", "en", "classification",
            "information_only");

    private EvaluateCommand() {
    }

    /** Signals bad input; the message names row, column and reason where they apply. */
    static final class BadInput extends Exception {
        private static final long serialVersionUID = 1L;

        BadInput(String message) {
            super(message);
        }
    }

    private record Assigned(double value, double expandedUncertainty, BigDecimal decimalU, BigDecimal decimalK) {
    }

    /** One measurand's options besides x_pt and σ_pt. */
    private static final class Choices {
        Integer scoreDecimals;
        BigDecimal coverageFactor;
        Integer minimumParticipants;
        Integer minimumForSigma;
        boolean informationOnly;
        Integer digits;
        BigDecimal sigmaDecimal;
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
            Map<String, Choices> choices = new LinkedHashMap<>();
            String[] format = {"json"};
            java.util.Set<String> negativeAllowed = new java.util.HashSet<>();
            String file = parseArguments(args, sigmas, assigned, choices, negativeAllowed, format);
            ResultColumns.File input = ResultColumns.read(Path.of(file), negativeAllowed, err);
            for (String m : sigmas.keySet()) {
                if (!input.measurands().containsKey(m)) {
                    throw new BadInput("option --sigma-pt: measurand '" + m + "' is not in " + file);
                }
            }
            for (String m : assigned.keySet()) {
                if (!input.measurands().containsKey(m)) {
                    throw new BadInput("option --assigned: measurand '" + m + "' is not in " + file);
                }
            }
            for (String m : choices.keySet()) {
                if (!input.measurands().containsKey(m)) {
                    throw new BadInput("option for measurand '" + m + "': it is not in " + file);
                }
            }
            boolean csv = format[0].equals("csv");
            if (csv) {
                out.println(String.join(",", CSV_COLUMNS));
            }
            int total = input.measurands().size();
            boolean progress = input.rows() >= PROGRESS_ROWS;
            // one measurand at a time per worker: its results are built, evaluated and written to text, then
            // dropped; the texts are printed in the file's order, at most two per worker waiting
            int workers = Math.max(1, Math.min(Runtime.getRuntime().availableProcessors(), total));
            java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(workers,
                    task -> {
                        Thread t = new Thread(task, "evaluate");
                        t.setDaemon(true);
                        return t;
                    });
            try {
                java.util.ArrayDeque<java.util.concurrent.Future<Chunk>> ahead = new java.util.ArrayDeque<>();
                java.util.Iterator<Map.Entry<String, ResultColumns>> it = input.measurands().entrySet().iterator();
                int done = 0;
                while (it.hasNext() || !ahead.isEmpty()) {
                    while (it.hasNext() && ahead.size() < 2 * workers) {
                        Map.Entry<String, ResultColumns> e = it.next();
                        it.remove();
                        String m = e.getKey();
                        ResultColumns columns = e.getValue();
                        ahead.add(pool.submit(() -> evaluateOne(m, columns, input, assigned.get(m),
                                choices.getOrDefault(m, new Choices()), sigmas.get(m), csv)));
                    }
                    Chunk chunk = ahead.removeFirst().get();
                    out.print(chunk.text());
                    out.flush();
                    chunk.warnings().forEach(err::println);
                    done++;
                    if (progress) {
                        err.println("progress: " + done + " of " + total + " measurands evaluated");
                    }
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IOException("interrupted", e);
            } catch (java.util.concurrent.ExecutionException e) {
                // a failure of the evaluation itself (an OutOfMemoryError included) is not bad input: it leaves
                // as it came, and the command does not exit 2
                if (e.getCause() instanceof RuntimeException runtime) {
                    throw runtime;
                }
                if (e.getCause() instanceof Error error) {
                    throw error;
                }
                throw new IllegalStateException(e.getCause());
            } finally {
                pool.shutdownNow();
            }
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
            Map<String, Assigned> assigned, Map<String, Choices> choices, java.util.Set<String> negativeAllowed,
            String[] format) throws BadInput {
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
            if (option.equals("--format")) {
                if (value == null) {
                    if (i + 1 >= args.length) {
                        throw new BadInput("option --format needs json or csv. " + USAGE);
                    }
                    value = args[++i];
                }
                if (!value.equals("json") && !value.equals("csv")) {
                    throw new BadInput("option --format: '" + value + "' is neither json nor csv. " + USAGE);
                }
                format[0] = value;
                continue;
            }
            if (option.equals("--negative-allowed")) {
                if (value == null) {
                    if (i + 1 >= args.length) {
                        throw new BadInput("option --negative-allowed needs one or more measurands (Cu,Ni). " + USAGE);
                    }
                    value = args[++i];
                }
                for (String m : value.split(",")) {
                    if (m.isBlank()) {
                        throw new BadInput("option --negative-allowed: '" + value + "' names an empty measurand");
                    }
                    negativeAllowed.add(measurandName(m.trim()));
                }
                continue;
            }
            if (option.equals("--information-only")) {
                if (value == null) {
                    if (i + 1 >= args.length) {
                        throw new BadInput("option --information-only needs a measurand. " + USAGE);
                    }
                    value = args[++i];
                }
                choices.computeIfAbsent(measurandName(value.trim()), m -> new Choices()).informationOnly = true;
                continue;
            }
            if (!VALUED.contains(option)) {
                if (arg.startsWith("-") && !arg.equals("-")) {
                    throw new BadInput("unknown option '" + arg + "'. " + USAGE);
                }
                if (file != null) {
                    throw new BadInput("more than one input file ('" + file + "', '" + arg + "'). " + USAGE);
                }
                file = arg;
                continue;
            }
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
            String measurand = measurandName(value.substring(0, sep).trim());
            String number = value.substring(sep + 1).trim();
            Choices c = option.equals("--sigma-pt") || option.equals("--assigned") ? null
                    : choices.computeIfAbsent(measurand, m -> new Choices());
            switch (option) {
                case "--sigma-pt" -> {
                    double s = parseOptionNumber(option, measurand, number);
                    if (!(s > 0)) {
                        throw new BadInput("option --sigma-pt " + measurand + ": sigma_pt must be > 0, got " + number);
                    }
                    if (sigmas.put(measurand, s) != null) {
                        throw new BadInput("option --sigma-pt given twice for measurand '" + measurand + "'");
                    }
                    choices.computeIfAbsent(measurand, m -> new Choices()).sigmaDecimal = new BigDecimal(number);
                }
                case "--assigned" -> {
                    String[] parts = number.split(":", -1);
                    if (parts.length < 2 || parts.length > 3) {
                        throw new BadInput("option --assigned " + measurand + ": expected VALUE:EXPANDED_U[:K], got '"
                                + number + "'");
                    }
                    double x = parseOptionNumber(option, measurand, parts[0].trim());
                    double u = parseOptionNumber(option, measurand, parts[1].trim());
                    if (u < 0) {
                        throw new BadInput("option --assigned " + measurand + ": expanded uncertainty must be >= 0");
                    }
                    BigDecimal k = BigDecimal.valueOf(2);
                    if (parts.length == 3) {
                        double kk = parseOptionNumber(option, measurand, parts[2].trim());
                        if (!(kk > 0)) {
                            throw new BadInput("option --assigned " + measurand + ": the coverage factor must be > 0");
                        }
                        k = new BigDecimal(parts[2].trim());
                    }
                    if (assigned.put(measurand, new Assigned(x, u, new BigDecimal(parts[1].trim()), k)) != null) {
                        throw new BadInput("option --assigned given twice for measurand '" + measurand + "'");
                    }
                }
                case "--coverage-factor" -> {
                    double k = parseOptionNumber(option, measurand, number);
                    if (!(k > 0)) {
                        throw new BadInput("option --coverage-factor " + measurand + ": k must be > 0, got " + number);
                    }
                    c.coverageFactor = new BigDecimal(number);
                }
                case "--score-decimals" -> c.scoreDecimals = wholeNumber(option, measurand, number, 0, 6);
                case "--minimum-participants" -> c.minimumParticipants = wholeNumber(option, measurand, number, 1, 999999);
                case "--minimum-for-sigma" -> c.minimumForSigma = wholeNumber(option, measurand, number, 1, 999999);
                case "--digits" -> c.digits = wholeNumber(option, measurand, number, 0, 12);
                default -> throw new IllegalStateException(option);
            }
        }
        if (file == null) {
            throw new BadInput("no input file. " + USAGE);
        }
        return file;
    }

    private static int wholeNumber(String option, String measurand, String text, int low, int high) throws BadInput {
        if (!text.matches("[0-9]{1,6}") || Integer.parseInt(text) < low || Integer.parseInt(text) > high) {
            throw new BadInput("option " + option + " " + measurand + ": '" + text + "' is not a whole number from "
                    + low + " to " + high);
        }
        return Integer.parseInt(text);
    }

    /** Reporting digits when none are given: the most decimals among the measurand's reported values. */
    private static int decimalsOf(List<MeasurandEvaluation.ParticipantResult> results) {
        int most = 0;
        for (MeasurandEvaluation.ParticipantResult r : results) {
            String text = r.reported().startsWith("<") ? r.reported().substring(1).trim() : r.reported();
            int dot = text.indexOf('.');
            if (dot >= 0 && !text.contains("e") && !text.contains("E")) {
                most = Math.max(most, text.length() - dot - 1);
            }
        }
        return most;
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

    /**
     * A measurand name with the server's case rule for element symbols: {@code mn} and {@code MN} are Mn, also
     * before an item label ({@code mn-1} is Mn-1); any other name is kept as written.
     */
    static String measurandName(String text) {
        int dash = text.indexOf('-');
        String head = dash < 0 ? text : text.substring(0, dash);
        return ChemicalElements.symbolIgnoringCase(head).map(symbol -> dash < 0 ? symbol : symbol + text.substring(dash))
                .orElse(text);
    }






    private static void writeCsv(java.io.Writer out, MeasurandEvaluation.Result r, int digits) throws IOException {
        StringBuilder line = new StringBuilder(160);
        String assignedValue = NumberFormats.plainStatistic(r.assignedValue(), digits);
        String sigmaPt = NumberFormats.plainStatistic(r.sigmaPt(), digits);
        String used = r.scoreUsed() == null ? "" : r.scoreUsed().jsonName();
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            line.setLength(0);
            boolean informationOnly = r.informationOnly() && s.value() != null
                    && (s.z() != null || s.zPrime() != null || s.zeta() != null || s.en() != null);
            String[] cells = {r.measurand(), r.unit(), s.participant(), s.reported(),
                    NumberFormats.plainResult(s.value(), digits), assignedValue, sigmaPt, used,
                    NumberFormats.plainScore(s.z(), r.scoreDecimals()),
                    NumberFormats.plainScore(s.zPrime(), r.scoreDecimals()),
                    NumberFormats.plainScore(s.zeta(), r.scoreDecimals()),
                    NumberFormats.plainScore(s.en(), r.scoreDecimals()),
                    s.classification(), informationOnly ? "true" : "false"};
            for (int i = 0; i < cells.length; i++) {
                if (i > 0) {
                    line.append(',');
                }
                // participant codes, units and reported texts come from the file: written as text cells; the
                // numbers are ours and keep their minus sign
                boolean fromFile = i <= 3;
                line.append(fromFile ? org.roundtable.platform.CsvText.cell(cells[i])
                        : cells[i] == null ? "" : cells[i]);
            }
            line.append('\n');
            out.append(line);
        }
    }

    /** One measurand's output text (a JSON line or CSV rows) and its warning lines for stderr. */
    private record Chunk(String text, List<String> warnings) {
    }

    private static final JsonFactory JSON = new JsonFactory();

    private static Chunk evaluateOne(String m, ResultColumns columns, ResultColumns.File input, Assigned a,
            Choices c, Double sigma, boolean csv) throws IOException {
        List<MeasurandEvaluation.ParticipantResult> results = columns.results(input.participants());
        MeasurandEvaluation.Rules rules = new MeasurandEvaluation.Rules(QuartileRule.DEFAULT,
                AlgorithmA.StoppingRule.FULL_CONVERGENCE, BoundaryRule.DEFAULT,
                c.scoreDecimals == null ? NumberFormats.DEFAULT_SCORE_DECIMALS : c.scoreDecimals,
                c.coverageFactor == null ? MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR
                        : c.coverageFactor.doubleValue());
        MeasurandEvaluation.SmallRounds small = new MeasurandEvaluation.SmallRounds(
                c.minimumParticipants == null ? MeasurandEvaluation.MINIMUM_PARTICIPANTS : c.minimumParticipants,
                c.minimumForSigma == null ? MeasurandEvaluation.MINIMUM_PARTICIPANTS : c.minimumForSigma,
                c.informationOnly, null);
        MeasurandEvaluation.Decimals decimals = new MeasurandEvaluation.Decimals(
                a == null ? null : a.decimalU(), a == null ? null : a.decimalK(), c.sigmaDecimal);
        // U(x_pt) at k = 2 for the statistics core (u = U/k)
        Double bigU = a == null ? null : a.expandedUncertainty() / a.decimalK().doubleValue()
                * MeasurandEvaluation.DEFAULT_COVERAGE_FACTOR;
        MeasurandEvaluation.Result r = MeasurandEvaluation.evaluate(new MeasurandEvaluation.Input(
                m, input.units().get(m), results, a == null ? null : a.value(), bigU, sigma, rules,
                decimals, small));
        int digits = c.digits != null ? c.digits : decimalsOf(results);
        java.io.StringWriter text = new java.io.StringWriter(64 + 160 * r.scores().size());
        if (csv) {
            writeCsv(text, r, digits);
        } else {
            try (JsonGenerator g = JSON.createGenerator(text)) {
                writeJson(g, r, digits);
            }
            text.write('\n');
        }
        List<String> warnings = new ArrayList<>();
        for (StatisticsWarning w : r.warnings()) {
            warnings.add("warning: " + m + ": " + w.code() + ": " + w.message());
        }
        return new Chunk(text.toString(), warnings);
    }

    /** A measurand as one JSON object: full-precision numbers and, under "printed", the numbers as printed. */
    private static void writeJson(JsonGenerator g, MeasurandEvaluation.Result r, int digits) throws IOException {
        g.writeStartObject();
        g.writeStringField("measurand", r.measurand());
        g.writeObjectField("unit", r.unit());
        g.writeObjectField("n", r.n());
        g.writeObjectField("censored", r.censored());
        g.writeObjectField("median", r.median());
        g.writeObjectField("madE", r.madE());
        g.writeObjectField("nIqr", r.nIqr());
        g.writeObjectField("robustMean", r.robustMean());
        g.writeObjectField("robustSd", r.robustSd());
        g.writeObjectField("iterations", r.iterations());
        g.writeObjectField("converged", r.converged());
        g.writeObjectField("assignedValue", r.assignedValue());
        g.writeObjectField("assignedValueUncertainty", r.assignedValueUncertainty());
        g.writeObjectField("sigmaPt", r.sigmaPt());
        g.writeObjectField("sigmaPtSource", r.sigmaPtSource() == null ? null
                : r.sigmaPtSource() == MeasurandEvaluation.SigmaPtSource.GIVEN ? "given" : "robustSd");
        g.writeObjectField("scoreUsed", r.scoreUsed() == null ? null : r.scoreUsed().jsonName());
        g.writeObjectField("scoreUsedReason", r.scoreUsedReason());
        g.writeNumberField("reportingDigits", digits);
        g.writeObjectField("scoreDecimals", r.scoreDecimals());
        g.writeObjectField("coverageFactor", NumberFormats.full(r.coverageFactor()));
        g.writeBooleanField("informationOnly", r.informationOnly());
        g.writeObjectFieldStart("printed");
        g.writeObjectField("median", NumberFormats.plainStatistic(r.median(), digits));
        g.writeObjectField("madE", NumberFormats.plainStatistic(r.madE(), digits));
        g.writeObjectField("nIqr", NumberFormats.plainStatistic(r.nIqr(), digits));
        g.writeObjectField("robustMean", NumberFormats.plainStatistic(r.robustMean(), digits));
        g.writeObjectField("robustSd", NumberFormats.plainStatistic(r.robustSd(), digits));
        g.writeObjectField("assignedValue", NumberFormats.plainStatistic(r.assignedValue(), digits));
        g.writeObjectField("assignedValueUncertainty", NumberFormats.plainStatistic(r.assignedValueUncertainty(),
                digits));
        g.writeObjectField("sigmaPt", NumberFormats.plainStatistic(r.sigmaPt(), digits));
        g.writeEndObject();
        g.writeArrayFieldStart("warnings");
        for (StatisticsWarning w : r.warnings()) {
            g.writeStartObject();
            g.writeStringField("code", w.code());
            g.writeStringField("message", w.message());
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeArrayFieldStart("scores");
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            g.writeStartObject();
            g.writeStringField("participant", s.participant());
            g.writeStringField("reported", s.reported());
            g.writeObjectField("value", s.value());
            g.writeObjectField("z", s.z());
            g.writeObjectField("zPrime", s.zPrime());
            g.writeObjectField("zeta", s.zeta());
            g.writeObjectField("en", s.en());
            g.writeObjectField("classification", s.classification());
            g.writeBooleanField("informationOnly", r.informationOnly() && s.value() != null
                    && (s.z() != null || s.zPrime() != null || s.zeta() != null || s.en() != null));
            g.writeObjectFieldStart("printed");
            g.writeObjectField("value", NumberFormats.plainResult(s.value(), digits));
            g.writeObjectField("z", NumberFormats.plainScore(s.z(), r.scoreDecimals()));
            g.writeObjectField("zPrime", NumberFormats.plainScore(s.zPrime(), r.scoreDecimals()));
            g.writeObjectField("zeta", NumberFormats.plainScore(s.zeta(), r.scoreDecimals()));
            g.writeObjectField("en", NumberFormats.plainScore(s.en(), r.scoreDecimals()));
            g.writeEndObject();
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeEndObject();
    }

}
