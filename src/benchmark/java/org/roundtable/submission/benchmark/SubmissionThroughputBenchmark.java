package org.roundtable.submission.benchmark;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.roundtable.platform.Secrets;
import org.roundtable.scheme.EvaluationPlan;
import org.roundtable.scheme.Measurand;
import org.roundtable.scheme.ParticipantCodes;
import org.roundtable.scheme.PlanDocument;
import org.roundtable.scheme.Round;

import java.io.IOException;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * Deadline surge: 10,000 laboratories each submit 100 results (50 elements × a split-level pair of items) through
 * the JSON API of the packaged application, against PostgreSQL, with concurrent clients on loopback.
 *
 * <p>Run by {@code mvn -Pbenchmark verify}: starts an embedded PostgreSQL 17 and the packaged jar
 * ({@code target/quarkus-app/quarkus-run.jar}) as a separate process, sets up the round and the laboratories' API
 * tokens with set-based SQL, then measures: a closed loop of {@code bench.clients} clients (capacity), an open loop
 * at a fixed arrival rate ({@code bench.openLoopRate}, default 100/s, for {@code bench.openLoopSeconds}, latency from
 * the scheduled time: {@code openLoopP99Millis}), optionally an overload run ({@code bench.overloadRate}; 503 answers
 * counted apart), and the statements per submission from the server's statement log
 * ({@code statementsPerSubmission}). Writes {@code target/benchmarks/submissions.json}. Bounded in count and time;
 * all traffic stays on 127.0.0.1.
 */
public final class SubmissionThroughputBenchmark {

    static final int LABORATORIES = Integer.getInteger("bench.laboratories", 10_000);
    static final int CLIENTS = Integer.getInteger("bench.clients", 16);
    /** Arrival rate of the open-loop run (submissions per second) and its length. */
    static final double OPEN_LOOP_RATE = Double.parseDouble(System.getProperty("bench.openLoopRate", "100"));
    static final int OPEN_LOOP_SECONDS = Integer.getInteger("bench.openLoopSeconds", 20);
    /** An optional overload run at this rate for 5 s (0: none), to see 503 answers rather than queueing. */
    static final double OVERLOAD_RATE = Double.parseDouble(System.getProperty("bench.overloadRate", "0"));
    /** Sequential submissions whose statements are counted from the server's statement log. */
    static final int COUNTED = 20;
    static final List<String> ELEMENTS = List.of("C", "Si", "Mn", "P", "S", "Cr", "Ni", "Mo", "Cu", "V", "Ti", "Nb", "Al",
            "B", "Co", "As", "Sn", "Sb", "Ca", "Zr", "W", "Pb", "Bi", "Zn", "Mg", "Ce", "La", "Ta", "Se", "Te", "Fe", "Be",
            "Li", "Na", "K", "Ga", "Ge", "In", "Cd", "Ag", "Au", "Pt", "Pd", "Rh", "Y", "Hf", "Re", "Os", "Ir", "Ru");

    private SubmissionThroughputBenchmark() {
    }

    public static void main(String[] args) throws Exception {
        Path work = Files.createTempDirectory("roundtable-bench");
        Path jar = Path.of(System.getProperty("bench.jar", "../quarkus-app/quarkus-run.jar")).toAbsolutePath();
        if (!Files.exists(jar)) {
            throw new IllegalStateException("package the application first: " + jar);
        }
        Path pgLog = work.resolve("pglog");
        try (EmbeddedPostgres postgres = EmbeddedPostgres.builder().setDataDirectory(work.resolve("pg"))
                .setServerConfig("fsync", "on").setServerConfig("synchronous_commit", "on")
                // the statement log is switched on only while the statements of a few submissions are counted
                .setServerConfig("logging_collector", "on").setServerConfig("log_directory", pgLog.toString())
                .setServerConfig("log_filename", "postgresql.log").setServerConfig("log_line_prefix", "%p ")
                .start()) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            int port = freePort();
            Process app = startApplication(jar, jdbc, port, work);
            try {
                waitUntilReady(port);
                String[] tokens;
                long roundId;
                try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                    roundId = setUpRound(c);
                    // the closed loop's laboratories, then the open loop's, the overload run's and the counted ones
                    tokens = setUpLaboratories(c, roundId, LABORATORIES + (int) Math.round(OPEN_LOOP_RATE * OPEN_LOOP_SECONDS)
                            + (int) Math.round(OVERLOAD_RATE * 5) + COUNTED);
                }
                int openLoopCount = (int) Math.round(OPEN_LOOP_RATE * OPEN_LOOP_SECONDS);
                int overloadCount = (int) Math.round(OVERLOAD_RATE * 5);
                int closed = tokens.length - openLoopCount - overloadCount - COUNTED;
                Map<String, Object> figures = surge(port, roundId, java.util.Arrays.copyOfRange(tokens, 0, closed));
                HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10)).build();
                URI uri = URI.create("http://127.0.0.1:" + port + "/api/v1/my-rounds/" + roundId + "/submission");
                Map<String, Object> open = openLoop(client, uri, tokens, closed, closed + openLoopCount, OPEN_LOOP_RATE);
                figures.put("openLoopRate", OPEN_LOOP_RATE);
                figures.put("openLoopSubmissions", openLoopCount);
                figures.put("openLoopP50Millis", open.get("p50Millis"));
                figures.put("openLoopP99Millis", open.get("p99Millis"));
                figures.put("openLoopRefused", open.get("refused"));
                figures.put("openLoopFailures", open.get("failures"));
                if (overloadCount > 0) {
                    Map<String, Object> over = openLoop(client, uri, tokens, closed + openLoopCount,
                            closed + openLoopCount + overloadCount, OVERLOAD_RATE);
                    figures.put("overloadRate", OVERLOAD_RATE);
                    figures.put("overloadSubmissions", overloadCount);
                    figures.put("overloadAccepted", over.get("accepted"));
                    figures.put("overloadRefused503", over.get("refused"));
                    figures.put("overloadAcceptedP99Millis", over.get("p99Millis"));
                    figures.put("overloadRefusedP99Millis", over.get("refusedP99Millis"));
                }
                figures.put("statementsPerSubmission", countStatements(jdbc, pgLog, client, uri,
                        java.util.Arrays.copyOfRange(tokens, tokens.length - COUNTED, tokens.length)));
                try (Connection c = DriverManager.getConnection(jdbc, "postgres", "");
                     Statement s = c.createStatement();
                     ResultSet rs = s.executeQuery("SELECT count(*) FROM reported_result")) {
                    rs.next();
                    figures.put("resultRowsStored", rs.getLong(1));
                }
                String json = new ObjectMapper().writerWithDefaultPrettyPrinter().writeValueAsString(figures);
                Files.createDirectories(Path.of("."));
                Files.writeString(Path.of("submissions.json"), json);
                System.out.println("Submission surge: " + json);
            } finally {
                app.destroy();
                app.waitFor();
            }
        }
    }

    private static Map<String, Object> surge(int port, long roundId, String[] tokens) throws Exception {
        HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10)).build();
        URI uri = URI.create("http://127.0.0.1:" + port + "/api/v1/my-rounds/" + roundId + "/submission");
        // warm-up: 200 submissions (a quarter of a small run), not measured
        int warmUp = Math.min(200, tokens.length / 4);
        runSubmissions(client, uri, tokens, 0, warmUp);
        long start = System.nanoTime();
        long[] latencies = runSubmissions(client, uri, tokens, warmUp, tokens.length);
        double seconds = (System.nanoTime() - start) / 1e9;
        long[] sorted = Arrays.stream(latencies).filter(l -> l >= 0).sorted().toArray();
        int failures = (int) Arrays.stream(latencies).filter(l -> l < 0).count();
        Map<String, Object> figures = new LinkedHashMap<>();
        figures.put("laboratories", tokens.length);
        figures.put("resultsPerSubmission", ELEMENTS.size() * 2);
        figures.put("measuredSubmissions", latencies.length);
        figures.put("clients", CLIENTS);
        figures.put("seconds", round(seconds));
        figures.put("submissionsPerSecond", round(latencies.length / seconds));
        figures.put("resultsPerSecond", round(latencies.length * ELEMENTS.size() * 2 / seconds));
        figures.put("p50Millis", round(percentile(sorted, 0.50) / 1e6));
        figures.put("p99Millis", round(percentile(sorted, 0.99) / 1e6));
        figures.put("failures", failures);
        return figures;
    }

    /**
     * Open loop: submission i of [from, to) is due at start + i / rate whatever happened before it (no coordinated
     * omission); its latency is measured from that scheduled time to the answer. 503 answers are counted apart.
     */
    private static Map<String, Object> openLoop(HttpClient client, URI uri, String[] tokens, int from, int to, double rate)
            throws Exception {
        int n = to - from;
        long[] latencies = new long[n];
        int[] statuses = new int[n];
        ExecutorService pool = Executors.newFixedThreadPool(256);
        long start = System.nanoTime() + 200_000_000L;
        try {
            List<Future<?>> answers = new ArrayList<>();
            for (int k = 0; k < n; k++) {
                int index = k;
                long due = start + (long) (index * 1e9 / rate);
                answers.add(pool.submit(() -> {
                    long wait;
                    while ((wait = due - System.nanoTime()) > 0) {
                        java.util.concurrent.locks.LockSupport.parkNanos(wait);
                    }
                    int i = from + index;
                    HttpRequest request = HttpRequest.newBuilder(uri).timeout(Duration.ofSeconds(60))
                            .header("Authorization", "Bearer " + tokens[i]).header("Content-Type", "application/json")
                            .header("Idempotency-Key", "benchmark-" + i)
                            .POST(HttpRequest.BodyPublishers.ofString(payload(i))).build();
                    try {
                        statuses[index] = client.send(request, HttpResponse.BodyHandlers.ofString()).statusCode();
                    } catch (IOException | InterruptedException e) {
                        statuses[index] = -1;
                    }
                    latencies[index] = System.nanoTime() - due;
                    return null;
                }));
            }
            for (Future<?> answer : answers) {
                answer.get();
            }
        } finally {
            pool.shutdownNow();
        }
        List<Long> ok = new ArrayList<>();
        List<Long> refused = new ArrayList<>();
        int failures = 0;
        for (int k = 0; k < n; k++) {
            if (statuses[k] == 201) {
                ok.add(latencies[k]);
            } else if (statuses[k] == 503) {
                refused.add(latencies[k]);
            } else {
                failures++;
            }
        }
        long[] sortedOk = ok.stream().mapToLong(Long::longValue).sorted().toArray();
        long[] sortedRefused = refused.stream().mapToLong(Long::longValue).sorted().toArray();
        Map<String, Object> figures = new LinkedHashMap<>();
        figures.put("accepted", sortedOk.length);
        figures.put("refused", sortedRefused.length);
        figures.put("failures", failures);
        figures.put("p50Millis", round(percentile(sortedOk, 0.50) / 1e6));
        figures.put("p99Millis", round(percentile(sortedOk, 0.99) / 1e6));
        figures.put("refusedP99Millis", round(percentile(sortedRefused, 0.99) / 1e6));
        return figures;
    }

    /**
     * Statements per submission as the server saw them: the statement log switched on for {@link #COUNTED}
     * sequential submissions (steady state, rules kept), then each backend's logged statements counted, consecutive
     * executions of one statement in one backend counted once (a JDBC batch is sent in one go), transaction control
     * (BEGIN, COMMIT, ROLLBACK), the pool's empty validity checks and this benchmark's own connection left out. The
     * application's background pollers are off in this benchmark ({@link #startApplication}).
     */
    private static double countStatements(String jdbc, Path pgLog, HttpClient client, URI uri, String[] tokens)
            throws Exception {
        Path log = pgLog.resolve("postgresql.log");
        long from;
        int ownPid;
        try (Connection c = DriverManager.getConnection(jdbc, "postgres", ""); Statement s = c.createStatement()) {
            try (ResultSet rs = s.executeQuery("SELECT pg_backend_pid()")) {
                rs.next();
                ownPid = rs.getInt(1);
            }
            s.execute("ALTER SYSTEM SET log_statement = 'all'");
            s.execute("SELECT pg_reload_conf()");
            Thread.sleep(1000);
            from = Files.exists(log) ? Files.size(log) : 0;
            for (int i = 0; i < tokens.length; i++) {
                HttpResponse<String> answer = client.send(HttpRequest.newBuilder(uri).timeout(Duration.ofSeconds(60))
                        .header("Authorization", "Bearer " + tokens[i]).header("Content-Type", "application/json")
                        .POST(HttpRequest.BodyPublishers.ofString(payload(i))).build(), HttpResponse.BodyHandlers.ofString());
                if (answer.statusCode() != 201) {
                    throw new IllegalStateException("counted submission: " + answer.statusCode() + " " + answer.body());
                }
            }
            s.execute("ALTER SYSTEM RESET log_statement");
            s.execute("SELECT pg_reload_conf()");
        }
        Thread.sleep(1000);
        byte[] bytes = Files.readAllBytes(log);
        String text = new String(bytes, (int) from, bytes.length - (int) from, java.nio.charset.StandardCharsets.UTF_8);
        java.util.regex.Pattern line = java.util.regex.Pattern.compile("^(\\d+)\\s*LOG:  (?:statement|execute [^:]*): ?(.*)$");
        Map<Integer, String> last = new java.util.HashMap<>();
        int statements = 0;
        for (String l : text.split("\n")) {
            java.util.regex.Matcher m = line.matcher(l);
            if (!m.matches()) {
                continue;
            }
            int pid = Integer.parseInt(m.group(1));
            String sql = m.group(2).strip();
            String word = sql.isEmpty() ? "" : sql.split("\\s+")[0].toUpperCase(java.util.Locale.ROOT);
            if (pid == ownPid || sql.isEmpty() || List.of("BEGIN", "COMMIT", "ROLLBACK", "SET", "SHOW").contains(word)) {
                last.remove(pid);
                continue;
            }
            if (!sql.equals(last.get(pid))) {
                statements++;
            }
            last.put(pid, sql);
        }
        return round((double) statements / tokens.length);
    }

    /** Submits for laboratories [from, to); returns each latency in ns, or -1 for a failed submission. */
    private static long[] runSubmissions(HttpClient client, URI uri, String[] tokens, int from, int to) throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(CLIENTS);
        AtomicInteger next = new AtomicInteger(from);
        long[] latencies = new long[to - from];
        try {
            List<Future<?>> workers = new ArrayList<>();
            for (int w = 0; w < CLIENTS; w++) {
                workers.add(pool.submit(() -> {
                    int i;
                    while ((i = next.getAndIncrement()) < to) {
                        HttpRequest request = HttpRequest.newBuilder(uri).timeout(Duration.ofSeconds(60))
                                .header("Authorization", "Bearer " + tokens[i]).header("Content-Type", "application/json")
                                .header("Idempotency-Key", "benchmark-" + i)
                                .POST(HttpRequest.BodyPublishers.ofString(payload(i))).build();
                        long t0 = System.nanoTime();
                        try {
                            HttpResponse<String> response = client.send(request, HttpResponse.BodyHandlers.ofString());
                            latencies[i - from] = response.statusCode() == 201 ? System.nanoTime() - t0 : -1;
                            if (response.statusCode() != 201 && i % 100 == 0) {
                                System.err.println("submission " + i + ": " + response.statusCode() + " " + response.body());
                            }
                        } catch (IOException | InterruptedException e) {
                            latencies[i - from] = -1;
                        }
                    }
                    return null;
                }));
            }
            for (Future<?> worker : workers) {
                worker.get();
            }
        } finally {
            pool.shutdownNow();
        }
        return latencies;
    }

    /** 100 results in % with two decimals inside the expected range, U and k, a method and replicates. */
    static String payload(int laboratory) {
        StringBuilder json = new StringBuilder("{\"results\":[");
        for (int e = 0; e < ELEMENTS.size(); e++) {
            for (String item : List.of("A", "B")) {
                if (json.charAt(json.length() - 1) != '[') {
                    json.append(',');
                }
                int hundredths = 100 + (laboratory * 7 + e * 13 + (item.equals("B") ? 5 : 0)) % 50;
                json.append("{\"measurand\":\"").append(ELEMENTS.get(e)).append("\",\"item\":\"").append(item)
                        .append("\",\"value\":\"").append(hundredths / 100).append('.').append(String.format("%02d", hundredths % 100))
                        .append("\",\"unit\":\"%\",\"expandedUncertainty\":\"0.05\",\"coverageFactor\":\"2\",")
                        .append("\"method\":\"spark-oes\",\"replicates\":2}");
            }
        }
        return json.append("]}").toString();
    }

    private static long setUpRound(Connection c) throws Exception {
        long scheme;
        try (PreparedStatement s = c.prepareStatement(
                "INSERT INTO scheme (name, material_family, created_at) VALUES ('Benchmark scheme', 'OTHER', now()) RETURNING id")) {
            ResultSet rs = s.executeQuery();
            rs.next();
            scheme = rs.getLong(1);
        }
        List<Measurand> catalogue = new ArrayList<>();
        List<EvaluationPlan.MeasurandPlan> plans = new ArrayList<>();
        try (PreparedStatement s = c.prepareStatement("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, "
                + "expected_min, expected_max, method_groups) VALUES (?, ?, '%', 2, 0.5, 2.0, 'SPARK_OES,XRF')")) {
            for (String element : ELEMENTS) {
                s.setLong(1, scheme);
                s.setString(2, element);
                s.addBatch();
                Measurand m = new Measurand();
                m.element = element;
                m.unit = "%";
                m.reportingDigits = 2;
                m.methodGroups = "SPARK_OES,XRF";
                catalogue.add(m);
                plans.add(new EvaluationPlan.MeasurandPlan(element, "CONSENSUS_ALL", null, null, null, null, null, "FIXED",
                        "0.05", null, null, null, null, null, null, null, null, null, null, null, null));
            }
            s.executeBatch();
        }
        PlanDocument.Canonical plan = PlanDocument.canonical(new EvaluationPlan(plans), catalogue,
                new PlanDocument.RoundSettings("BENCH-1", Round.LatePolicy.REFUSE, Round.CodeScope.ROUND), new ObjectMapper());
        long round;
        try (PreparedStatement s = c.prepareStatement("INSERT INTO round (scheme_id, code, item_description, items_per_laboratory, "
                + "item_labels, dispatch_date, result_deadline, deadline_time_zone, instructions, late_policy, state, "
                + "state_changed_at, created_at) VALUES (?, 'BENCH-1', 'Benchmark pair', 2, 'A,B', current_date, "
                + "now() + interval '1 day', 'UTC', 'Benchmark', 'REFUSE', 'OPEN_FOR_RESULTS', now(), now()) RETURNING id")) {
            s.setLong(1, scheme);
            ResultSet rs = s.executeQuery();
            rs.next();
            round = rs.getLong(1);
        }
        try (PreparedStatement s = c.prepareStatement("INSERT INTO evaluation_plan (round_id, plan_version, canonical_json, "
                + "sha256, reason, frozen_by, frozen_at) VALUES (?, 1, ?, ?, 'Benchmark', 'benchmark', now())")) {
            s.setLong(1, round);
            s.setString(2, plan.json());
            s.setString(3, plan.sha256());
            s.executeUpdate();
        }
        return round;
    }

    private static String[] setUpLaboratories(Connection c, long roundId, int count) throws Exception {
        String[] tokens = new String[count];
        c.setAutoCommit(false);
        long creator;
        try (Statement s = c.createStatement()) {
            s.executeUpdate("INSERT INTO laboratory (name, organisation, country) "
                    + "SELECT 'Lab ' || g, 'Benchmark org ' || g, 'DE' FROM generate_series(1, " + count + ") g");
            ResultSet rs = s.executeQuery("INSERT INTO app_user (username, display_name, role, laboratory_id) "
                    + "SELECT 'bench-creator', 'benchmark', 'lab-manager', min(id) FROM laboratory RETURNING id");
            rs.next();
            creator = rs.getLong(1);
        }
        List<Long> labs = new ArrayList<>();
        try (Statement s = c.createStatement(); ResultSet rs = s.executeQuery("SELECT id FROM laboratory ORDER BY id")) {
            while (rs.next()) {
                labs.add(rs.getLong(1));
            }
        }
        Set<String> codes = new HashSet<>();
        try (PreparedStatement participant = c.prepareStatement("INSERT INTO round_participant (round_id, laboratory_id, "
                + "participant_code, enrolled_at, enrolled_by) VALUES (?, ?, ?, now(), 'benchmark')");
             PreparedStatement token = c.prepareStatement("INSERT INTO api_token (laboratory_id, name, token_hash, "
                     + "token_prefix, created_by, created_at) VALUES (?, 'bench', ?, ?, ?, now())")) {
            for (int i = 0; i < labs.size(); i++) {
                participant.setLong(1, roundId);
                participant.setLong(2, labs.get(i));
                participant.setString(3, ParticipantCodes.draw(codes));
                participant.addBatch();
                tokens[i] = "rt_" + Secrets.randomToken(32);
                token.setLong(1, labs.get(i));
                token.setString(2, Secrets.sha256Hex(tokens[i]));
                token.setString(3, tokens[i].substring(0, 10));
                token.setLong(4, creator);
                token.addBatch();
            }
            participant.executeBatch();
            token.executeBatch();
        }
        c.commit();
        return tokens;
    }

    private static Process startApplication(Path jar, String jdbc, int port, Path work) throws IOException {
        ProcessBuilder builder = new ProcessBuilder("java", "-Xmx1g", "-jar", jar.toString());
        Map<String, String> env = builder.environment();
        env.put("DB_URL", jdbc.replaceAll("\\?.*$", ""));
        env.put("DB_USER", "postgres");
        env.put("DB_PASSWORD", "");
        env.put("PORT", Integer.toString(port));
        env.put("QUARKUS_HTTP_AUTH_SESSION_ENCRYPTION_KEY", Secrets.randomToken(32));
        env.put("ROUNDTABLE_SECURE_COOKIES", "false");
        env.put("DB_POOL_SIZE", "20");
        // no background pollers: the statement count sees the submissions alone
        env.put("ROUNDTABLE_JOBS_POLL_INTERVAL", "off");
        env.put("ROUNDTABLE_NOTICES_CHECK_INTERVAL", "off");
        builder.redirectErrorStream(true).redirectOutput(work.resolve("app.log").toFile());
        System.out.println("Application log: " + work.resolve("app.log"));
        return builder.start();
    }

    private static void waitUntilReady(int port) throws Exception {
        HttpClient client = HttpClient.newHttpClient();
        long deadline = System.nanoTime() + Duration.ofSeconds(120).toNanos();
        while (System.nanoTime() < deadline) {
            try {
                HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port + "/q/health/ready"))
                        .build(), HttpResponse.BodyHandlers.ofString());
                if (r.statusCode() == 200) {
                    return;
                }
            } catch (IOException ignored) {
                // not up yet
            }
            Thread.sleep(500);
        }
        throw new IllegalStateException("the application did not become ready within 120 s");
    }

    private static int freePort() throws IOException {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }

    private static double percentile(long[] sorted, double q) {
        if (sorted.length == 0) {
            return Double.NaN;
        }
        return sorted[Math.min(sorted.length - 1, (int) Math.ceil(q * sorted.length) - 1)];
    }

    private static double round(double value) {
        return Math.round(value * 100.0) / 100.0;
    }
}
