package org.roundtable.evaluation;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyManager;
import org.postgresql.copy.CopyOut;
import org.postgresql.copy.PGCopyOutputStream;
import org.roundtable.scheme.EvaluationPlan;

import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.math.BigDecimal;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.DigestOutputStream;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.sql.Array;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Types;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;

/**
 * The I/O of an evaluation run on a plain JDBC connection, in the caller's transaction: what the server's
 * {@link EvaluationService} and the evaluation benchmark both run.
 *
 * <p>One pass, bounded memory whatever the round's size:
 * <ol>
 *   <li>the current results are streamed out with {@code COPY (SELECT …) TO STDOUT} in the order the run evaluates
 *       them (plan order of the measurands, then item), and one measurand of one item at a time is handed to the
 *       per-measurand step ({@link Step}); never more than one measurand's results are held;</li>
 *   <li>each measurand's scores go straight to a spill in binary {@code COPY} format (doubles as their 8 bytes,
 *       exact), the inputs text of its results to another (the inputs hash is defined on the results in element,
 *       item, participant code order, which is not the plan's order), and its outcome JSON straight into the outputs
 *       digest (the same bytes as the canonical JSON of the whole outcome list);</li>
 *   <li>at the end the run row is inserted with both hashes (under the id drawn from its sequence at the start, which
 *       the spilled score rows carry), the scores are copied in with {@code COPY participant_score FROM STDIN
 *       (FORMAT binary)}, and the measurand rows (one per measurand and item) are inserted in one batch.</li>
 * </ol>
 * Spills stay in memory up to 4 MiB and go to a temporary file beyond; they are deleted when the run ends.
 * Nothing is written to the database before the hashes are known (the run row is append-only and its scores
 * reference it), so a failure anywhere leaves nothing behind once the caller's transaction rolls back.
 */
public final class RoundEvaluator {

    private static final ObjectMapper CANONICAL = new ObjectMapper();
    private static final int BUFFER = 1 << 16;

    private RoundEvaluator() {
    }

    /** A planned measurand that is evaluated (not withdrawn), with its unit. */
    public record Planned(EvaluationPlan.MeasurandPlan plan, String unit) {
    }

    /**
     * What the run evaluates.
     *
     * @param itemLabels    the round's item labels (every planned measurand is evaluated for each)
     * @param inputsTrailer text appended to the inputs text after the result lines ("" for none)
     */
    public record Context(long roundId, String roundState, String latePolicy, int planVersion, String planSha256,
                          List<Planned> measurands, Set<String> itemLabels, String inputsTrailer) {
        public Context {
            measurands = List.copyOf(measurands);
            itemLabels = Set.copyOf(itemLabels);
        }
    }

    /** Who asked and when, for the run row. */
    public record Header(boolean preview, String codeVersion, String createdBy, OffsetDateTime createdAt) {
    }

    /** The stored run without its outputs. */
    public record Result(long runId, int version, String inputsSha256, String outputsSha256, int measurands,
                         long scores) {
    }

    /** The evaluation of one measurand of one item from its results (in participant code order). */
    @FunctionalInterface
    public interface Step {
        EvaluationViews.MeasurandOutcome evaluate(EvaluationPlan.MeasurandPlan plan, String unit, String item,
                                                  List<EvaluationService.Row> results);
    }

    /** Progress in measurands (of one item) evaluated. */
    @FunctionalInterface
    public interface Progress {
        void report(int done, int total);
    }

    /**
     * Evaluates and stores the run as the round's next version. The caller holds the round row lock and
     * owns the transaction.
     */
    public static Result run(Connection connection, Context context, Header header, Step step, Progress progress)
            throws SQLException {
        try {
            Set<String> items = new TreeSet<>(context.itemLabels());
            // the run's id first: the score rows carry it, and they are spilled before the run row can be written
            long runId = nextRunId(connection);
            Evaluation evaluation = evaluate(connection, context, items, step, progress, runId);
            if (evaluation.unknownItem()) {
                // a result for an item the round does not list (the intake refuses them, so this does not happen):
                // the run evaluates every item found in the results, which needs them all before the first one
                evaluation.close();
                items.addAll(itemsInResults(connection, context.roundId()));
                evaluation = evaluate(connection, context, items, step, progress, runId);
            }
            try (Evaluation done = evaluation) {
                return store(connection, context, header, done, runId);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The query whose rows are the run's inputs, in the order the run evaluates them. */
    public static String resultsQuery(long roundId, List<String> planOrder) {
        StringBuilder elements = new StringBuilder("ARRAY[");
        for (int i = 0; i < planOrder.size(); i++) {
            elements.append(i == 0 ? "" : ",").append('\'').append(planOrder.get(i).replace("'", "''")).append('\'');
        }
        elements.append("]::text[]");
        return """
                SELECT s.laboratory_id, rp.participant_code, rr.element, rr.item_label, rr.value_as_reported,
                       rr.value_in_measurand_unit, rr.less_than, rr.expanded_uncertainty, rr.coverage_factor,
                       rr.method_group, sr.late
                  FROM submission s
                  JOIN submission_revision sr ON sr.submission_id = s.id AND sr.revision = s.current_revision
                  JOIN reported_result rr ON rr.revision_id = sr.id
                  JOIN round_participant rp ON rp.round_id = s.round_id AND rp.laboratory_id = s.laboratory_id
                 WHERE s.round_id = %d
                 ORDER BY array_position(%s, rr.element::text), rr.element, rr.item_label COLLATE "C",
                          rp.participant_code
                """.formatted(roundId, planOrder.isEmpty() ? "ARRAY[]::text[]" : elements);
    }

    // ---- pass over the results ---------------------------------------------------------------------------------

    /** The spilled outcome of the pass over the results. */
    private static final class Evaluation implements AutoCloseable {
        final Spill inputs;
        final Spill scores;
        final MessageDigest outputs = sha256();
        final List<EvaluationViews.MeasurandOutcome> measurands = new ArrayList<>();
        /** Inputs text segments by element and item, in the order they were read. */
        final Map<List<String>, long[]> segments = new LinkedHashMap<>();
        final Bytes line = new Bytes(256);
        long scoreRows;
        boolean unknownItem;

        Evaluation() throws IOException {
            inputs = new Spill("roundtable-inputs-");
            scores = new Spill("roundtable-scores-");
        }

        boolean unknownItem() {
            return unknownItem;
        }

        @Override
        public void close() throws IOException {
            try {
                inputs.close();
            } finally {
                scores.close();
            }
        }
    }

    private static Evaluation evaluate(Connection connection, Context context, Set<String> items, Step step,
                                       Progress progress, long runId) throws SQLException, IOException {
        List<String> planOrder = context.measurands().stream().map(p -> p.plan().element()).toList();
        int total = context.measurands().size() * items.size();
        progress.report(0, total);
        Evaluation evaluation = new Evaluation();
        CopyManager copy = connection.unwrap(PGConnection.class).getCopyAPI();
        CopyOut out = copy.copyOut("COPY (" + resultsQuery(context.roundId(), planOrder) + ") TO STDOUT");
        // three stages that overlap: reading (and the inputs spill), evaluating (this thread), writing (outputs)
        Prefetch groups = new Prefetch(new Reader(out), evaluation);
        Writer writer = new Writer(evaluation, runId);
        boolean ok = false;
        try {
            int done = 0;
            measurands:
            for (Planned planned : context.measurands()) {
                String element = planned.plan().element();
                for (String item : items) {
                    List<EvaluationService.Row> rows = groups.group(element, item);
                    if (rows == null) {
                        evaluation.unknownItem = true;
                        break measurands;
                    }
                    writer.put(step.evaluate(planned.plan(), planned.unit(), item, rows));
                    progress.report(++done, total);
                }
                if (groups.peekElement(element)) {
                    // results of this element for an item after the last of the run's items
                    evaluation.unknownItem = true;
                    break;
                }
            }
            if (evaluation.unknownItem) {
                groups.abort();
                writer.abort();
            } else {
                // results of measurands that are not evaluated (withdrawn or not planned) are inputs all the same:
                // the reader spills them as it goes
                groups.finish();
                writer.finish();
            }
            ok = true;
            return evaluation;
        } finally {
            if (!ok) {
                groups.abort();
                writer.abort();
                evaluation.close();
            }
        }
    }

    /** Reads the results on a thread of its own, a few groups ahead, and spills their inputs text. */
    private static final class Prefetch {
        private static final Object END = new Object();
        private final BlockingQueue<Object> queue = new ArrayBlockingQueue<>(2);
        private final Thread thread;
        private volatile boolean stop;
        private Object head;

        record Group(String element, String item, List<EvaluationService.Row> rows) {
        }

        Prefetch(Reader reader, Evaluation evaluation) {
            thread = new Thread(() -> {
                Object last = END;
                try {
                    List<EvaluationService.Row> rows;
                    while (!stop && (rows = reader.anyGroup()) != null) {
                        String element = rows.get(0).element();
                        String item = rows.get(0).itemLabel();
                        spillInputs(evaluation, element, item, rows, reader.lines());
                        queue.put(new Group(element, item, rows));
                    }
                } catch (Throwable e) {
                    last = e;
                }
                try {
                    reader.drain();
                } catch (Throwable e) {
                    last = last == END ? e : last;
                }
                try {
                    queue.put(last);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }, "evaluation-reader");
            thread.setDaemon(true);
            thread.start();
        }

        private Group peek() throws SQLException {
            if (head == null) {
                head = take();
            }
            if (head instanceof SQLException e) {
                throw e;
            }
            if (head instanceof Throwable t) {
                throw new IllegalStateException("reading the results failed", t);
            }
            return head == END ? null : (Group) head;
        }

        private Object take() {
            try {
                return queue.take();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted while reading the results", e);
            }
        }

        /**
         * The results of one element and item (empty when there are none), or null when the next results are of
         * this element but of an item that is not evaluated (items come in the run's item order).
         */
        List<EvaluationService.Row> group(String element, String item) throws SQLException {
            Group next = peek();
            if (next == null || !next.element().equals(element)) {
                return List.of();
            }
            if (!next.item().equals(item)) {
                return next.item().compareTo(item) < 0 ? null : List.of();
            }
            head = null;
            return next.rows();
        }

        boolean peekElement(String element) throws SQLException {
            Group next = peek();
            return next != null && next.element().equals(element);
        }

        /** Reads to the end (the reader spills the inputs of the groups nobody evaluates). */
        void finish() throws SQLException {
            while (peek() != null) {
                head = null;
            }
            join();
        }

        /** Stops parsing (the rest is read and dropped) and waits for the reader. */
        void abort() {
            stop = true;
            while (!(head == END || head instanceof Throwable)) {
                head = take();
            }
            join();
        }

        private void join() {
            try {
                thread.join();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /** Hashes and spills the outcomes on a thread of its own, in the order they were evaluated. */
    private static final class Writer {
        private static final Object END = new Object();
        private final BlockingQueue<Object> queue = new ArrayBlockingQueue<>(2);
        private final Thread thread;
        private volatile Throwable error;
        private boolean ended;

        Writer(Evaluation evaluation, long runId) {
            thread = new Thread(() -> {
                try (OutputStream digestStream = new DigestOutputStream(OutputStream.nullOutputStream(),
                        evaluation.outputs);
                     JsonGenerator json = CANONICAL.getFactory().createGenerator(digestStream, JsonEncoding.UTF8)) {
                    json.writeStartArray();
                    Object next;
                    while ((next = queue.take()) != END) {
                        if (error == null) {
                            try {
                                EvaluationViews.MeasurandOutcome outcome = (EvaluationViews.MeasurandOutcome) next;
                                CANONICAL.writeValue(json, outcome);
                                evaluation.scoreRows += spillScores(evaluation.scores, outcome, runId);
                                evaluation.measurands.add(withoutScores(outcome));
                            } catch (Throwable e) {
                                error = e;
                            }
                        }
                    }
                    if (error == null) {
                        json.writeEndArray();
                    }
                } catch (Throwable e) {
                    error = error == null ? e : error;
                }
            }, "evaluation-writer");
            thread.setDaemon(true);
            thread.start();
        }

        void put(EvaluationViews.MeasurandOutcome outcome) throws IOException {
            if (error != null) {
                throw new IOException("writing the outputs failed", error);
            }
            try {
                queue.put(outcome);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted while writing the outputs", e);
            }
        }

        /** Waits for the last outcome to be written; rethrows what went wrong. */
        void finish() throws IOException {
            abort();
            if (error != null) {
                throw new IOException("writing the outputs failed", error);
            }
        }

        void abort() {
            if (ended) {
                return;
            }
            ended = true;
            try {
                queue.put(END);
                thread.join();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }

    private static Set<String> itemsInResults(Connection connection, long roundId) throws SQLException {
        Set<String> found = new TreeSet<>();
        try (PreparedStatement s = connection.prepareStatement("""
                SELECT DISTINCT rr.item_label
                  FROM submission s
                  JOIN submission_revision sr ON sr.submission_id = s.id AND sr.revision = s.current_revision
                  JOIN reported_result rr ON rr.revision_id = sr.id
                 WHERE s.round_id = ?
                """)) {
            s.setLong(1, roundId);
            try (ResultSet rs = s.executeQuery()) {
                while (rs.next()) {
                    found.add(rs.getString(1));
                }
            }
        }
        return found;
    }

    private static EvaluationViews.MeasurandOutcome withoutScores(EvaluationViews.MeasurandOutcome o) {
        return new EvaluationViews.MeasurandOutcome(o.element(), o.itemLabel(), o.unit(), o.n(), o.censored(),
                o.excluded(), o.assignedValueMethod(), o.assignedValue(), o.assignedValueUncertainty(), o.sigmaPt(),
                o.sigmaPtMethod(), o.sigmaPtSource(), o.scoreUsed(), o.scoreUsedReason(), o.median(), o.madE(),
                o.nIqr(), o.robustMean(), o.robustSd(), o.iterations(), o.converged(), o.warnings(), o.methodGroups(),
                List.of(), o.rules());
    }

    /**
     * The inputs text of one group's results: the same lines the run has always hashed. A line of COPY text without
     * escapes is turned into its inputs line byte by byte (PostgreSQL writes numeric as the plain decimal string that
     * {@link BigDecimal#toPlainString} gives); a line with escapes goes through the decoded row.
     */
    private static void spillInputs(Evaluation evaluation, String element, String item,
                                    List<EvaluationService.Row> rows, List<byte[]> lines) throws IOException {
        if (rows.isEmpty()) {
            return;
        }
        long offset = evaluation.inputs.size();
        Bytes out = evaluation.line;
        for (int n = 0; n < rows.size(); n++) {
            byte[] line = lines.get(n);
            out.clear();
            if (!inputsLine(line, out)) {
                EvaluationService.Row r = rows.get(n);
                out.clear();
                out.text(r.laboratoryId() + "\t" + r.participantCode() + "\t" + r.element() + "\t" + r.itemLabel()
                        + "\t" + r.reported() + "\t" + r.value().toPlainString() + "\t" + r.lessThan() + "\t"
                        + (r.expandedUncertainty() == null ? "" : r.expandedUncertainty().toPlainString()) + "\t"
                        + (r.coverageFactor() == null ? "" : r.coverageFactor().toPlainString()) + "\t"
                        + r.methodGroup() + "\t" + r.late() + "\n");
            }
            evaluation.inputs.write(out.bytes, 0, out.length);
        }
        evaluation.segments.put(List.of(element, item), new long[]{offset, evaluation.inputs.size() - offset});
    }

    private static final byte[] TRUE = "true".getBytes(StandardCharsets.US_ASCII);
    private static final byte[] FALSE = "false".getBytes(StandardCharsets.US_ASCII);

    /** The inputs line of a COPY text line of {@link #resultsQuery}; false when the line has escapes. */
    static boolean inputsLine(byte[] line, Bytes out) {
        int end = line.length;
        if (end > 0 && line[end - 1] == '\n') {
            end--;
        }
        int field = 0;
        int start = 0;
        for (int i = 0; i <= end; i++) {
            if (i < end && line[i] == '\\') {
                if (i != start || !(i + 2 == end || line[i + 2] == '\t') || line[i + 1] != 'N'
                        || (field != 7 && field != 8)) {
                    return false;
                }
            }
            if (i == end || line[i] == '\t') {
                int length = i - start;
                switch (field) {
                    case 6, 10 -> out.raw(line[start] == 't' ? TRUE : FALSE);
                    case 7, 8 -> {
                        if (!(length == 2 && line[start] == '\\')) {
                            out.raw(line, start, length);
                        }
                    }
                    default -> out.raw(line, start, length);
                }
                out.raw(field == 10 ? (byte) '\n' : (byte) '\t');
                field++;
                start = i + 1;
            }
        }
        return field == 11;
    }

    /**
     * One measurand's score rows in PostgreSQL's binary COPY format: doubles go as their 8 bytes, exactly, with no
     * decimal conversion on either side.
     */
    private static int spillScores(Spill spill, EvaluationViews.MeasurandOutcome o, long runId) throws IOException {
        Bytes row = new Bytes(256);
        int position = 0;
        for (EvaluationViews.Score s : o.scores()) {
            row.clear();
            row.int16(15);
            row.int32(8).int64(runId);
            row.utf8(o.element());
            row.utf8(o.itemLabel());
            row.int32(8).int64(s.laboratoryId());
            row.int32(4).int32(position++);
            row.utf8(s.participantCode());
            row.utf8(s.reported());
            row.utf8(s.methodGroup());
            row.float8(s.value());
            row.float8(s.z());
            row.float8(s.zPrime());
            row.float8(s.zeta());
            row.float8(s.en());
            row.utf8(s.classification());
            row.utf8(s.excludedReason());
            spill.write(row.bytes, 0, row.length);
        }
        return position;
    }

    /** A growable byte buffer with the field encodings of binary COPY. */
    static final class Bytes {
        byte[] bytes;
        int length;

        Bytes(int capacity) {
            bytes = new byte[capacity];
        }

        void clear() {
            length = 0;
        }

        private void room(int more) {
            if (length + more > bytes.length) {
                bytes = java.util.Arrays.copyOf(bytes, Math.max(bytes.length * 2, length + more));
            }
        }

        Bytes raw(byte b) {
            room(1);
            bytes[length++] = b;
            return this;
        }

        Bytes raw(byte[] b) {
            return raw(b, 0, b.length);
        }

        Bytes raw(byte[] b, int offset, int count) {
            room(count);
            System.arraycopy(b, offset, bytes, length, count);
            length += count;
            return this;
        }

        Bytes text(String s) {
            return raw(s.getBytes(StandardCharsets.UTF_8));
        }

        Bytes int16(int v) {
            return raw((byte) (v >>> 8)).raw((byte) v);
        }

        Bytes int32(int v) {
            return int16(v >>> 16).int16(v);
        }

        Bytes int64(long v) {
            return int32((int) (v >>> 32)).int32((int) v);
        }

        /** A float8 field (length and value), or a NULL field. */
        Bytes float8(Double v) {
            return v == null ? int32(-1) : int32(8).int64(Double.doubleToRawLongBits(v));
        }

        /** A text field in UTF-8 (length and bytes), or a NULL field. */
        Bytes utf8(String s) {
            if (s == null) {
                return int32(-1);
            }
            byte[] b = s.getBytes(StandardCharsets.UTF_8);
            return int32(b.length).raw(b);
        }
    }

    // ---- storing -------------------------------------------------------------------------------------------

    private static long nextRunId(Connection connection) throws SQLException {
        try (PreparedStatement s = connection.prepareStatement(
                "SELECT nextval(pg_get_serial_sequence('evaluation_run', 'id'))");
             ResultSet rs = s.executeQuery()) {
            rs.next();
            return rs.getLong(1);
        }
    }

    private static Result store(Connection connection, Context context, Header header, Evaluation evaluation,
                                long runId) throws SQLException, IOException {
        String inputsSha = inputsSha256(connection, context, evaluation);
        String outputsSha = HexFormat.of().formatHex(evaluation.outputs.digest());
        int version;
        try (PreparedStatement s = connection.prepareStatement(
                "SELECT coalesce(max(version), 0) FROM evaluation_run WHERE round_id = ?")) {
            s.setLong(1, context.roundId());
            try (ResultSet rs = s.executeQuery()) {
                rs.next();
                version = rs.getInt(1) + 1;
            }
        }
        try (PreparedStatement s = connection.prepareStatement("""
                INSERT INTO evaluation_run (id, round_id, version, preview, round_state, plan_version, plan_sha256,
                    inputs_sha256, outputs_sha256, code_version, created_by, created_at, inputs_trailer)
                OVERRIDING SYSTEM VALUE
                VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
                """)) {
            int i = 1;
            s.setLong(i++, runId);
            s.setLong(i++, context.roundId());
            s.setInt(i++, version);
            s.setBoolean(i++, header.preview());
            s.setString(i++, context.roundState());
            s.setInt(i++, context.planVersion());
            s.setString(i++, context.planSha256());
            s.setString(i++, inputsSha);
            s.setString(i++, outputsSha);
            s.setString(i++, header.codeVersion());
            s.setString(i++, header.createdBy());
            s.setObject(i++, header.createdAt());
            s.setString(i, context.inputsTrailer());
            s.executeUpdate();
        }
        copyScores(connection, evaluation.scores);
        storeMeasurands(connection, runId, evaluation.measurands);
        return new Result(runId, version, inputsSha, outputsSha, evaluation.measurands.size(), evaluation.scoreRows);
    }

    /** Binary COPY: signature, flags, header extension length. */
    private static final byte[] COPY_HEADER = header();

    private static byte[] header() {
        Bytes b = new Bytes(19).raw("PGCOPY\n".getBytes(StandardCharsets.US_ASCII)).raw((byte) 0xFF).raw((byte) '\r')
                .raw((byte) '\n').raw((byte) 0).int32(0).int32(0);
        return java.util.Arrays.copyOf(b.bytes, b.length);
    }
    private static final byte[] COPY_TRAILER = {(byte) 0xFF, (byte) 0xFF};

    /** Copies the spilled score rows in (binary COPY). */
    private static void copyScores(Connection connection, Spill scores) throws SQLException, IOException {
        try (InputStream in = new java.io.SequenceInputStream(java.util.Collections.enumeration(List.of(
                new java.io.ByteArrayInputStream(COPY_HEADER), scores.read(),
                new java.io.ByteArrayInputStream(COPY_TRAILER))))) {
            connection.unwrap(PGConnection.class).getCopyAPI().copyIn("""
                    COPY participant_score (run_id, element, item_label, laboratory_id, position, participant_code,
                        reported, method_group, value, z, z_prime, zeta, en, classification, excluded_reason)
                    FROM STDIN (FORMAT binary)
                    """, in, BUFFER);
        }
    }

    /**
     * SHA-256 of the inputs text: round, plan and late policy, then every result read in element, item, participant
     * code order (PostgreSQL's order, as the run has always read them), then the trailer.
     */
    private static String inputsSha256(Connection connection, Context context, Evaluation evaluation)
            throws SQLException, IOException {
        MessageDigest digest = sha256();
        digest.update(("round " + context.roundId() + "\nplan " + context.planVersion() + " " + context.planSha256()
                + "\nlate-policy " + context.latePolicy() + "\n").getBytes(StandardCharsets.UTF_8));
        List<List<String>> keys = new ArrayList<>(evaluation.segments.keySet());
        if (!keys.isEmpty()) {
            String[] elements = keys.stream().map(k -> k.get(0)).toArray(String[]::new);
            String[] itemLabels = keys.stream().map(k -> k.get(1)).toArray(String[]::new);
            Array e = connection.createArrayOf("varchar", elements);
            Array i = connection.createArrayOf("varchar", itemLabels);
            try (PreparedStatement s = connection.prepareStatement("""
                    SELECT g.n FROM unnest(?::varchar[], ?::varchar[]) WITH ORDINALITY AS g(element, item_label, n)
                     ORDER BY g.element, g.item_label
                    """)) {
                s.setArray(1, e);
                s.setArray(2, i);
                try (ResultSet rs = s.executeQuery(); Spill.Reader segments = evaluation.inputs.randomAccess()) {
                    byte[] buffer = new byte[BUFFER];
                    while (rs.next()) {
                        long[] segment = evaluation.segments.get(keys.get(rs.getInt(1) - 1));
                        segments.feed(segment[0], segment[1], digest, buffer);
                    }
                }
            }
        }
        digest.update(context.inputsTrailer().getBytes(StandardCharsets.UTF_8));
        return HexFormat.of().formatHex(digest.digest());
    }

    private static void storeMeasurands(Connection connection, long runId,
                                        List<EvaluationViews.MeasurandOutcome> outcomes) throws SQLException {
        try (PreparedStatement m = connection.prepareStatement("""
                INSERT INTO measurand_evaluation (run_id, element, item_label, position, unit, n, censored, excluded,
                    assigned_value_method, assigned_value, assigned_value_uncertainty, sigma_pt, sigma_pt_method,
                    sigma_pt_source, score_used, score_used_reason, median, made, niqr, robust_mean, robust_sd,
                    iterations, converged, warnings_json, method_groups_json, rules_json)
                VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
                """)) {
            int position = 0;
            for (EvaluationViews.MeasurandOutcome o : outcomes) {
                int i = 1;
                m.setLong(i++, runId);
                m.setString(i++, o.element());
                m.setString(i++, o.itemLabel());
                m.setInt(i++, position++);
                m.setString(i++, o.unit());
                m.setInt(i++, o.n());
                m.setInt(i++, o.censored());
                m.setInt(i++, o.excluded());
                m.setString(i++, o.assignedValueMethod());
                setDouble(m, i++, o.assignedValue());
                setDouble(m, i++, o.assignedValueUncertainty());
                setDouble(m, i++, o.sigmaPt());
                m.setString(i++, o.sigmaPtMethod());
                m.setString(i++, o.sigmaPtSource());
                m.setString(i++, o.scoreUsed());
                m.setString(i++, o.scoreUsedReason());
                setDouble(m, i++, o.median());
                setDouble(m, i++, o.madE());
                setDouble(m, i++, o.nIqr());
                setDouble(m, i++, o.robustMean());
                setDouble(m, i++, o.robustSd());
                if (o.iterations() == null) {
                    m.setNull(i++, Types.INTEGER);
                } else {
                    m.setInt(i++, o.iterations());
                }
                if (o.converged() == null) {
                    m.setNull(i++, Types.BOOLEAN);
                } else {
                    m.setBoolean(i++, o.converged());
                }
                m.setString(i++, json(o.warnings()));
                m.setString(i++, json(o.methodGroups()));
                m.setString(i, o.rules() == null ? null : json(o.rules()));
                m.addBatch();
            }
            m.executeBatch();
        }
    }

    private static void setDouble(PreparedStatement s, int index, Double value) throws SQLException {
        if (value == null) {
            s.setNull(index, Types.DOUBLE);
        } else {
            s.setDouble(index, value);
        }
    }

    private static String json(Object value) {
        try {
            return CANONICAL.writeValueAsString(value);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static MessageDigest sha256() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    // ---- reading COPY text ---------------------------------------------------------------------------------

    /** Groups of the streamed results by element and item; one group in memory at a time. */
    private static final class Reader {
        private final CopyOut out;
        private EvaluationService.Row next;
        private byte[] nextLine;
        private boolean started;
        private List<byte[]> lines = List.of();

        Reader(CopyOut out) {
            this.out = out;
        }

        private EvaluationService.Row peek() throws SQLException {
            if (!started) {
                started = true;
                next = read();
            }
            return next;
        }

        private EvaluationService.Row read() throws SQLException {
            nextLine = out.readFromCopy();
            return nextLine == null ? null : parse(nextLine);
        }

        /** The COPY text lines of the last group returned, in its order. */
        List<byte[]> lines() {
            return lines;
        }

        /** The next group whatever its key, or null at the end. */
        List<EvaluationService.Row> anyGroup() throws SQLException {
            EvaluationService.Row first = peek();
            return first == null ? null : groupOf(first);
        }

        private List<EvaluationService.Row> groupOf(EvaluationService.Row first) throws SQLException {
            List<EvaluationService.Row> rows = new ArrayList<>();
            lines = new ArrayList<>();
            while (next != null && next.element().equals(first.element()) && next.itemLabel().equals(first.itemLabel())) {
                rows.add(next);
                lines.add(nextLine);
                next = read();
            }
            return rows;
        }

        /**
         * Reads the rest without parsing it. (Cancelling the COPY instead would fail the transaction and, as seen,
         * leave the connection's protocol state confused.)
         */
        void drain() throws SQLException {
            byte[] dropped;
            do {
                dropped = out.isActive() ? out.readFromCopy() : null;
            } while (dropped != null);
        }
    }

    /** One line of COPY text output of {@link #resultsQuery}. */
    static EvaluationService.Row parse(byte[] line) {
        String[] f = new String[11];
        int field = 0;
        int start = 0;
        int end = line.length;
        if (end > 0 && line[end - 1] == '\n') {
            end--;
        }
        for (int i = 0; i <= end && field < f.length; i++) {
            if (i == end || line[i] == '\t') {
                f[field++] = decode(line, start, i);
                start = i + 1;
            }
        }
        return new EvaluationService.Row(Long.parseLong(f[0]), f[1], f[2], f[3], f[4], new BigDecimal(f[5]),
                "t".equals(f[6]), f[7] == null ? null : new BigDecimal(f[7]), f[8] == null ? null : new BigDecimal(f[8]),
                f[9], "t".equals(f[10]));
    }

    /** A field of COPY text format: {@code \N} is null, backslash escapes decoded, UTF-8. */
    static String decode(byte[] line, int from, int to) {
        if (to - from == 2 && line[from] == '\\' && line[from + 1] == 'N') {
            return null;
        }
        int backslash = -1;
        for (int i = from; i < to; i++) {
            if (line[i] == '\\') {
                backslash = i;
                break;
            }
        }
        if (backslash < 0) {
            return new String(line, from, to - from, StandardCharsets.UTF_8);
        }
        java.io.ByteArrayOutputStream bytes = new java.io.ByteArrayOutputStream(to - from);
        for (int i = from; i < to; i++) {
            byte b = line[i];
            if (b != '\\' || i + 1 >= to) {
                bytes.write(b);
                continue;
            }
            byte c = line[++i];
            switch (c) {
                case 'b' -> bytes.write('\b');
                case 'f' -> bytes.write('\f');
                case 'n' -> bytes.write('\n');
                case 'r' -> bytes.write('\r');
                case 't' -> bytes.write('\t');
                case 'v' -> bytes.write(0x0B);
                case 'x' -> {
                    int value = 0;
                    int digits = 0;
                    while (digits < 2 && i + 1 < to && Character.digit(line[i + 1], 16) >= 0) {
                        value = value * 16 + Character.digit(line[++i], 16);
                        digits++;
                    }
                    bytes.write(digits == 0 ? 'x' : value);
                }
                default -> {
                    if (c >= '0' && c <= '7') {
                        int value = c - '0';
                        int digits = 1;
                        while (digits < 3 && i + 1 < to && line[i + 1] >= '0' && line[i + 1] <= '7') {
                            value = value * 8 + (line[++i] - '0');
                            digits++;
                        }
                        bytes.write(value);
                    } else {
                        bytes.write(c);
                    }
                }
            }
        }
        return bytes.toString(StandardCharsets.UTF_8);
    }

    // ---- spill files ---------------------------------------------------------------------------------------

    /** An append-only byte store: memory first, a temporary file beyond a few MiB; deleted on close. */
    static final class Spill implements AutoCloseable {
        private static final int IN_MEMORY = 4 << 20;
        private final String prefix;
        private byte[] memory = new byte[BUFFER];
        private long size;
        private Path file;
        private OutputStream fileOut;

        Spill(String prefix) {
            this.prefix = prefix;
        }

        long size() {
            return size;
        }

        void write(byte[] bytes, int offset, int length) throws IOException {
            if (file == null && size + length > IN_MEMORY) {
                file = Files.createTempFile(prefix, ".spill");
                fileOut = new BufferedOutputStream(Files.newOutputStream(file), BUFFER);
                fileOut.write(memory, 0, (int) size);
                memory = null;
            }
            if (file != null) {
                fileOut.write(bytes, offset, length);
            } else {
                if (size + length > memory.length) {
                    memory = java.util.Arrays.copyOf(memory, (int) Math.min(IN_MEMORY, Math.max(size + length,
                            memory.length * 2L)));
                }
                System.arraycopy(bytes, offset, memory, (int) size, length);
            }
            size += length;
        }

        /** Everything written, from the start. */
        InputStream read() throws IOException {
            if (file == null) {
                return new java.io.ByteArrayInputStream(memory, 0, (int) size);
            }
            fileOut.flush();
            return new BufferedInputStream(Files.newInputStream(file), BUFFER);
        }

        Reader randomAccess() throws IOException {
            if (file != null) {
                fileOut.flush();
            }
            return new Reader(this);
        }

        /** Reads segments of a spill into a digest. */
        static final class Reader implements AutoCloseable {
            private final Spill spill;
            private final java.nio.channels.FileChannel channel;

            Reader(Spill spill) throws IOException {
                this.spill = spill;
                this.channel = spill.file == null ? null : java.nio.channels.FileChannel.open(spill.file);
            }

            void feed(long offset, long length, MessageDigest digest, byte[] buffer) throws IOException {
                if (channel == null) {
                    digest.update(spill.memory, (int) offset, (int) length);
                    return;
                }
                java.nio.ByteBuffer target = java.nio.ByteBuffer.wrap(buffer);
                long position = offset;
                long left = length;
                while (left > 0) {
                    target.clear();
                    target.limit((int) Math.min(buffer.length, left));
                    int n = channel.read(target, position);
                    if (n < 0) {
                        throw new IOException("spill file ended early");
                    }
                    digest.update(buffer, 0, n);
                    position += n;
                    left -= n;
                }
            }

            @Override
            public void close() throws IOException {
                if (channel != null) {
                    channel.close();
                }
            }
        }

        @Override
        public void close() throws IOException {
            memory = null;
            if (file != null) {
                try {
                    fileOut.close();
                } finally {
                    Files.deleteIfExists(file);
                }
            }
        }
    }
}
