package org.roundtable.evaluation.benchmark;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.flywaydb.core.Flyway;
import org.postgresql.PGConnection;
import org.postgresql.copy.PGCopyOutputStream;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.RoundEvaluator;
import org.roundtable.platform.EmbeddedDatabase;
import org.roundtable.scheme.ChemicalElement;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Measurand;
import org.roundtable.scheme.ParticipantCodes;
import org.roundtable.scheme.PlanDocument;
import org.roundtable.scheme.Round;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.Set;
import java.util.TreeSet;

/**
 * The evaluation of a large round against PostgreSQL's own floor for moving the same data (issue 7).
 *
 * <p>Starts an embedded PostgreSQL 17 with the server's durable settings ({@link EmbeddedDatabase#start}), runs the
 * Flyway migrations (the real schema), and generates with COPY (not timed) a closed round of
 * {@code bench.participants} laboratories × {@code bench.measurands} measurands on one item: results with expanded
 * uncertainties on half of them, three method groups, about 1 % censored ("less than") and 1 % late (the round
 * does not score late results), and a plan that mixes consensus of all, consensus of a method group, certified
 * values and σpt as a percentage of the assigned value.
 *
 * <ul>
 *   <li><b>evaluationSeconds</b>: {@link RoundEvaluator#run} with {@link EvaluationService#measurandStep} — the code
 *       the server's evaluation job runs — on a connection switched to the application role, holding the round row
 *       lock, committed; one warm-up, then the median of three. Only the round's context (plan, units, items: five
 *       small queries in the server) is assembled here rather than by the service's CDI collaborators, and the one
 *       audit event is not written.</li>
 *   <li><b>floorSeconds</b>: in the same database, {@code COPY (the run's results query) TO STDOUT} into a null sink,
 *       plus {@code COPY … FROM STDIN} of the same number of score rows (the rows a run stored, spooled to a file
 *       beforehand) into a scratch table created {@code LIKE participant_score INCLUDING ALL}, committed; median of
 *       three.</li>
 *   <li><b>peakHeapMiB</b>: the largest total heap in use while evaluating, taken just before each collection (the
 *       heap only grows between collections), mostly garbage not yet collected (the collector lets the young
 *       generation grow into whatever heap there is); {@code sumOfPoolPeaksMiB}, the sum of the pools' separate
 *       peaks, over-states it. The profile runs it with {@code -Xmx512m}, which proves the bound; <b>peakHeapAfterGcMiB</b>, the largest heap in use right after a collection, is about the live
 *       data.</li>
 *   <li><b>typicalRoundMillis</b>: the same code on a round of 30 laboratories × 50 measurands; three warm-ups, median
 *       of five.</li>
 * </ul>
 * Writes {@code evaluation.json} in the working directory ({@code target/benchmarks} under {@code -Pbenchmark}).
 */
public final class EvaluationBenchmark {

    static final int PARTICIPANTS = Integer.getInteger("bench.participants", 10_000);
    static final int MEASURANDS = Integer.getInteger("bench.measurands", 100);
    static final String APP_ROLE = "roundtable_app";
    static final String[] METHODS = {"spark-oes", "xrf", "icp-oes"};

    private EvaluationBenchmark() {
    }

    /** A generated round and what the run needs to know about it. */
    public record Generated(long roundId, RoundEvaluator.Context context, long results) {
    }

    public static void main(String[] args) throws Exception {
        double loadBefore = ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
        Path work = Files.createTempDirectory("roundtable-evaluation-bench");
        int port;
        try (ServerSocket socket = new ServerSocket(0)) {
            port = socket.getLocalPort();
        }
        try (EmbeddedPostgres postgres = EmbeddedDatabase.start(work.resolve("pg"), port)) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            Flyway.configure().dataSource(jdbc, "postgres", "").locations("classpath:db/migration")
                    .placeholders(Map.of("appRole", APP_ROLE)).load().migrate();
            EvaluationService service = new EvaluationService(null, null, null, null, Clock.systemUTC(), "benchmark", null);

            long generateStart = System.nanoTime();
            Generated large;
            Generated typical;
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                c.setAutoCommit(false);
                large = generate(c, "BENCH-L", PARTICIPANTS, MEASURANDS, 1);
                typical = generate(c, "BENCH-S", 30, 50, 2);
                c.commit();
                try (Statement s = c.createStatement()) {
                    c.setAutoCommit(true);
                    s.execute("VACUUM ANALYZE");
                    if (Boolean.getBoolean("bench.withoutReferenceCheck")) {
                        // diagnostic only: what the statement-level reference check of the score rows costs
                        s.execute("ALTER TABLE participant_score DISABLE TRIGGER participant_score_references");
                    }
                }
            }
            double generateSeconds = (System.nanoTime() - generateStart) / 1e9;
            System.out.printf("Generated %,d results in %.1f s%n", large.results(), generateSeconds);

            List<MemoryPoolMXBean> heap = ManagementFactory.getMemoryPoolMXBeans().stream()
                    .filter(p -> p.getType() == MemoryType.HEAP).toList();
            System.gc();
            heap.forEach(MemoryPoolMXBean::resetPeakUsage);
            java.util.concurrent.atomic.AtomicLong beforeGc = new java.util.concurrent.atomic.AtomicLong();
            java.util.concurrent.atomic.AtomicLong liveAfterGc = watchHeap(heap, beforeGc);

            double[] evaluation = new double[3];
            RoundEvaluator.Result last = null;
            for (int run = -1; run < 3; run++) {
                long start = System.nanoTime();
                last = evaluate(jdbc, service, large);
                double seconds = (System.nanoTime() - start) / 1e9;
                System.out.printf("evaluation %s: %.2f s (version %d, %d scores)%n", run < 0 ? "warm-up" : run + 1,
                        seconds, last.version(), last.scores());
                if (run >= 0) {
                    evaluation[run] = seconds;
                }
            }
            // the heap only grows between collections, so its peak is the largest total just before one (or now)
            long peakHeap = Math.max(beforeGc.get(), heap.stream().mapToLong(p -> p.getUsage().getUsed()).sum());
            long sumOfPoolPeaks = heap.stream().mapToLong(p -> p.getPeakUsage().getUsed()).sum();

            double[] floor = floor(jdbc, large, last.runId(), work);

            double[] small = new double[5];
            for (int run = -3; run < 5; run++) {
                long start = System.nanoTime();
                evaluate(jdbc, service, typical);
                if (run >= 0) {
                    small[run] = (System.nanoTime() - start) / 1e6;
                }
            }

            double evaluationSeconds = median(evaluation);
            double floorSeconds = median(floor);
            Map<String, Object> figures = new LinkedHashMap<>();
            figures.put("participants", PARTICIPANTS);
            if (Boolean.getBoolean("bench.withoutReferenceCheck")) {
                figures.put("diagnostic", "score reference check disabled");
            }
            figures.put("measurands", MEASURANDS);
            figures.put("results", large.results());
            figures.put("evaluationSeconds", round(evaluationSeconds, 3));
            figures.put("evaluationRunsSeconds", Arrays.stream(evaluation).map(v -> round(v, 3)).toArray());
            figures.put("floorSeconds", round(floorSeconds, 3));
            figures.put("floorRunsSeconds", Arrays.stream(floor).map(v -> round(v, 3)).toArray());
            figures.put("ratio", round(evaluationSeconds / floorSeconds, 3));
            figures.put("peakHeapMiB", round(peakHeap / 1048576.0, 1));
            figures.put("peakHeapAfterGcMiB", round(liveAfterGc.get() / 1048576.0, 1));
            figures.put("sumOfPoolPeaksMiB", round(sumOfPoolPeaks / 1048576.0, 1));
            figures.put("maxHeapMiB", round(Runtime.getRuntime().maxMemory() / 1048576.0, 1));
            figures.put("typicalRoundMillis", round(median(small), 1));
            figures.put("typicalRoundRunsMillis", Arrays.stream(small).map(v -> round(v, 1)).toArray());
            figures.put("loadAverageBefore", round(loadBefore, 2));
            figures.put("loadAverageAfter", round(ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage(), 2));
            figures.put("availableProcessors", Runtime.getRuntime().availableProcessors());
            String json = new ObjectMapper().writerWithDefaultPrettyPrinter().writeValueAsString(figures);
            Files.writeString(Path.of("evaluation.json"), json);
            System.out.println("Evaluation benchmark: " + json);
            System.out.printf("Evaluation of %,d x %d: %.2f s, floor %.2f s, ratio %.2f (target <= 1.5); peak heap %.0f MiB"
                    + " (target < 512); typical round 30 x 50: %.0f ms (target < 200)%n", PARTICIPANTS, MEASURANDS,
                    evaluationSeconds, floorSeconds, evaluationSeconds / floorSeconds, peakHeap / 1048576.0,
                    median(small));
        } finally {
            deleteRecursively(work);
        }
    }

    /** One run as the server's job runs it: application role, round row lock, the run, commit. */
    public static RoundEvaluator.Result evaluate(String jdbc, EvaluationService service, Generated round) throws SQLException {
        try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
            try (Statement s = c.createStatement()) {
                s.execute("SET ROLE " + APP_ROLE);
            }
            c.setAutoCommit(false);
            try (PreparedStatement lock = c.prepareStatement("SELECT id FROM round WHERE id = ? FOR UPDATE")) {
                lock.setLong(1, round.roundId());
                lock.executeQuery().close();
            }
            RoundEvaluator.Header header = new RoundEvaluator.Header(false, "benchmark", "benchmark",
                    OffsetDateTime.now(ZoneOffset.UTC));
            RoundEvaluator.Result result = RoundEvaluator.run(c, round.context(), header,
                    service.measurandStep(true), (done, total) -> { });
            c.commit();
            return result;
        }
    }

    /** COPY the round's results out, plus COPY as many score rows into a scratch copy of the score table. */
    static double[] floor(String jdbc, Generated round, long runId, Path work) throws Exception {
        Path rows = work.resolve("scores.copy");
        try (Connection c = DriverManager.getConnection(jdbc, "postgres", "");
             OutputStream out = new BufferedOutputStream(Files.newOutputStream(rows), 1 << 16)) {
            c.unwrap(PGConnection.class).getCopyAPI().copyOut(
                    "COPY (SELECT * FROM participant_score WHERE run_id = " + runId + ") TO STDOUT", out);
        }
        List<String> order = round.context().measurands().stream().map(p -> p.plan().element()).toList();
        String resultsOut = "COPY (" + RoundEvaluator.resultsQuery(round.roundId(), order) + ") TO STDOUT";
        double[] seconds = new double[3];
        for (int run = 0; run < 3; run++) {
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                try (Statement s = c.createStatement()) {
                    s.execute("DROP TABLE IF EXISTS score_floor");
                    s.execute("CREATE TABLE score_floor (LIKE participant_score INCLUDING ALL)");

                }
                c.setAutoCommit(false);
                long start = System.nanoTime();
                long out = c.unwrap(PGConnection.class).getCopyAPI().copyOut(resultsOut, OutputStream.nullOutputStream());
                long in;
                try (InputStream file = Files.newInputStream(rows)) {
                    in = c.unwrap(PGConnection.class).getCopyAPI().copyIn("COPY score_floor FROM STDIN", file, 1 << 16);
                }
                c.commit();
                seconds[run] = (System.nanoTime() - start) / 1e9;
                System.out.printf("floor %d: %.2f s (%d rows out, %d rows in)%n", run + 1, seconds[run], out, in);
                c.setAutoCommit(true);
                try (Statement s = c.createStatement()) {
                    s.execute("DROP TABLE score_floor");
                }
            }
        }
        Files.deleteIfExists(rows);
        return seconds;
    }

    // ---- synthetic round --------------------------------------------------------------------------------------

    public static Generated generate(Connection c, String code, int participants, int measurands, long seed)
            throws Exception {
        Random random = new Random(seed);
        // a measurand is an element of an item: beyond the catalogue's 92 elements, a split-level pair of items
        List<String> items = measurands > ChemicalElement.SYMBOLS.size() ? List.of("A", "B") : List.of("A");
        if (measurands % items.size() != 0) {
            throw new IllegalArgumentException("measurands must be a multiple of " + items.size());
        }
        int elementCount = measurands / items.size();
        List<String> elements = ChemicalElement.SYMBOLS.subList(0, elementCount);
        long scheme;
        try (PreparedStatement s = c.prepareStatement("INSERT INTO scheme (name, material_family, created_at) "
                + "VALUES (?, 'OTHER', now()) RETURNING id")) {
            s.setString(1, "Benchmark scheme " + code);
            ResultSet rs = s.executeQuery();
            rs.next();
            scheme = rs.getLong(1);
        }
        List<Measurand> catalogue = new ArrayList<>();
        List<EvaluationPlan.MeasurandPlan> plans = new ArrayList<>();
        double[] centre = new double[elementCount];
        try (PreparedStatement s = c.prepareStatement("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, "
                + "expected_min, expected_max, method_groups) VALUES (?, ?, 'mg/kg', 3, 0, 10000, 'SPARK_OES,XRF,ICP_OES')")) {
            for (int i = 0; i < elementCount; i++) {
                String element = elements.get(i);
                s.setLong(1, scheme);
                s.setString(2, element);
                s.addBatch();
                Measurand m = new Measurand();
                m.element = element;
                m.unit = "mg/kg";
                m.reportingDigits = 3;
                m.methodGroups = "SPARK_OES,XRF,ICP_OES";
                catalogue.add(m);
                centre[i] = 10 + random.nextInt(900);
                String sigma = Double.toString(Math.round(centre[i] * 0.03 * 1000) / 1000.0);
                plans.add(switch (i % 10) {
                    case 0 -> plan(element, "CONSENSUS_METHOD_GROUP", "SPARK_OES", null, null, "FIXED", sigma, null,
                            null, Double.toString(Math.round(centre[i] * 0.02 * 1000) / 1000.0));
                    case 1 -> plan(element, "CERTIFIED_REFERENCE", null, Double.toString(centre[i]),
                            Double.toString(Math.round(centre[i] * 0.01 * 1000) / 1000.0), "FIXED", sigma, null, null,
                            null);
                    case 2 -> plan(element, "CONSENSUS_ALL", null, null, null, "PERCENT_OF_ASSIGNED", null, "3", sigma,
                            null);
                    default -> plan(element, "CONSENSUS_ALL", null, null, null, "FIXED", sigma, null, null, null);
                });
            }
            s.executeBatch();
        }
        PlanDocument.Canonical plan = PlanDocument.canonical(new EvaluationPlan(plans), catalogue,
                new PlanDocument.RoundSettings(code, Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED, Round.CodeScope.ROUND),
                new ObjectMapper());
        long round;
        try (PreparedStatement s = c.prepareStatement("INSERT INTO round (scheme_id, code, item_description, "
                + "items_per_laboratory, item_labels, dispatch_date, result_deadline, deadline_time_zone, instructions, "
                + "late_policy, state, state_changed_at, created_at) VALUES (?, ?, 'Benchmark item', ?, ?, "
                + "current_date - 30, now() - interval '1 day', 'UTC', 'Benchmark', 'ACCEPT_FLAGGED_UNSCORED', "
                + "'CLOSED', now(), now()) RETURNING id")) {
            s.setLong(1, scheme);
            s.setString(2, code);
            s.setInt(3, items.size());
            s.setString(4, String.join(",", items));
            ResultSet rs = s.executeQuery();
            rs.next();
            round = rs.getLong(1);
        }
        try (PreparedStatement s = c.prepareStatement("INSERT INTO evaluation_plan (round_id, plan_version, "
                + "canonical_json, sha256, reason, frozen_by, frozen_at) VALUES (?, 1, ?, ?, 'Benchmark', 'benchmark', now())")) {
            s.setLong(1, round);
            s.setString(2, plan.json());
            s.setString(3, plan.sha256());
            s.executeUpdate();
        }
        List<Long> labs = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement("INSERT INTO laboratory (name, organisation, country) "
                + "SELECT ? || ' lab ' || g, 'Benchmark org', 'DE' FROM generate_series(1, ?) g RETURNING id")) {
            s.setString(1, code);
            s.setInt(2, participants);
            ResultSet rs = s.executeQuery();
            while (rs.next()) {
                labs.add(rs.getLong(1));
            }
        }
        Set<String> codes = new HashSet<>();
        StringBuilder enrolment = new StringBuilder();
        for (long lab : labs) {
            enrolment.append(round).append('\t').append(lab).append('\t').append(ParticipantCodes.draw(codes))
                    .append("\t2026-11-01 00:00:00+00\tbenchmark\n");
        }
        c.unwrap(PGConnection.class).getCopyAPI().copyIn("COPY round_participant (round_id, laboratory_id, "
                + "participant_code, enrolled_at, enrolled_by) FROM STDIN",
                new java.io.ByteArrayInputStream(enrolment.toString().getBytes(StandardCharsets.UTF_8)));
        try (PreparedStatement s = c.prepareStatement("""
                INSERT INTO submission (round_id, laboratory_id, current_revision, created_at, updated_at)
                SELECT round_id, laboratory_id, 1, now(), now() FROM round_participant WHERE round_id = ?
                """)) {
            s.setLong(1, round);
            s.executeUpdate();
        }
        try (PreparedStatement s = c.prepareStatement("""
                INSERT INTO submission_revision (submission_id, revision, channel, receipt_id, payload_sha256,
                    canonical_payload, values_sha256, submitted_by, submitted_role, submitted_at, late)
                SELECT id, 1, 'JSON', ? || '-' || id, encode(sha256(id::text::bytea), 'hex'), '{}',
                       encode(sha256(('v' || id)::text::bytea), 'hex'), 'benchmark', 'lab-member', now(), id % 97 = 0
                  FROM submission WHERE round_id = ?
                """)) {
            s.setString(1, code);
            s.setLong(2, round);
            s.executeUpdate();
        }
        List<Long> revisions = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement("SELECT sr.id FROM submission_revision sr JOIN submission s "
                + "ON s.id = sr.submission_id WHERE s.round_id = ? ORDER BY sr.id")) {
            s.setLong(1, round);
            ResultSet rs = s.executeQuery();
            while (rs.next()) {
                revisions.add(rs.getLong(1));
            }
        }
        long results = 0;
        try (PGCopyOutputStream copy = new PGCopyOutputStream(c.unwrap(PGConnection.class), """
                COPY reported_result (revision_id, element, item_label, value_as_reported, unit_as_reported, less_than,
                    reported_number, value_in_measurand_unit, expanded_uncertainty_as_reported, expanded_uncertainty,
                    coverage_factor, method_group, replicates) FROM STDIN
                """, 1 << 16)) {
            StringBuilder line = new StringBuilder(128);
            for (int l = 0; l < revisions.size(); l++) {
                String method = METHODS[l % METHODS.length];
                double bias = l % METHODS.length == 1 ? 0.005 : 0;
                for (int m = 0; m < measurands; m++) {
                    int i = m / items.size();
                    double value = centre[i] * (1 + bias + 0.02 * random.nextGaussian());
                    if (random.nextInt(50) == 0) {
                        value *= 1 + 0.3 * random.nextGaussian(); // a gross error now and then
                    }
                    boolean lessThan = random.nextInt(100) == 0;
                    String reported = new java.math.BigDecimal(Math.abs(value))
                            .setScale(3, java.math.RoundingMode.HALF_EVEN).toPlainString();
                    if (lessThan) {
                        reported = new java.math.BigDecimal(centre[i] * 0.1)
                                .setScale(3, java.math.RoundingMode.HALF_EVEN).toPlainString();
                    }
                    String u = l % 2 == 0 ? new java.math.BigDecimal(centre[i] * 0.04)
                            .setScale(3, java.math.RoundingMode.HALF_EVEN).toPlainString() : null;
                    line.setLength(0);
                    line.append(revisions.get(l)).append('\t').append(elements.get(i)).append('\t')
                            .append(items.get(m % items.size())).append('\t')
                            .append(lessThan ? "<" + reported : reported).append("\tmg/kg\t").append(lessThan ? 't' : 'f')
                            .append('\t').append(reported).append('\t').append(reported).append('\t')
                            .append(u == null ? "\\N" : u).append('\t').append(u == null ? "\\N" : u)
                            .append("\t2\t").append(method).append("\t1\n");
                    copy.write(line.toString().getBytes(StandardCharsets.UTF_8));
                    results++;
                }
            }
        }
        List<RoundEvaluator.Planned> planned = PlanDocument.read(plan.json(), new ObjectMapper()).measurands().stream()
                .map(mp -> new RoundEvaluator.Planned(mp, "mg/kg")).toList();
        RoundEvaluator.Context context = new RoundEvaluator.Context(round, "CLOSED",
                Round.LatePolicy.ACCEPT_FLAGGED_UNSCORED.name(), 1, plan.sha256(), planned, new TreeSet<>(items),
                "");
        return new Generated(round, context, results);
    }

    private static EvaluationPlan.MeasurandPlan plan(String element, String assigned, String group, String reference,
                                                     String referenceU, String sigmaMethod, String sigma, String percent,
                                                     String provisional, String allowedDifference) {
        return new EvaluationPlan.MeasurandPlan(element, assigned, group, reference, referenceU,
                reference == null ? null : "2", null, sigmaMethod, sigma, percent, null, null, null, provisional, null,
                null, allowedDifference, null, null, null, null);
    }

    /**
     * From GC notifications: the largest heap in use right after a collection (the live data, about), returned, and
     * the largest total heap in use right before one, into {@code beforeGc}.
     */
    private static java.util.concurrent.atomic.AtomicLong watchHeap(List<MemoryPoolMXBean> heap,
                                                                   java.util.concurrent.atomic.AtomicLong beforeGc) {
        java.util.concurrent.atomic.AtomicLong peak = new java.util.concurrent.atomic.AtomicLong();
        Set<String> heapPools = new HashSet<>(heap.stream().map(MemoryPoolMXBean::getName).toList());
        for (java.lang.management.GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            ((javax.management.NotificationEmitter) gc).addNotificationListener((notification, handback) -> {
                if (!notification.getType().equals(
                        com.sun.management.GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION)) {
                    return;
                }
                com.sun.management.GarbageCollectionNotificationInfo info =
                        com.sun.management.GarbageCollectionNotificationInfo.from(
                                (javax.management.openmbean.CompositeData) notification.getUserData());
                long used = info.getGcInfo().getMemoryUsageAfterGc().entrySet().stream()
                        .filter(e -> heapPools.contains(e.getKey())).mapToLong(e -> e.getValue().getUsed()).sum();
                peak.accumulateAndGet(used, Math::max);
                long before = info.getGcInfo().getMemoryUsageBeforeGc().entrySet().stream()
                        .filter(e -> heapPools.contains(e.getKey())).mapToLong(e -> e.getValue().getUsed()).sum();
                beforeGc.accumulateAndGet(before, Math::max);
            }, null, null);
        }
        return peak;
    }

    private static double median(double[] values) {
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        return sorted[sorted.length / 2];
    }

    private static double round(double value, int digits) {
        double scale = Math.pow(10, digits);
        return Math.round(value * scale) / scale;
    }

    private static void deleteRecursively(Path root) throws IOException {
        if (!Files.exists(root)) {
            return;
        }
        try (var paths = Files.walk(root)) {
            paths.sorted(java.util.Comparator.reverseOrder()).forEach(p -> {
                try {
                    Files.deleteIfExists(p);
                } catch (IOException e) {
                    // a temporary directory; nothing to do
                }
            });
        }
    }
}
