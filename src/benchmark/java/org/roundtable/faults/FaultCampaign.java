package org.roundtable.faults;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.roundtable.testing.PackagedServer;
import org.roundtable.testing.ServerData;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;

/**
 * The fault campaign of issue 13, against the packaged jar on loopback (run by {@code mvn -Pbenchmark verify};
 * alone: {@code mvn -o -Pbenchmark test-compile exec:exec@run-fault-campaign}).
 *
 * <p>A LIMS load (laboratories submitting through the JSON API with an API token and an {@code Idempotency-Key},
 * retrying the same key after a refused connection, a 503 or any other failure until a receipt comes) runs
 * throughout, and the client keeps a ledger of every receipt. Faults:
 * <ol>
 *   <li>with the embedded PostgreSQL (no {@code DB_URL}): {@code faults.serverKills} (default 10) times
 *       {@code kill -9} of the server, which the harness starts again at once (the new server first stops the
 *       PostgreSQL the killed one left running); then one {@code kill -9} of the embedded PostgreSQL's postmaster
 *       (the server's watch starts it again);</li>
 *   <li>with an external PostgreSQL ({@code DB_URL}; a second embedded PostgreSQL plays it): one restart of that
 *       PostgreSQL (stopped, then started again at once on the same data and port).</li>
 * </ol>
 * The server runs as {@code rounds-demo/start.sh} runs it with respect to start time: the first start writes a
 * class-data archive when it stops, every later start maps it.
 * Recovery of a fault is the time from the fault to the first receipt of a request sent after it. Afterwards the
 * database is compared with the ledger. Writes {@code faults.json} in the working directory (target/benchmarks):
 * {@code acknowledged} (receipts in the ledger), {@code stored} (revisions in the database), {@code duplicates}
 * (revisions beyond the first with the same laboratory and payload: a retry stored twice), {@code lost} (ledger
 * receipts missing in the database), {@code maxRecoverySeconds}, {@code non503ServerErrors} and more.
 */
public final class FaultCampaign {

    static final int SERVER_KILLS = Integer.getInteger("faults.serverKills", 10);
    static final int WORKERS = Integer.getInteger("faults.workers", 6);
    static final int LABS_PER_WORKER = 4;
    /** Receipts between two faults, and at least this long, so that each fault hits a server under load. */
    static final int STEADY_RECEIPTS = 30;
    static final Duration STEADY = Duration.ofSeconds(3);
    static final Duration RECOVERY_LIMIT = Duration.ofSeconds(180);

    private static final ObjectMapper JSON = new ObjectMapper();

    /** One receipt: the key sent, the receipt id, when the acknowledged attempt was sent and answered. */
    record Receipt(String key, String receiptId, long sentNanos, long answeredNanos) {
    }

    /** A fault and its recovery. */
    record Fault(String kind, double recoverySeconds, String loadAverage) {
    }

    /** The machine's load averages (1, 5, 15 min) when a fault is made: recovery is mostly a start under this load. */
    static String loadAverage() {
        try {
            String[] parts = Files.readString(Path.of("/proc/loadavg")).split(" ");
            return parts[0] + " " + parts[1] + " " + parts[2];
        } catch (IOException e) {
            return "";
        }
    }

    private final HttpClient http = HttpClient.newBuilder().version(HttpClient.Version.HTTP_1_1)
            .connectTimeout(Duration.ofSeconds(2)).build();
    private final ConcurrentLinkedQueue<Receipt> ledger = new ConcurrentLinkedQueue<>();
    private final AtomicLong lastAnswer = new AtomicLong();
    private final AtomicInteger refused503 = new AtomicInteger();
    private final AtomicInteger otherServerErrors = new AtomicInteger();
    private final AtomicInteger clientErrors = new AtomicInteger();
    private final AtomicInteger connectionFailures = new AtomicInteger();
    private final AtomicInteger inDoubt = new AtomicInteger();
    private final Map<Integer, AtomicInteger> statuses = new ConcurrentHashMap<>();
    private final List<String> serverErrorSamples = java.util.Collections.synchronizedList(new ArrayList<>());
    private final List<Fault> faults = new ArrayList<>();
    private long acknowledged;
    private long stored;
    private long duplicates;
    private long lost;

    private FaultCampaign() {
    }

    public static void main(String[] args) throws Exception {
        long started = System.nanoTime();
        Path work = Files.createTempDirectory("roundtable-faults");
        System.out.println("Fault campaign: logs in " + work);
        FaultCampaign campaign = new FaultCampaign();
        campaign.embeddedPhase(work);
        campaign.externalPhase(work);
        // the logs stay for a look afterwards; the two databases go
        PackagedServer.deleteTree(work.resolve("data"));
        PackagedServer.deleteTree(work.resolve("external-pg"));
        Files.deleteIfExists(cds(work));
        Map<String, Object> figures = campaign.figures((System.nanoTime() - started) / 1e9);
        String json = JSON.writerWithDefaultPrettyPrinter().writeValueAsString(figures);
        Path out = Path.of(args.length > 0 ? args[0] : "faults.json");
        Files.createDirectories(out.toAbsolutePath().getParent());
        Files.writeString(out, json);
        System.out.println("Fault campaign: " + json);
    }

    /** Server kills and a postmaster kill, with the embedded PostgreSQL. */
    private void embeddedPhase(Path work) throws Exception {
        Path data = work.resolve("data");
        int dbPort = PackagedServer.freePort();
        // as rounds-demo/start.sh does: the first start writes the class-data archive when it stops, the others use it
        PackagedServer first = new PackagedServer("embedded-first", work).jvm("-Xmx512m", "-XX:ArchiveClassesAtExit=" + cds(work))
                .env("ROUNDTABLE_DATA_DIR", data.toString()).env("ROUNDTABLE_DB_PORT", Integer.toString(dbPort));
        first.start().awaitReady(Duration.ofSeconds(240));
        first.stop();
        PackagedServer server = new PackagedServer("embedded", work).jvm("-Xmx512m", "-XX:SharedArchiveFile=" + cds(work))
                .env("ROUNDTABLE_DATA_DIR", data.toString()).env("ROUNDTABLE_DB_PORT", Integer.toString(dbPort));
        server.start().awaitReady(Duration.ofSeconds(240));
        String jdbc = "jdbc:postgresql://127.0.0.1:" + dbPort + "/postgres";
        String password = Files.readString(data.resolve("db.password")).strip();
        long round;
        String[] tokens;
        try (Connection c = DriverManager.getConnection(jdbc, "postgres", password)) {
            round = ServerData.openRound(c, "FAULTS-EMBEDDED", OffsetDateTime.now().plusDays(1));
            tokens = ServerData.laboratories(c, round, "embedded", WORKERS * LABS_PER_WORKER);
        }
        Load load = new Load(server.uri("/"), round, tokens, "embedded");
        load.start();
        try {
            for (int i = 1; i <= SERVER_KILLS; i++) {
                awaitSteadyLoad();
                String loadAtFault = loadAverage();
                long fault = System.nanoTime();
                server.kill();
                server.start(); // at once, as a supervisor would
                faults.add(new Fault("server kill -9 #" + i, awaitRecovery(fault, server), loadAtFault));
                System.out.printf("server kill -9 #%d: first receipt after %.1f s%n", i, faults.get(faults.size() - 1).recoverySeconds());
            }
            awaitSteadyLoad();
            String loadAtFault = loadAverage();
            long postmaster = Long.parseLong(Files.readAllLines(data.resolve("pg").resolve("postmaster.pid")).get(0).strip());
            long fault = System.nanoTime();
            ProcessHandle.of(postmaster).orElseThrow().destroyForcibly();
            faults.add(new Fault("embedded PostgreSQL kill -9", awaitRecovery(fault, server), loadAtFault));
            System.out.printf("embedded PostgreSQL kill -9: first receipt after %.1f s%n", faults.get(faults.size() - 1).recoverySeconds());
            awaitSteadyLoad();
        } finally {
            load.finish();
        }
        try (Connection c = DriverManager.getConnection(jdbc, "postgres", password)) {
            compare(c, round, load);
        } finally {
            server.stop();
        }
    }

    /** A restart of an external PostgreSQL under load. */
    private void externalPhase(Path work) throws Exception {
        Path pgData = work.resolve("external-pg");
        int pgPort = PackagedServer.freePort();
        EmbeddedPostgres postgres = external(pgData, pgPort);
        String jdbc = "jdbc:postgresql://127.0.0.1:" + pgPort + "/postgres";
        PackagedServer server = new PackagedServer("external", work).jvm("-Xmx512m", "-XX:SharedArchiveFile=" + cds(work))
                .database(jdbc, "postgres", "");
        try {
            server.start().awaitReady(Duration.ofSeconds(240));
            long round;
            String[] tokens;
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                round = ServerData.openRound(c, "FAULTS-EXTERNAL", OffsetDateTime.now().plusDays(1));
                tokens = ServerData.laboratories(c, round, "external", WORKERS * LABS_PER_WORKER);
            }
            Load load = new Load(server.uri("/"), round, tokens, "external");
            load.start();
            try {
                awaitSteadyLoad();
                String loadAtFault = loadAverage();
                long fault = System.nanoTime();
                postgres.close();
                postgres = external(pgData, pgPort);
                faults.add(new Fault("external PostgreSQL restart", awaitRecovery(fault, server), loadAtFault));
                System.out.printf("external PostgreSQL restart: first receipt after %.1f s%n", faults.get(faults.size() - 1).recoverySeconds());
                awaitSteadyLoad();
            } finally {
                load.finish();
            }
            try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                compare(c, round, load);
            }
        } finally {
            server.stop();
            postgres.close();
        }
    }

    /** The class-data archive of the application, written by the first start (see rounds-demo/start.sh). */
    private static Path cds(Path work) {
        return work.resolve("app-cds.jsa");
    }

    private static EmbeddedPostgres external(Path data, int port) throws IOException {
        return EmbeddedPostgres.builder().setDataDirectory(data).setCleanDataDirectory(false).setPort(port)
                .setServerConfig("fsync", "on").setServerConfig("synchronous_commit", "on").start();
    }

    private void awaitSteadyLoad() throws InterruptedException {
        int before = ledger.size();
        long since = System.nanoTime();
        while (ledger.size() - before < STEADY_RECEIPTS || System.nanoTime() - since < STEADY.toNanos()) {
            Thread.sleep(100);
            if (System.nanoTime() - since > RECOVERY_LIMIT.toNanos()) {
                throw new IllegalStateException("no steady load: " + (ledger.size() - before) + " receipts in "
                        + RECOVERY_LIMIT.toSeconds() + " s");
            }
        }
    }

    /** Seconds from {@code fault} to the first receipt of a request sent after it. */
    private double awaitRecovery(long fault, PackagedServer server) throws InterruptedException {
        while (System.nanoTime() - fault < RECOVERY_LIMIT.toNanos()) {
            long first = ledger.stream().filter(r -> r.sentNanos() >= fault).mapToLong(Receipt::answeredNanos).min()
                    .orElse(Long.MAX_VALUE);
            if (first != Long.MAX_VALUE) {
                return Math.round((first - fault) / 1e7) / 100.0;
            }
            Thread.sleep(50);
        }
        throw new IllegalStateException("no receipt within " + RECOVERY_LIMIT.toSeconds() + " s of the fault:\n" + server.tail());
    }

    /** The database against the ledger, for one round. */
    private void compare(Connection c, long round, Load load) throws Exception {
        Set<String> receipts = new HashSet<>();
        try (PreparedStatement s = c.prepareStatement("SELECT r.receipt_id FROM submission_revision r "
                + "JOIN submission s ON s.id = r.submission_id WHERE s.round_id = ?")) {
            s.setLong(1, round);
            try (ResultSet rs = s.executeQuery()) {
                while (rs.next()) {
                    receipts.add(rs.getString(1));
                }
            }
        }
        long dup = ServerData.count(c, "SELECT coalesce(sum(n - 1), 0) FROM (SELECT count(*) AS n FROM submission_revision r "
                + "JOIN submission s ON s.id = r.submission_id WHERE s.round_id = ? "
                + "GROUP BY r.submission_id, r.payload_sha256) g", round);
        List<Receipt> mine = ledger.stream().filter(r -> r.key().startsWith(load.prefix)).toList();
        long missing = mine.stream().filter(r -> !receipts.contains(r.receiptId())).count();
        acknowledged += mine.size();
        stored += receipts.size();
        duplicates += dup;
        lost += missing;
        System.out.printf("%s: %d acknowledged, %d stored, %d duplicates, %d lost%n", load.prefix, mine.size(),
                receipts.size(), dup, missing);
    }

    private Map<String, Object> figures(double seconds) {
        Map<String, Object> figures = new LinkedHashMap<>();
        figures.put("acknowledged", acknowledged);
        figures.put("stored", stored);
        figures.put("duplicates", duplicates);
        figures.put("lost", lost);
        figures.put("inDoubt", inDoubt.get());
        figures.put("maxRecoverySeconds", faults.stream().mapToDouble(Fault::recoverySeconds).max().orElse(0));
        figures.put("non503ServerErrors", otherServerErrors.get());
        figures.put("refusedWith503", refused503.get());
        figures.put("connectionFailures", connectionFailures.get());
        figures.put("clientErrors", clientErrors.get());
        figures.put("statuses", new java.util.TreeMap<>(statuses));
        List<Map<String, Object>> list = new ArrayList<>();
        for (Fault f : faults) {
            Map<String, Object> one = new LinkedHashMap<>();
            one.put("fault", f.kind());
            one.put("recoverySeconds", f.recoverySeconds());
            one.put("loadAverage", f.loadAverage());
            list.add(one);
        }
        figures.put("faults", list);
        figures.put("serverErrorSamples", serverErrorSamples.subList(0, Math.min(10, serverErrorSamples.size())));
        figures.put("workers", WORKERS);
        figures.put("classDataSharing", true);
        figures.put("runSeconds", Math.round(seconds));
        return figures;
    }

    /** The LIMS clients: one thread per worker, each with its own laboratories, retrying each key until a receipt. */
    private final class Load {
        private final URI base;
        private final long round;
        private final String[] tokens;
        private final String prefix;
        private final List<Thread> threads = new ArrayList<>();
        private volatile boolean stopping;
        private volatile long giveUpAt = Long.MAX_VALUE;

        Load(URI base, long round, String[] tokens, String prefix) {
            this.base = base;
            this.round = round;
            this.tokens = tokens;
            this.prefix = prefix;
        }

        void start() {
            for (int w = 0; w < WORKERS; w++) {
                int worker = w;
                Thread t = new Thread(() -> run(worker), "lims-" + prefix + "-" + w);
                t.setDaemon(true);
                threads.add(t);
                t.start();
            }
        }

        /** No new keys; every key sent so far is retried until its receipt (at most two minutes). */
        void finish() throws InterruptedException {
            stopping = true;
            giveUpAt = System.nanoTime() + Duration.ofSeconds(120).toNanos();
            for (Thread t : threads) {
                t.join();
            }
        }

        private void run(int worker) {
            int sequence = 0;
            while (!stopping) {
                sequence++;
                int lab = worker * LABS_PER_WORKER + sequence % LABS_PER_WORKER;
                String key = prefix + "-w" + worker + "-" + sequence;
                String payload = ServerData.payload(sequence);
                if (!submitUntilReceipt(key, tokens[lab], payload)) {
                    return;
                }
                pause(20);
            }
        }

        /** False when the key was given up (in doubt) or refused with a 4xx. */
        private boolean submitUntilReceipt(String key, String token, String payload) {
            while (System.nanoTime() < giveUpAt) {
                long sent = System.nanoTime();
                try {
                    HttpResponse<String> answer = http.send(ServerData.submission(base, round, token, key, payload),
                            HttpResponse.BodyHandlers.ofString());
                    long answered = System.nanoTime();
                    lastAnswer.set(answered);
                    int status = answer.statusCode();
                    statuses.computeIfAbsent(status, s -> new AtomicInteger()).incrementAndGet();
                    if (status == 201) {
                        JsonNode receipt = JSON.readTree(answer.body());
                        ledger.add(new Receipt(key, receipt.path("receiptId").asText(), sent, answered));
                        return true;
                    }
                    if (status == 503) {
                        refused503.incrementAndGet();
                    } else if (status >= 500) {
                        otherServerErrors.incrementAndGet();
                        serverErrorSamples.add(status + " " + answer.body());
                    } else {
                        clientErrors.incrementAndGet();
                        serverErrorSamples.add(status + " (client error) " + answer.body());
                        return true;
                    }
                } catch (IOException e) {
                    connectionFailures.incrementAndGet();
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    return false;
                }
                pause(250);
            }
            inDoubt.incrementAndGet();
            return false;
        }

        private void pause(long millis) {
            try {
                Thread.sleep(millis);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
