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
 * tokens with set-based SQL, then measures. Writes {@code target/benchmarks/submissions.json}. Bounded in count and
 * time; all traffic stays on 127.0.0.1.
 */
public final class SubmissionThroughputBenchmark {

    static final int LABORATORIES = Integer.getInteger("bench.laboratories", 10_000);
    static final int CLIENTS = Integer.getInteger("bench.clients", 16);
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
        try (EmbeddedPostgres postgres = EmbeddedPostgres.builder().setDataDirectory(work.resolve("pg"))
                .setServerConfig("fsync", "on").setServerConfig("synchronous_commit", "on").start()) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            int port = freePort();
            Process app = startApplication(jar, jdbc, port, work);
            try {
                waitUntilReady(port);
                String[] tokens;
                long roundId;
                try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                    roundId = setUpRound(c);
                    tokens = setUpLaboratories(c, roundId);
                }
                Map<String, Object> figures = surge(port, roundId, tokens);
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
        // warm-up: 200 submissions, not measured
        runSubmissions(client, uri, tokens, 0, Math.min(200, tokens.length));
        long start = System.nanoTime();
        long[] latencies = runSubmissions(client, uri, tokens, Math.min(200, tokens.length), tokens.length);
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

    private static String[] setUpLaboratories(Connection c, long roundId) throws Exception {
        String[] tokens = new String[LABORATORIES];
        c.setAutoCommit(false);
        long creator;
        try (Statement s = c.createStatement()) {
            s.executeUpdate("INSERT INTO laboratory (name, organisation, country) "
                    + "SELECT 'Lab ' || g, 'Benchmark org ' || g, 'DE' FROM generate_series(1, " + LABORATORIES + ") g");
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
