package org.roundtable.evaluation.offline;

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
 * result); measurands are evaluated a few at a time (two per core, each one's output built as UTF-8 bytes by
 * {@code OutputText}), written in
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
                    chunk.text().printTo(out);
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






    private static void writeCsv(OutputText out, MeasurandEvaluation.Result r, int digits) {
        String used = r.scoreUsed() == null ? "" : r.scoreUsed().jsonName();
        int scoreDecimals = r.scoreDecimals();
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            boolean informationOnly = r.informationOnly() && s.value() != null
                    && (s.z() != null || s.zPrime() != null || s.zeta() != null || s.en() != null);
            // participant codes, units and reported texts come from the file: written as text cells; the
            // numbers are ours and keep their minus sign
            out.cell(r.measurand()).raw(',').cell(r.unit()).raw(',').cell(s.participant()).raw(',')
                    .cell(s.reported()).raw(',')
                    .plain(s.value(), digits).raw(',')
                    .plain(r.assignedValue(), digits + 1).raw(',')
                    .plain(r.sigmaPt(), digits + 1).raw(',')
                    .text(used).raw(',')
                    .plain(s.z(), scoreDecimals).raw(',')
                    .plain(s.zPrime(), scoreDecimals).raw(',')
                    .plain(s.zeta(), scoreDecimals).raw(',')
                    .plain(s.en(), scoreDecimals).raw(',')
                    .text(s.classification() == null ? "" : s.classification()).raw(',')
                    .text(informationOnly ? "true" : "false").raw('\n');
        }
    }

    /** One measurand's output text (a JSON line or CSV rows) and its warning lines for stderr. */
    private record Chunk(OutputText text, List<String> warnings) {
    }

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
        OutputText text = new OutputText(1024 + (csv ? 120 : 300) * r.scores().size());
        if (csv) {
            writeCsv(text, r, digits);
        } else {
            writeJson(text, r, digits);
            text.raw('\n');
        }
        List<String> warnings = new ArrayList<>();
        for (StatisticsWarning w : r.warnings()) {
            warnings.add("warning: " + m + ": " + w.code() + ": " + w.message());
        }
        return new Chunk(text, warnings);
    }

    private static byte[] ascii(String text) {
        return text.getBytes(java.nio.charset.StandardCharsets.US_ASCII);
    }

    private static final byte[] MEASURAND = ascii("{\"measurand\":");
    private static final byte[] UNIT = ascii(",\"unit\":");
    private static final byte[] N = ascii(",\"n\":");
    private static final byte[] CENSORED = ascii(",\"censored\":");
    private static final byte[] MEDIAN = ascii(",\"median\":");
    private static final byte[] MAD_E = ascii(",\"madE\":");
    private static final byte[] N_IQR = ascii(",\"nIqr\":");
    private static final byte[] ROBUST_MEAN = ascii(",\"robustMean\":");
    private static final byte[] ROBUST_SD = ascii(",\"robustSd\":");
    private static final byte[] ITERATIONS = ascii(",\"iterations\":");
    private static final byte[] CONVERGED = ascii(",\"converged\":");
    private static final byte[] ASSIGNED_VALUE = ascii(",\"assignedValue\":");
    private static final byte[] ASSIGNED_VALUE_UNCERTAINTY = ascii(",\"assignedValueUncertainty\":");
    private static final byte[] SIGMA_PT = ascii(",\"sigmaPt\":");
    private static final byte[] SIGMA_PT_SOURCE = ascii(",\"sigmaPtSource\":");
    private static final byte[] SCORE_USED = ascii(",\"scoreUsed\":");
    private static final byte[] SCORE_USED_REASON = ascii(",\"scoreUsedReason\":");
    private static final byte[] REPORTING_DIGITS = ascii(",\"reportingDigits\":");
    private static final byte[] SCORE_DECIMALS = ascii(",\"scoreDecimals\":");
    private static final byte[] COVERAGE_FACTOR = ascii(",\"coverageFactor\":");
    private static final byte[] INFORMATION_ONLY = ascii(",\"informationOnly\":");
    private static final byte[] PRINTED_MEDIAN = ascii(",\"printed\":{\"median\":");
    private static final byte[] WARNINGS = ascii("},\"warnings\":[");
    private static final byte[] CODE = ascii("{\"code\":");
    private static final byte[] MESSAGE = ascii(",\"message\":");
    private static final byte[] SCORES = ascii("],\"scores\":[");
    private static final byte[] PARTICIPANT = ascii("{\"participant\":");
    private static final byte[] REPORTED = ascii(",\"reported\":");
    private static final byte[] VALUE = ascii(",\"value\":");
    private static final byte[] Z = ascii(",\"z\":");
    private static final byte[] Z_PRIME = ascii(",\"zPrime\":");
    private static final byte[] ZETA = ascii(",\"zeta\":");
    private static final byte[] EN = ascii(",\"en\":");
    private static final byte[] CLASSIFICATION = ascii(",\"classification\":");
    private static final byte[] PRINTED_VALUE = ascii(",\"printed\":{\"value\":");
    private static final byte[] END_SCORE = ascii("}}");
    private static final byte[] END_MEASURAND = ascii("]}");

    /**
     * A measurand as one JSON object, as Jackson's compact generator wrote it before: full-precision numbers and,
     * under "printed", the numbers as printed.
     */
    private static void writeJson(OutputText g, MeasurandEvaluation.Result r, int digits) {
        int statistic = digits + 1;
        g.raw(MEASURAND).string(r.measurand());
        g.raw(UNIT).string(r.unit());
        g.raw(N).number(r.n());
        g.raw(CENSORED).number(r.censored());
        g.raw(MEDIAN).number(r.median());
        g.raw(MAD_E).number(r.madE());
        g.raw(N_IQR).number(r.nIqr());
        g.raw(ROBUST_MEAN).number(r.robustMean());
        g.raw(ROBUST_SD).number(r.robustSd());
        g.raw(ITERATIONS).number(r.iterations());
        g.raw(CONVERGED).bool(r.converged());
        g.raw(ASSIGNED_VALUE).number(r.assignedValue());
        g.raw(ASSIGNED_VALUE_UNCERTAINTY).number(r.assignedValueUncertainty());
        g.raw(SIGMA_PT).number(r.sigmaPt());
        g.raw(SIGMA_PT_SOURCE).string(r.sigmaPtSource() == null ? null
                : r.sigmaPtSource() == MeasurandEvaluation.SigmaPtSource.GIVEN ? "given" : "robustSd");
        g.raw(SCORE_USED).string(r.scoreUsed() == null ? null : r.scoreUsed().jsonName());
        g.raw(SCORE_USED_REASON).string(r.scoreUsedReason());
        g.raw(REPORTING_DIGITS).number(digits);
        g.raw(SCORE_DECIMALS).number(r.scoreDecimals());
        g.raw(COVERAGE_FACTOR).string(NumberFormats.full(r.coverageFactor()));
        g.raw(INFORMATION_ONLY).bool(r.informationOnly());
        g.raw(PRINTED_MEDIAN).plainString(r.median(), statistic);
        g.raw(MAD_E).plainString(r.madE(), statistic);
        g.raw(N_IQR).plainString(r.nIqr(), statistic);
        g.raw(ROBUST_MEAN).plainString(r.robustMean(), statistic);
        g.raw(ROBUST_SD).plainString(r.robustSd(), statistic);
        g.raw(ASSIGNED_VALUE).plainString(r.assignedValue(), statistic);
        g.raw(ASSIGNED_VALUE_UNCERTAINTY).plainString(r.assignedValueUncertainty(), statistic);
        g.raw(SIGMA_PT).plainString(r.sigmaPt(), statistic);
        g.raw(WARNINGS);
        boolean first = true;
        for (StatisticsWarning w : r.warnings()) {
            if (!first) {
                g.raw(',');
            }
            first = false;
            g.raw(CODE).string(w.code()).raw(MESSAGE).string(w.message()).raw('}');
        }
        g.raw(SCORES);
        int scoreDecimals = r.scoreDecimals();
        first = true;
        for (MeasurandEvaluation.ParticipantScore s : r.scores()) {
            if (!first) {
                g.raw(',');
            }
            first = false;
            g.raw(PARTICIPANT).string(s.participant());
            g.raw(REPORTED).string(s.reported());
            g.raw(VALUE).number(s.value());
            g.raw(Z).number(s.z());
            g.raw(Z_PRIME).number(s.zPrime());
            g.raw(ZETA).number(s.zeta());
            g.raw(EN).number(s.en());
            g.raw(CLASSIFICATION).string(s.classification());
            g.raw(INFORMATION_ONLY).bool(r.informationOnly() && s.value() != null
                    && (s.z() != null || s.zPrime() != null || s.zeta() != null || s.en() != null));
            g.raw(PRINTED_VALUE).plainString(s.value(), digits);
            g.raw(Z).plainString(s.z(), scoreDecimals);
            g.raw(Z_PRIME).plainString(s.zPrime(), scoreDecimals);
            g.raw(ZETA).plainString(s.zeta(), scoreDecimals);
            g.raw(EN).plainString(s.en(), scoreDecimals);
            g.raw(END_SCORE);
        }
        g.raw(END_MEASURAND);
    }

}
