package org.roundtable.evaluation.offline;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.PrintStream;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.math.BigDecimal;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.roundtable.statistics.MeasurandEvaluation;
import org.roundtable.submission.intake.IntakeProblem;
import org.roundtable.submission.intake.ResultCheck;

/**
 * One measurand's results of an {@code evaluate} input file, held as primitive columns (about 45 bytes a result),
 * and the streaming reader that fills them.
 *
 * <p>The file is read record by record (never as one string); participant codes and method names are kept once;
 * a reported text is kept only when the number and its count of decimals do not give it back. So a 1,000,000-row
 * file takes some 40 MB, and {@link #results} builds the {@code ParticipantResult}s of one measurand only when it is
 * evaluated.
 */
final class ResultColumns {

    /** Rows between two progress lines on stderr. */
    static final int PROGRESS_EVERY = 250_000;

    private int size;
    private int[] participant = new int[16];
    private double[] value = new double[16];
    private double[] expandedUncertainty = new double[16];
    private double[] coverageFactor = new double[16];
    private int[] method = new int[16];
    private byte[] decimals = new byte[16];
    private long[] unscaled = new long[16];
    private boolean[] lessThan = new boolean[16];
    private final Map<Integer, String> oddReported = new HashMap<>();
    /** While reading: the first row of each participant's result, for the duplicate check; dropped after. */
    private FirstRows firstRows = new FirstRows();
    private final List<String> methods;

    private ResultColumns(List<String> methods) {
        this.methods = methods;
    }

    /**
     * A read file: its measurands in order of first appearance, their units, the participant codes and the number
     * of results.
     */
    record File(LinkedHashMap<String, ResultColumns> measurands, Map<String, String> units, List<String> participants,
            long rows) {
    }

    /** The measurand's results, in file order. */
    List<MeasurandEvaluation.ParticipantResult> results(List<String> participants) {
        List<MeasurandEvaluation.ParticipantResult> out = new ArrayList<>(size);
        for (int i = 0; i < size; i++) {
            String reported = oddReported.get(i);
            if (reported == null) {
                String number = plain(unscaled[i], decimals[i]);
                reported = lessThan[i] ? "<" + number : number;
            }
            out.add(new MeasurandEvaluation.ParticipantResult(participants.get(participant[i]), reported, value[i],
                    lessThan[i], Double.isNaN(expandedUncertainty[i]) ? null : expandedUncertainty[i],
                    Double.isNaN(coverageFactor[i]) ? null : coverageFactor[i],
                    method[i] < 0 ? null : methods.get(method[i])));
        }
        return out;
    }

    private void add(int participantIndex, String reported, String numberText, double v, boolean below, Double u,
            Double k, int methodIndex, boolean plainDecimal, long digits, boolean canonical) {
        if (size == value.length) {
            int grown = size + (size >> 1) + 16;
            participant = Arrays.copyOf(participant, grown);
            value = Arrays.copyOf(value, grown);
            expandedUncertainty = Arrays.copyOf(expandedUncertainty, grown);
            coverageFactor = Arrays.copyOf(coverageFactor, grown);
            method = Arrays.copyOf(method, grown);
            decimals = Arrays.copyOf(decimals, grown);
            unscaled = Arrays.copyOf(unscaled, grown);
            lessThan = Arrays.copyOf(lessThan, grown);
        }
        participant[size] = participantIndex;
        value[size] = v;
        lessThan[size] = below;
        expandedUncertainty[size] = u == null ? Double.NaN : u;
        coverageFactor[size] = k == null ? Double.NaN : k;
        method[size] = methodIndex;
        int dot = numberText.indexOf('.');
        int places = dot < 0 ? 0 : numberText.length() - dot - 1;
        boolean rebuilt = false;
        // a plain decimal of at most 18 digits is kept as its digits and decimal places, and given back exactly
        // when it has no needless leading zeros and nothing stands between '<' and the number
        if (plainDecimal) {
            if (numberText.length() == 19 && dot < 0) {
                digits = Long.parseLong(numberText); // 19 digits, more than the scan keeps
            }
            rebuilt = canonical && reported.length() == numberText.length() + (below ? 1 : 0);
            unscaled[size] = digits;
        }
        decimals[size] = (byte) places;
        if (!rebuilt) {
            oddReported.put(size, reported);
        }
        size++;
    }

    /** {@code digits} with {@code places} decimal places as plain text: (1500, 3) is 1.500, (5, 2) is 0.05. */
    static String plain(long digits, int places) {
        String text = Long.toString(digits);
        if (places == 0) {
            return text;
        }
        if (text.length() <= places) {
            text = "0".repeat(places - text.length() + 1) + text;
        }
        return text.substring(0, text.length() - places) + "." + text.substring(text.length() - places);
    }

    /**
     * Reads an {@code evaluate} input file (see {@link EvaluateCommand}) record by record. Each row's value, U and k
     * go through the server's own validation ({@link ResultCheck}): a row the upload refuses is refused here with the
     * same words.
     *
     * @param negativeAllowed measurands whose negative values are results (the plan's choice); others refuse them
     * @param progress        receives a line every {@value #PROGRESS_EVERY} rows
     */
    static File read(Path file, java.util.Set<String> negativeAllowed, PrintStream progress)
            throws EvaluateCommand.BadInput {
        LinkedHashMap<String, ResultColumns> byMeasurand = new LinkedHashMap<>();
        Map<String, String> units = new HashMap<>();
        Map<String, Integer> unitRow = new HashMap<>();
        Map<String, Integer> participantIndex = new HashMap<>();
        List<String> participants = new ArrayList<>();
        Map<String, Integer> methodIndex = new HashMap<>();
        List<String> methods = new ArrayList<>();
        Map<String, String> measurandNames = new HashMap<>();
        long rows = 0;
        try (BufferedReader reader = new BufferedReader(new InputStreamReader(Files.newInputStream(file),
                StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                        .onUnmappableCharacter(CodingErrorAction.REPORT)), 1 << 16)) {
            // a byte order mark is skipped; the delimiter as the server's upload detects it: ';' when the header
            // has ';' and no ',' — then a decimal comma is accepted in the number columns
            reader.mark(1 << 16);
            int first = reader.read();
            if (first != '\uFEFF') {
                reader.reset();
            }
            reader.mark(1 << 16);
            String headerLine = "";
            for (String line = reader.readLine(); line != null; line = reader.readLine()) {
                if (!line.isBlank()) {
                    headerLine = line;
                    break;
                }
            }
            reader.reset();
            boolean semicolon = headerLine.indexOf(';') >= 0 && headerLine.indexOf(',') < 0;
            CSVFormat format = CSVFormat.RFC4180.builder().setIgnoreSurroundingSpaces(false)
                    .setDelimiter(semicolon ? ';' : ',').get();
            ResultCheck check = new ResultCheck(semicolon);
            try (Reader body = reader; CSVParser parser = CSVParser.parse(body, format);
                    RecordFeed feed = new RecordFeed(parser)) {
                Map<String, Integer> index = null;
                int participantAt = 0;
                int measurandAt = 0;
                int unitAt = 0;
                int valueAt = 0;
                int uAt = 0;
                int kAt = 0;
                int methodAt = 0;
                NumberText number = new NumberText();
                // the rows of one measurand usually follow each other, and U and k repeat: what the row before
                // found out is kept (the same checks, the same answers)
                String lastMeasurandField = null;
                String lastMeasurand = null;
                ResultColumns lastColumns = null;
                String lastUnit = null;
                String lastMethod = null;
                int lastMethodIndex = -1;
                for (CSVRecord record = feed.next(); record != null; record = feed.next()) {
                    long row = record.getRecordNumber();
                    if (index == null) {
                        index = header(record);
                        participantAt = index.get("participant");
                        measurandAt = index.get("measurand");
                        unitAt = index.get("unit");
                        valueAt = index.get("value");
                        uAt = index.get("expanded_uncertainty");
                        kAt = index.get("coverage_factor");
                        methodAt = index.get("method");
                        continue;
                    }
                    if (record.size() == 1 && record.get(0).isBlank()) {
                        continue; // blank line
                    }
                    if (record.size() != EvaluateCommand.COLUMNS.size()) {
                        throw new EvaluateCommand.BadInput("row " + row + ": has " + record.size()
                                + " fields, the header has " + EvaluateCommand.COLUMNS.size());
                    }
                    String participant = record.get(participantAt).trim();
                    String measurandField = record.get(measurandAt).trim();
                    String measurand;
                    boolean sameMeasurand = measurandField.equals(lastMeasurandField);
                    if (sameMeasurand) {
                        measurand = lastMeasurand;
                    } else {
                        measurand = measurandNames.computeIfAbsent(measurandField, EvaluateCommand::measurandName);
                    }
                    String unit = record.get(unitAt).trim();
                    String valueCell = record.get(valueAt).trim();
                    String uCell = record.get(uAt).trim();
                    String kCell = record.get(kAt).trim();
                    String method = record.get(methodAt).trim();
                    requireNonEmpty(row, "participant", participant);
                    requireNonEmpty(row, "measurand", measurand);
                    requireNonEmpty(row, "unit", unit);
                    // the server's validation of the numbers (submission.intake): refused alike, in the same words
                    ResultCheck.Outcome checked = check.check((int) row, measurand,
                            negativeAllowed.contains(measurand), unit, valueCell, uCell, kCell);
                    if (!checked.problems().isEmpty()) {
                        throw new EvaluateCommand.BadInput(message(checked.problems().get(0)));
                    }
                    ResultCheck.Numbers numbers = checked.numbers();
                    String reported = decimalPoint(valueCell, semicolon);
                    boolean below = numbers.lessThan();
                    String numberText = below ? reported.substring(1).trim() : reported;
                    double v = finite(row, "value", valueCell, numbers.value());
                    // the shape of the number as written, for printing it back as it was reported
                    number.scan(numberText);
                    boolean plainValue = number.plain;
                    long unscaledValue = number.unscaled;
                    boolean canonicalValue = number.canonical;
                    Double u = numbers.expandedUncertainty() == null ? null
                            : finite(row, "expanded_uncertainty", uCell, numbers.expandedUncertainty());
                    Double k = numbers.coverageFactor() == null ? null : numbers.coverageFactor().doubleValue();
                    if (k != null && u == null) {
                        throw new EvaluateCommand.BadInput("row " + row
                                + ", column coverage_factor: given without an expanded_uncertainty");
                    }
                    if (!sameMeasurand || !unit.equals(lastUnit)) {
                        String previousUnit = units.putIfAbsent(measurand, unit);
                        if (previousUnit == null) {
                            unitRow.put(measurand, (int) row);
                        } else if (!previousUnit.equals(unit)) {
                            throw new EvaluateCommand.BadInput("row " + row + ", column unit: '" + unit
                                    + "' differs from '" + previousUnit + "' (row " + unitRow.get(measurand)
                                    + ") for measurand '" + measurand + "'; one unit per measurand");
                        }
                    }
                    Integer known = participantIndex.get(participant);
                    int p;
                    if (known == null) {
                        p = participants.size();
                        participants.add(participant);
                        participantIndex.put(participant, p);
                    } else {
                        p = known;
                    }
                    ResultColumns columns;
                    if (sameMeasurand) {
                        columns = lastColumns;
                    } else {
                        columns = byMeasurand.computeIfAbsent(measurand, name -> new ResultColumns(methods));
                    }
                    int earlier = columns.firstRows.putIfAbsent(p, (int) row);
                    if (earlier >= 0) {
                        throw new EvaluateCommand.BadInput("row " + row + ", column participant: duplicate result of '"
                                + participant + "' for measurand '" + measurand + "' (first in row " + earlier + ")");
                    }
                    int methodIndexOf;
                    if (method.isEmpty()) {
                        methodIndexOf = -1;
                    } else if (method.equals(lastMethod)) {
                        methodIndexOf = lastMethodIndex;
                    } else {
                        methodIndexOf = methodIndex.computeIfAbsent(method, name -> {
                            methods.add(name);
                            return methods.size() - 1;
                        });
                        lastMethod = method;
                        lastMethodIndex = methodIndexOf;
                    }
                    columns.add(p, reported, numberText, v, below, u, k, methodIndexOf, plainValue, unscaledValue,
                            canonicalValue);
                    lastMeasurandField = measurandField;
                    lastMeasurand = measurand;
                    lastColumns = columns;
                    lastUnit = unit;
                    rows++;
                    if (rows % PROGRESS_EVERY == 0) {
                        progress.println("progress: " + rows + " rows read");
                    }
                }
                if (index == null) {
                    throw new EvaluateCommand.BadInput("row 1: the file is empty; expected the header "
                            + String.join(",", EvaluateCommand.COLUMNS));
                }
                if (byMeasurand.isEmpty()) {
                    throw new EvaluateCommand.BadInput("the file has a header and no results");
                }
                for (ResultColumns columns : byMeasurand.values()) {
                    columns.firstRows = null;
                }
            }
        } catch (UncheckedIOException e) {
            throw unreadable(file, e.getCause());
        } catch (IllegalStateException e) {
            throw new EvaluateCommand.BadInput(file + ": not valid CSV (" + e.getMessage() + ")");
        } catch (IOException e) {
            throw unreadable(file, e);
        }
        return new File(byMeasurand, units, participants, rows);
    }

    private static EvaluateCommand.BadInput unreadable(Path file, IOException e) {
        if (e instanceof CharacterCodingException) {
            return new EvaluateCommand.BadInput(file + ": not valid UTF-8");
        }
        if (e instanceof java.nio.file.NoSuchFileException || e instanceof java.nio.file.AccessDeniedException) {
            return new EvaluateCommand.BadInput(file + ": cannot read file (" + e.getClass().getSimpleName() + ": "
                    + e.getMessage() + ")");
        }
        return new EvaluateCommand.BadInput(file + ": not valid CSV (" + e.getMessage() + ")");
    }

    /** In a semicolon-separated file a decimal comma is a decimal point (as in the server's upload). */
    private static String decimalPoint(String text, boolean semicolon) {
        return semicolon && text.indexOf(',') >= 0 && text.indexOf('.') < 0 ? text.replace(',', '.') : text;
    }

    private static Map<String, Integer> header(CSVRecord record) throws EvaluateCommand.BadInput {
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < record.size(); i++) {
            String name = record.get(i).trim();
            if (!EvaluateCommand.COLUMNS.contains(name)) {
                throw new EvaluateCommand.BadInput("row 1, column " + (i + 1) + ": unknown column '" + name
                        + "'; expected " + String.join(",", EvaluateCommand.COLUMNS));
            }
            if (index.put(name, i) != null) {
                throw new EvaluateCommand.BadInput("row 1, column " + (i + 1) + ": column '" + name
                        + "' appears twice");
            }
        }
        for (String c : EvaluateCommand.COLUMNS) {
            if (!index.containsKey(c)) {
                throw new EvaluateCommand.BadInput("row 1: missing column '" + c + "'; expected "
                        + String.join(",", EvaluateCommand.COLUMNS));
            }
        }
        return index;
    }

    private static void requireNonEmpty(long row, String column, String text) throws EvaluateCommand.BadInput {
        if (text.isEmpty()) {
            throw new EvaluateCommand.BadInput("row " + row + ", column " + column + ": must not be empty");
        }
    }

    /** A problem of the server's validation as a line: row, column, the text as written and the server's message. */
    static String message(IntakeProblem p) {
        return "row " + p.row() + (p.column() == null ? "" : ", column " + p.column()) + ": "
                + (p.value() == null ? "" : "'" + p.value() + "': ") + p.message();
    }

    private static double finite(long row, String column, String text, BigDecimal number)
            throws EvaluateCommand.BadInput {
        double v = number.doubleValue();
        if (!Double.isFinite(v)) {
            throw new EvaluateCommand.BadInput("row " + row + ", column " + column + ": '" + text
                    + "' is out of range");
        }
        return v;
    }

    /**
     * A number's text as the grammar {@code [+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?} reads it, without a regular
     * expression: whether it matches, and for a plain decimal ({@code \d+(\.\d+)?}) its digits.
     */
    static final class NumberText {
        /** A plain decimal {@code \d+(\.\d+)?} of at most 19 characters: {@link #unscaled} holds its digits. */
        boolean plain;
        /** A plain decimal without needless leading zeros, so that its digits and places give it back. */
        boolean canonical;
        long unscaled;

        boolean scan(String text) {
            int n = text.length();
            int i = 0;
            plain = false;
            canonical = false;
            boolean exponent = false;
            unscaled = 0;
            boolean signed = i < n && (text.charAt(i) == '+' || text.charAt(i) == '-');
            if (signed) {
                i++;
            }
            int intStart = i;
            long digits = 0;
            int count = 0;
            while (i < n && isDigit(text.charAt(i))) {
                digits = count < 18 ? digits * 10 + (text.charAt(i) - '0') : digits;
                count++;
                i++;
            }
            int intDigits = i - intStart;
            int fraction = 0;
            boolean dot = i < n && text.charAt(i) == '.';
            if (dot) {
                i++;
                while (i < n && isDigit(text.charAt(i))) {
                    digits = count < 18 ? digits * 10 + (text.charAt(i) - '0') : digits;
                    count++;
                    fraction++;
                    i++;
                }
            }
            if (intDigits == 0 && fraction == 0) {
                return false;
            }
            if (i < n && (text.charAt(i) == 'e' || text.charAt(i) == 'E')) {
                i++;
                if (i < n && (text.charAt(i) == '+' || text.charAt(i) == '-')) {
                    i++;
                }
                int expStart = i;
                while (i < n && isDigit(text.charAt(i))) {
                    i++;
                }
                if (i == expStart) {
                    return false;
                }
                exponent = true;
            }
            if (i != n) {
                return false;
            }
            if (!signed && !exponent && intDigits > 0 && (!dot || fraction > 0) && n <= 19) {
                plain = true;
                unscaled = digits;
                canonical = intDigits == 1 || text.charAt(0) != '0';
            }
            return true;
        }

        private static boolean isDigit(char c) {
            return c >= '0' && c <= '9';
        }
    }

    /**
     * The records of the parser, read and decoded on a thread of their own a batch ahead of the checks, in order;
     * an exception of the parser is thrown by {@link #next} where the record would have come.
     */
    private static final class RecordFeed implements AutoCloseable {
        private static final int BATCH = 1024;
        private static final Object END = new Object();
        private final java.util.concurrent.BlockingQueue<Object> queue =
                new java.util.concurrent.ArrayBlockingQueue<>(16);
        private final Thread thread;
        private volatile boolean stopped;
        private CSVRecord[] batch = new CSVRecord[0];
        private int at;

        RecordFeed(CSVParser parser) {
            thread = new Thread(() -> {
                try {
                    CSVRecord[] records = new CSVRecord[BATCH];
                    int n = 0;
                    for (CSVRecord record : parser) {
                        records[n++] = record;
                        if (n == BATCH) {
                            queue.put(records);
                            records = new CSVRecord[BATCH];
                            n = 0;
                            if (stopped) {
                                return;
                            }
                        }
                    }
                    if (n > 0) {
                        queue.put(Arrays.copyOf(records, n));
                    }
                    queue.put(END);
                } catch (InterruptedException e) {
                    // stopped
                } catch (RuntimeException | Error e) {
                    if (!stopped) {
                        try {
                            queue.put(e);
                        } catch (InterruptedException stop) {
                            // stopped
                        }
                    }
                }
            }, "evaluate-read");
            thread.setDaemon(true);
            thread.start();
        }

        /** The next record, or null after the last. */
        CSVRecord next() {
            if (at < batch.length) {
                return batch[at++];
            }
            Object item;
            try {
                item = queue.take();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new UncheckedIOException(new java.io.InterruptedIOException("interrupted"));
            }
            if (item == END) {
                queue.add(END);
                return null;
            }
            if (item instanceof RuntimeException e) {
                throw e;
            }
            if (item instanceof Error e) {
                throw e;
            }
            batch = (CSVRecord[]) item;
            at = 0;
            return next();
        }

        /** Stops the reading thread (after bad input) and waits for it, before the file is closed. */
        @Override
        public void close() {
            stopped = true;
            thread.interrupt();
            try {
                thread.join();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /**
     * The first row of each participant's result of this measurand while the file is read: an open-addressing
     * table of primitive keys (8 bytes a result at most), so that a million results need no million boxed keys.
     */
    private static final class FirstRows {
        private int[] keys = new int[16];
        private int[] rows = new int[16];
        private int size;

        FirstRows() {
            Arrays.fill(rows, -1);
        }

        /** Stores {@code row} for {@code key} unless present; returns the earlier row, or −1. */
        int putIfAbsent(int key, int row) {
            if (2 * (size + 1) > keys.length) {
                grow();
            }
            int mask = keys.length - 1;
            for (int i = slot(key, mask); ; i = (i + 1) & mask) {
                if (rows[i] < 0) {
                    keys[i] = key;
                    rows[i] = row;
                    size++;
                    return -1;
                }
                if (keys[i] == key) {
                    return rows[i];
                }
            }
        }

        private static int slot(int key, int mask) {
            int h = key * 0x9E3779B9;
            return (h ^ (h >>> 16)) & mask;
        }

        private void grow() {
            int[] oldKeys = keys;
            int[] oldRows = rows;
            keys = new int[oldKeys.length * 2];
            rows = new int[oldRows.length * 2];
            Arrays.fill(rows, -1);
            int mask = keys.length - 1;
            for (int j = 0; j < oldKeys.length; j++) {
                if (oldRows[j] >= 0) {
                    int i = slot(oldKeys[j], mask);
                    while (rows[i] >= 0) {
                        i = (i + 1) & mask;
                    }
                    keys[i] = oldKeys[j];
                    rows[i] = oldRows[j];
                }
            }
        }
    }
}
