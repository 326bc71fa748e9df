package org.roundtable.coordinator.benchmark;

import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.flywaydb.core.Flyway;
import org.postgresql.PGConnection;
import org.postgresql.copy.PGCopyOutputStream;
import org.roundtable.audit.AuditChain;
import org.roundtable.audit.AuditEntry;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.evaluation.RoundEvaluator;
import org.roundtable.evaluation.benchmark.EvaluationBenchmark;
import org.roundtable.history.HistoryBenchmark;
import org.roundtable.platform.EmbeddedDatabase;
import org.roundtable.platform.Secrets;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Server time and HTML size of the coordinator's pages that grow with a round (issue 19): a round of
 * {@code bench.laboratories} (10,000) laboratories × {@code bench.measurands} (50) measurands and an audit trail of
 * {@code bench.auditEntries} (1,000,000) entries. Targets: each page < 300 ms and < 300 KB.
 *
 * <p>Starts an embedded PostgreSQL 17, runs the real migrations, and generates (not timed; COPY and set-based SQL)
 * the state the pages read: the round of {@link EvaluationBenchmark#generate} (enrolled laboratories with participant
 * codes, one submission each, the results; 1 % late), one item dispatched to each laboratory, an evaluation run
 * made by the server's own evaluation code ({@link RoundEvaluator}, as the job runs it), a hash chain of audit
 * entries computed with the production hashing ({@link AuditChain#entryHash}) with the checkpoint a view of the audit
 * page had left, and a coordinator with a session. Then it starts the packaged application
 * ({@code target/quarkus-app/quarkus-run.jar}) on that database and times each page from loopback: the request sent
 * to the last byte of the answer read (server time plus loopback), 20 warm-ups (the JIT compiler settles), median
 * of 15, one client at a time;
 * and, for the 15 timed requests, the CPU time the application's process ({@code serverCpuMillis}) and PostgreSQL's
 * processes ({@code databaseCpuMillis}) used per request, from {@code /proc}: on a shared machine the wall-clock time
 * waits for the cores, the CPU time much less.
 *
 * <p>With the argument {@code history} (execution {@code run-history-pages-benchmark}, {@code -Dbench.only=history-pages})
 * it times the history page and the field view of issue 18 instead, on a database of their own
 * ({@link #historyPages}).
 *
 * <p>Writes {@code pages.json} in the working directory ({@code target/benchmarks} under {@code -Pbenchmark}): a list
 * of {@code {name, serverMillis, htmlKiB}} with the path, the fastest and slowest run and the load average.
 */
public final class PagesBenchmark {

    static final int LABORATORIES = Integer.getInteger("bench.laboratories", 10_000);
    static final int MEASURANDS = Integer.getInteger("bench.pageMeasurands", 50);
    static final int AUDIT_ENTRIES = Integer.getInteger("bench.auditEntries", 1_000_000);
    static final int WARM_UPS = Integer.getInteger("bench.pageWarmUps", 20);
    static final int RUNS = 15;
    /** Timed runs of each history page (more than {@link #RUNS}, so that the p95 is not simply the slowest run). */
    static final int HISTORY_RUNS = Integer.getInteger("bench.historyRuns", 40);
    static final String USERNAME = "bench-coordinator";

    private PagesBenchmark() {
    }

    /** One page to time: its name in the output and its address. */
    record Page(String name, String path, String marker) {
    }

    public static void main(String[] args) throws Exception {
        Path jar = Path.of(System.getProperty("bench.jar", "../quarkus-app/quarkus-run.jar")).toAbsolutePath();
        if (!Files.exists(jar)) {
            throw new IllegalStateException("package the application first: " + jar);
        }
        if (args.length > 0 && args[0].equals("history")) {
            historyPages(jar);
            return;
        }
        Path work = Files.createTempDirectory("roundtable-pages-bench");
        int dbPort = freePort();
        try (EmbeddedPostgres postgres = EmbeddedDatabase.start(work.resolve("pg"), dbPort)) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            Flyway.configure().dataSource(jdbc, "postgres", "").locations("classpath:db/migration")
                    .placeholders(Map.of("appRole", "roundtable_app")).load().migrate();
            long start = System.nanoTime();
            EvaluationBenchmark.Generated round;
            String token;
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                c.setAutoCommit(false);
                round = EvaluationBenchmark.generate(c, "PAGES-1", LABORATORIES, MEASURANDS, 19);
                dispatchItems(c, round.roundId());
                c.commit();
                token = coordinatorSession(c);
                c.commit();
            }
            System.out.printf("Round of %,d results generated in %.1f s%n", round.results(), (System.nanoTime() - start) / 1e9);
            EvaluationService service = new EvaluationService(null, null, null, null, Clock.systemUTC(), "benchmark", null);
            RoundEvaluator.Result run = EvaluationBenchmark.evaluate(jdbc, service, round);
            System.out.printf("Evaluation version %d: %,d scores (%.1f s so far)%n", run.version(), run.scores(),
                    (System.nanoTime() - start) / 1e9);
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                c.setAutoCommit(false);
                auditTrail(c, AUDIT_ENTRIES);
                c.commit();
                c.setAutoCommit(true);
                try (Statement s = c.createStatement()) {
                    s.execute("VACUUM ANALYZE");
                }
            }
            System.out.printf("Audit trail of %,d entries written; all data in %.1f s%n", AUDIT_ENTRIES,
                    (System.nanoTime() - start) / 1e9);

            int port = freePort();
            Process app = startApplication(jar, jdbc, port, work);
            try {
                waitUntilReady(port);
                HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10))
                        .followRedirects(HttpClient.Redirect.NEVER).build();
                String base = "http://127.0.0.1:" + port;
                long r = round.roundId();
                String version = "/rounds/" + r + "/evaluation/" + run.version();
                String measurand = firstMeasurandLink(client, base, version, token);
                List<Page> pages = new ArrayList<>(List.of(
                        new Page("evaluation version page", version, "evaluation version"),
                        new Page("round page", "/rounds/" + r, "PAGES-1"),
                        new Page("submissions page", "/rounds/" + r + "/submissions", "PAGES-1"),
                        new Page("audit page", "/audit", "audit-entries")));
                // further pages that grow with the round, beside the four of the issue
                if (measurand != null) {
                    pages.add(new Page("evaluation measurand page", measurand, "PAGES-1"));
                }
                pages.add(new Page("round page, laboratory search", "/rounds/" + r + "?find=lab+12", "PAGES-1"));
                pages.add(new Page("round page, participants page 100", "/rounds/" + r + "?participants=100", "PAGES-1"));
                pages.add(new Page("submissions page, search", "/rounds/" + r + "/submissions?q=lab+12", "PAGES-1"));
                pages.add(new Page("plan page", "/rounds/" + r + "/plan", "PAGES-1"));
                pages.add(new Page("coordinator home", "/coordinator", "What needs you"));
                pages.add(new Page("audit page, older entries", "/audit?before=500000", "audit-entries"));
                List<Map<String, Object>> figures = new ArrayList<>();
                for (Page page : pages) {
                    figures.add(time(client, base, page, token, app.pid(), postmasterPid(work.resolve("pg")), RUNS));
                }
                write(figures);
            } finally {
                app.destroy();
                app.waitFor();
            }
        } finally {
            deleteRecursively(work);
        }
    }

    /**
     * The history part (issue 18), alone on its own database: the history tables of {@link HistoryBenchmark#fill} (one
     * scheme of {@link HistoryBenchmark#LABS} laboratories × {@link HistoryBenchmark#ROUNDS} rounds × 15 measurands),
     * the laboratories they name, and a coordinator; then "history page" (a laboratory's 600 results with their charts,
     * {@code /laboratories/{id}/history}) and "field view" ({@code /schemes/1/field}) timed end to end as the other
     * pages, {@link #HISTORY_RUNS} runs each. Replaces its entries in {@code pages.json}, keeping the others.
     */
    private static void historyPages(Path jar) throws Exception {
        Path work = Files.createTempDirectory("roundtable-history-pages-bench");
        int dbPort = freePort();
        try (EmbeddedPostgres postgres = EmbeddedDatabase.start(work.resolve("pg"), dbPort)) {
            String jdbc = postgres.getJdbcUrl("postgres", "postgres");
            Flyway.configure().dataSource(jdbc, "postgres", "").locations("classpath:db/migration")
                    .placeholders(Map.of("appRole", "roundtable_app")).load().migrate();
            long start = System.nanoTime();
            String token;
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                c.setAutoCommit(false);
                try (Statement s = c.createStatement()) {
                    // ids 1 to LABS in a new database: the laboratories the history's scores name
                    s.execute("INSERT INTO laboratory (name, organisation, country) SELECT 'Laboratory ' || l, "
                            + "'Benchmark organisation', 'DE' FROM generate_series(1, " + HistoryBenchmark.LABS + ") l");
                }
                token = coordinatorSession(c);
                c.commit();
                HistoryBenchmark.fill(c);
            }
            System.out.printf("History of %,d laboratories x %d rounds x 15 measurands filled in %.1f s%n",
                    HistoryBenchmark.LABS, HistoryBenchmark.ROUNDS, (System.nanoTime() - start) / 1e9);
            int port = freePort();
            Process app = startApplication(jar, jdbc, port, work);
            try {
                waitUntilReady(port);
                HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(10))
                        .followRedirects(HttpClient.Redirect.NEVER).build();
                String base = "http://127.0.0.1:" + port;
                long lab = HistoryBenchmark.LABS / 2;
                List<Page> pages = List.of(
                        new Page("history page", "/laboratories/" + lab + "/history", "Laboratory " + lab),
                        new Page("field view", "/schemes/1/field", HistoryBenchmark.SCHEME_NAME));
                List<Map<String, Object>> figures = new ArrayList<>();
                for (Page page : pages) {
                    figures.add(time(client, base, page, token, app.pid(), postmasterPid(work.resolve("pg")), HISTORY_RUNS));
                }
                write(figures);
            } finally {
                app.destroy();
                app.waitFor();
            }
        } finally {
            deleteRecursively(work);
        }
    }

    /** Writes the figures into {@code pages.json}, replacing entries of the same name and keeping the others. */
    @SuppressWarnings("unchecked")
    private static void write(List<Map<String, Object>> figures) throws IOException {
        ObjectMapper mapper = new ObjectMapper();
        Path file = Path.of("pages.json");
        List<Map<String, Object>> all = new ArrayList<>();
        if (Files.exists(file)) {
            List<String> names = figures.stream().map(f -> (String) f.get("name")).toList();
            for (Map<String, Object> old : (List<Map<String, Object>>) mapper.readValue(file.toFile(), List.class)) {
                if (!names.contains(old.get("name"))) {
                    all.add(old);
                }
            }
        }
        all.addAll(figures);
        String json = mapper.writerWithDefaultPrettyPrinter().writeValueAsString(all);
        Files.writeString(file, json);
        System.out.println("Pages: " + mapper.writerWithDefaultPrettyPrinter().writeValueAsString(figures));
        for (Map<String, Object> f : figures) {
            System.out.printf("%-36s %8.1f ms (p95 %6.1f; CPU %6.1f + %6.1f ms) %8.1f KiB%s%n", f.get("name"),
                    (Double) f.get("serverMillis"), (Double) f.get("p95Millis"), (Double) f.get("serverCpuMillis"),
                    (Double) f.get("databaseCpuMillis"), (Double) f.get("htmlKiB"), ((Double) f.get("serverMillis")) < 300
                            && ((Double) f.get("htmlKiB")) < 300 ? "" : "   (misses the target)");
        }
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

    /** Times one page: warm-ups, then the median of the runs; fails when the page does not answer 200. */
    private static Map<String, Object> time(HttpClient client, String base, Page page, String token, long appPid,
                                            long postmaster, int runs) throws Exception {
        double[] millis = new double[runs];
        int bytes = 0;
        double appCpu = 0;
        double databaseCpu = 0;
        for (int i = -WARM_UPS; i < runs; i++) {
            if (i == 0) {
                appCpu = cpuMillis(appPid);
                databaseCpu = cpuMillisWithChildren(postmaster);
            }
            HttpRequest request = HttpRequest.newBuilder(URI.create(base + page.path())).timeout(Duration.ofSeconds(120))
                    .header("Cookie", "rt_session=" + token).GET().build();
            long t0 = System.nanoTime();
            HttpResponse<byte[]> answer = client.send(request, HttpResponse.BodyHandlers.ofByteArray());
            double ms = (System.nanoTime() - t0) / 1e6;
            if (answer.statusCode() != 200) {
                throw new IllegalStateException(page.path() + " answered " + answer.statusCode() + ": "
                        + new String(answer.body(), StandardCharsets.UTF_8));
            }
            String html = new String(answer.body(), StandardCharsets.UTF_8);
            if (!html.contains(page.marker())) {
                throw new IllegalStateException(page.path() + " does not show " + page.marker());
            }
            bytes = answer.body().length;
            if (i == runs - 1 && Boolean.getBoolean("bench.keepHtml")) {
                // -Dbench.keepHtml=true: the last answer of each page beside pages.json, to see where its size goes
                Files.write(Path.of(page.name().replaceAll("[^A-Za-z0-9]+", "-") + ".html"), answer.body());
            }
            if (i >= 0) {
                millis[i] = ms;
            }
        }
        double[] sorted = millis.clone();
        Arrays.sort(sorted);
        Map<String, Object> f = new LinkedHashMap<>();
        f.put("name", page.name());
        f.put("serverMillis", round(sorted[sorted.length / 2]));
        f.put("htmlKiB", round(bytes / 1024.0));
        f.put("path", page.path());
        f.put("minMillis", round(sorted[0]));
        f.put("maxMillis", round(sorted[sorted.length - 1]));
        // nearest rank (with 15 runs the slowest)
        f.put("p95Millis", round(sorted[(int) Math.ceil(0.95 * runs) - 1]));
        f.put("runs", runs);
        f.put("serverCpuMillis", round((cpuMillis(appPid) - appCpu) / runs));
        f.put("databaseCpuMillis", round((cpuMillisWithChildren(postmaster) - databaseCpu) / runs));
        f.put("loadAverage", round(ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage()));
        System.out.printf("%s: %.1f ms, %.1f KiB%n", page.name(), sorted[sorted.length / 2], bytes / 1024.0);
        return f;
    }

    /** CPU time (user + system) a process has used so far, from {@code /proc} (Linux; 0 elsewhere). */
    static double cpuMillis(long pid) {
        try {
            String stat = Files.readString(Path.of("/proc/" + pid + "/stat"));
            String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
            // fields 14 and 15 of stat (utime, stime), in clock ticks of 10 ms
            return (Long.parseLong(f[11]) + Long.parseLong(f[12])) * 10.0;
        } catch (IOException | RuntimeException e) {
            return 0;
        }
    }

    /** CPU time of a process and of its children now running (the PostgreSQL postmaster and its backends). */
    static double cpuMillisWithChildren(long pid) {
        double total = cpuMillis(pid);
        try (var procs = Files.list(Path.of("/proc"))) {
            for (Path p : procs.filter(x -> x.getFileName().toString().matches("\\d+")).toList()) {
                try {
                    String stat = Files.readString(p.resolve("stat"));
                    String[] f = stat.substring(stat.lastIndexOf(')') + 2).split(" ");
                    if (Long.parseLong(f[1]) == pid) {
                        total += (Long.parseLong(f[11]) + Long.parseLong(f[12])) * 10.0;
                    }
                } catch (IOException | RuntimeException e) {
                    // a process that just ended
                }
            }
        } catch (IOException e) {
            return total;
        }
        return total;
    }

    /** The postmaster's process id from its pid file in the data folder. */
    static long postmasterPid(Path dataDir) {
        try {
            return Long.parseLong(Files.readAllLines(dataDir.resolve("postmaster.pid")).get(0).strip());
        } catch (IOException | RuntimeException e) {
            return -1;
        }
    }

    /** The address of the first measurand page the version page links. */
    private static String firstMeasurandLink(HttpClient client, String base, String version, String token)
            throws Exception {
        HttpResponse<String> answer = client.send(HttpRequest.newBuilder(URI.create(base + version))
                .header("Cookie", "rt_session=" + token).build(), HttpResponse.BodyHandlers.ofString());
        Matcher m = Pattern.compile("href=\"(" + Pattern.quote(version) + "/measurands/[^\"#?]+)\"").matcher(answer.body());
        return m.find() ? m.group(1) : null;
    }

    /** One item (label A) dispatched to every enrolled laboratory, as dispatching the items writes them. */
    private static void dispatchItems(Connection c, long roundId) throws Exception {
        try (PreparedStatement s = c.prepareStatement("""
                INSERT INTO item_dispatch (round_id, laboratory_id, item_label, status, dispatched_at)
                SELECT round_id, laboratory_id, 'A', 'DISPATCHED', now() - interval '20 days'
                  FROM round_participant WHERE round_id = ?
                """)) {
            s.setLong(1, roundId);
            s.executeUpdate();
        }
    }

    /** A coordinator and a signed-in session of theirs; returns the session cookie's token. */
    private static String coordinatorSession(Connection c) throws Exception {
        long user;
        try (PreparedStatement s = c.prepareStatement("INSERT INTO app_user (username, display_name, role) "
                + "VALUES (?, 'Benchmark coordinator', 'coordinator') RETURNING id")) {
            s.setString(1, USERNAME);
            ResultSet rs = s.executeQuery();
            rs.next();
            user = rs.getLong(1);
        }
        String token = Secrets.randomToken(32);
        try (PreparedStatement s = c.prepareStatement("INSERT INTO user_session (token_hash, user_id, created_at, "
                + "last_seen_at, expires_at) VALUES (?, ?, now(), now(), now() + interval '1 day')")) {
            s.setString(1, Secrets.sha256Hex(token));
            s.setLong(2, user);
            s.executeUpdate();
        }
        return token;
    }

    /**
     * {@code count} audit entries of a few kinds by a few hundred actors, chained with the production hashing and
     * written with COPY, and the checkpoint that verifying all but the last 1,000 of them left.
     */
    static void auditTrail(Connection c, int count) throws Exception {
        String[][] kinds = {
                {"submission.revision-accepted", "submission", "lab-member"},
                {"submission.revision-accepted", "submission", "lab-manager"},
                {"item.received", "item-dispatch", "lab-member"},
                {"notice.read", "notice", "lab-member"},
                {"round.enrolled", "round", "coordinator"},
                {"session.signed-in", "user", "lab-member"},
                {"evaluation.run", "evaluation-run", "coordinator"},
                {"report.issued", "issued-document", "coordinator"}};
        DateTimeFormatter copyTime = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss.SSSSSSxxx").withZone(ZoneOffset.UTC);
        Instant t0 = Instant.parse("2025-01-01T00:00:00Z");
        String previous = AuditChain.GENESIS;
        String checkpointHash = null;
        int checkpointAt = Math.max(0, count - 1_000);
        try (PGCopyOutputStream copy = new PGCopyOutputStream(c.unwrap(PGConnection.class), """
                COPY audit_event (sequence_no, occurred_at, actor, actor_role, laboratory_id, action, object_type,
                    object_id, before_hash, after_hash, detail, request_id, previous_hash, entry_hash) FROM STDIN
                """, 1 << 16)) {
            StringBuilder line = new StringBuilder(512);
            for (int i = 1; i <= count; i++) {
                String[] kind = kinds[i % kinds.length];
                boolean lab = kind[2].startsWith("lab");
                Long laboratory = lab ? (long) (1 + i % LABORATORIES) : null;
                String actor = lab ? "lab" + (i % 400) + ".member" : "coordinator" + (i % 3);
                Instant at = AuditChain.storedPrecision(t0.plusMillis(i * 29L));
                String after = Secrets.sha256Hex("after " + i);
                AuditEntry unsigned = new AuditEntry(i, at, actor, kind[2], laboratory, kind[0], kind[1],
                        Integer.toString(i % 20_000), null, after, "round=1 laboratory=" + laboratory + " revision=1",
                        "req-" + i, previous, null);
                String hash = AuditChain.entryHash(unsigned);
                line.setLength(0);
                line.append(i).append('\t').append(copyTime.format(at)).append('\t').append(actor).append('\t')
                        .append(kind[2]).append('\t').append(laboratory == null ? "\\N" : laboratory.toString())
                        .append('\t').append(kind[0]).append('\t').append(kind[1]).append('\t')
                        .append(unsigned.objectId()).append("\t\\N\t").append(after).append('\t')
                        .append(unsigned.detail()).append('\t').append(unsigned.requestId()).append('\t')
                        .append(previous).append('\t').append(hash).append('\n');
                copy.write(line.toString().getBytes(StandardCharsets.UTF_8));
                previous = hash;
                if (i == checkpointAt) {
                    checkpointHash = hash;
                }
            }
        }
        if (checkpointHash != null) {
            try (PreparedStatement s = c.prepareStatement("INSERT INTO audit_checkpoint (verified_to, head_hash, "
                    + "full_check, intact, checked_by, checked_at) VALUES (?, ?, false, true, ?, ?)")) {
                s.setLong(1, checkpointAt);
                s.setString(2, checkpointHash);
                s.setString(3, USERNAME);
                s.setObject(4, OffsetDateTime.now(ZoneOffset.UTC));
                s.executeUpdate();
            }
        }
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
        // the benchmark's coordinator signs in with a password alone
        env.put("ROUNDTABLE_TWO_STEP_REQUIRED_ROLES", "admin");
        // no background work while pages are timed
        env.put("ROUNDTABLE_JOBS_POLL_INTERVAL", "off");
        env.put("ROUNDTABLE_NOTICES_CHECK_INTERVAL", "off");
        builder.redirectErrorStream(true).redirectOutput(work.resolve("app.log").toFile());
        System.out.println("Application log: " + work.resolve("app.log"));
        return builder.start();
    }

    private static void waitUntilReady(int port) throws Exception {
        HttpClient client = HttpClient.newHttpClient();
        long deadline = System.nanoTime() + Duration.ofSeconds(180).toNanos();
        while (System.nanoTime() < deadline) {
            try {
                HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + port
                        + "/q/health/ready")).build(), HttpResponse.BodyHandlers.ofString());
                if (r.statusCode() == 200) {
                    return;
                }
            } catch (IOException ignored) {
                // not up yet
            }
            Thread.sleep(500);
        }
        throw new IllegalStateException("the application did not become ready within 180 s");
    }

    private static int freePort() throws IOException {
        try (ServerSocket socket = new ServerSocket(0)) {
            return socket.getLocalPort();
        }
    }

    private static double round(double value) {
        return Math.round(value * 10.0) / 10.0;
    }
}
