package org.roundtable;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.PackagedServer;
import org.roundtable.testing.ServerData;

import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Two instances of the packaged application on one PostgreSQL (failsafe, after {@code package}): scheduled work and
 * jobs are done once, a session holds on both, a doubled evaluation start makes one version, and both recover by
 * themselves when that PostgreSQL is stopped and started again (the "external PostgreSQL restart" of issue 13).
 */
class TwoInstancesIT {

    private static final String PASSWORD = "two-instances-password-1";
    private static final HttpClient HTTP = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();
    private static final ObjectMapper JSON = new ObjectMapper();

    private static Path work;
    private static Path pgData;
    private static int pgPort;
    private static EmbeddedPostgres postgres;
    private static String jdbc;
    private static PackagedServer a;
    private static PackagedServer b;
    private static int sequence;

    @BeforeAll
    static void startPostgresqlAndTwoServers() throws Exception {
        work = Files.createTempDirectory("roundtable-two-instances");
        pgData = work.resolve("pg");
        pgPort = PackagedServer.freePort();
        postgres = startPostgres();
        jdbc = "jdbc:postgresql://127.0.0.1:" + pgPort + "/postgres";
        a = server("a");
        b = server("b");
        a.start();
        b.start();
        a.awaitReady(Duration.ofSeconds(150));
        b.awaitReady(Duration.ofSeconds(150));
    }

    @AfterAll
    static void stopAll() throws Exception {
        for (PackagedServer server : new PackagedServer[]{a, b}) {
            if (server != null) {
                server.stop();
            }
        }
        if (postgres != null) {
            postgres.close();
        }
        PackagedServer.deleteTree(pgData);
    }

    private static EmbeddedPostgres startPostgres() throws java.io.IOException {
        return EmbeddedPostgres.builder().setDataDirectory(pgData).setCleanDataDirectory(false).setPort(pgPort)
                .setServerConfig("max_connections", "100").start();
    }

    private static PackagedServer server(String name) {
        return new PackagedServer(name, work).database("jdbc:postgresql://127.0.0.1:" + pgPort + "/postgres", "postgres", "")
                .jvm("-Xmx384m")
                // deadline closing and the job poller every second on each instance
                .env("ROUNDTABLE_JOBS_POLL_INTERVAL", "1s")
                .env("DB_POOL_SIZE", "8");
    }

    private static Connection db() throws Exception {
        return DriverManager.getConnection(jdbc, "postgres", "");
    }

    @BeforeEach
    void bothInstancesAreReady() throws InterruptedException {
        a.awaitReady(Duration.ofSeconds(60));
        b.awaitReady(Duration.ofSeconds(60));
    }

    private static synchronized String code(String what) {
        return what + "-" + (++sequence) + "-" + System.nanoTime() % 100000;
    }

    @Test
    void roundsPastTheirDeadlineAreClosedOnceThoughBothInstancesCloseDueRounds() throws Exception {
        List<Long> rounds = new ArrayList<>();
        try (Connection c = db()) {
            for (int i = 0; i < 4; i++) {
                rounds.add(ServerData.openRound(c, code("CLOSE"), OffsetDateTime.now().plusSeconds(2)));
            }
        }
        long until = System.nanoTime() + Duration.ofSeconds(30).toNanos();
        long open = rounds.size();
        while (open > 0 && System.nanoTime() < until) {
            Thread.sleep(500);
            try (Connection c = db()) {
                open = ServerData.count(c, "SELECT count(*) FROM round WHERE id = ANY (?) AND state = 'OPEN_FOR_RESULTS'",
                        c.createArrayOf("bigint", rounds.toArray()));
            }
        }
        assertThat(open).as("rounds still open 30 s after their deadline").isZero();
        Thread.sleep(2500); // both pollers run twice more: a second close would show now
        try (Connection c = db()) {
            for (long round : rounds) {
                assertThat(ServerData.count(c, "SELECT count(*) FROM audit_event WHERE action = 'round.close' "
                        + "AND object_type = 'round' AND object_id = ?", Long.toString(round)))
                        .as("close events of round %d", round).isEqualTo(1);
                assertThat(ServerData.count(c, "SELECT count(*) FROM round WHERE id = ? AND state = 'CLOSED'", round)).isEqualTo(1);
            }
        }
    }

    @Test
    void aSessionMadeOnOneInstanceIsValidOnTheOther() throws Exception {
        String username = code("session").toLowerCase();
        try (Connection c = db()) {
            ServerData.user(c, username, "coordinator", PASSWORD);
        }
        ServerData.Session session = ServerData.signIn(HTTP, a.uri("/"), username, PASSWORD);
        HttpResponse<String> me = HTTP.send(session.request(b.uri("/api/v1/me")).header("Accept", "application/json").build(),
                HttpResponse.BodyHandlers.ofString());
        assertThat(me.statusCode()).isEqualTo(200);
        assertThat(me.body()).contains(username);
        // the CSRF token a page of one instance gave is accepted by the other: sign out there
        HttpResponse<String> out = HTTP.send(session.request(b.uri("/logout")).header("Content-Type", "application/x-www-form-urlencoded")
                .POST(HttpRequest.BodyPublishers.ofString("_csrf=" + java.net.URLEncoder.encode(session.csrf(),
                        java.nio.charset.StandardCharsets.UTF_8))).build(), HttpResponse.BodyHandlers.ofString());
        assertThat(out.statusCode()).isEqualTo(303);
        HttpResponse<String> after = HTTP.send(session.request(a.uri("/api/v1/me")).header("Accept", "application/json").build(),
                HttpResponse.BodyHandlers.ofString());
        assertThat(after.statusCode()).as("the session ended on the other instance").isEqualTo(401);
    }

    @Test
    void anEvaluationStartedTwiceAtOnceOnBothInstancesMakesOneVersionAndEachJobRunsOnce() throws Exception {
        String coordinator = code("coordinator").toLowerCase();
        List<Long> rounds = new ArrayList<>();
        try (Connection c = db()) {
            ServerData.user(c, coordinator, "coordinator", PASSWORD);
            for (int r = 0; r < 3; r++) {
                long round = ServerData.openRound(c, code("EVAL"), OffsetDateTime.now().plusDays(1));
                String[] tokens = ServerData.laboratories(c, round, code("eval"), 6);
                for (int i = 0; i < tokens.length; i++) {
                    PackagedServer via = i % 2 == 0 ? a : b;
                    HttpResponse<String> receipt = HTTP.send(ServerData.submission(via.uri("/"), round, tokens[i],
                            "two-instances-" + round + "-" + i, ServerData.payload(i * 13 + r)), HttpResponse.BodyHandlers.ofString());
                    assertThat(receipt.statusCode()).as(receipt.body()).isEqualTo(201);
                }
                ServerData.execute(c, "UPDATE round SET state = 'CLOSED', state_changed_at = now() WHERE id = " + round);
                rounds.add(round);
            }
        }
        ServerData.Session session = ServerData.signIn(HTTP, a.uri("/"), coordinator, PASSWORD);
        ExecutorService pool = Executors.newFixedThreadPool(2 * rounds.size());
        List<Future<HttpResponse<String>>> starts = new ArrayList<>();
        CountDownLatch go = new CountDownLatch(1);
        try {
            for (long round : rounds) {
                for (PackagedServer via : new PackagedServer[]{a, b}) {
                    HttpRequest start = session.request(via.uri("/api/v1/rounds/" + round + "/evaluations"))
                            .header("Content-Type", "application/json").header("Accept", "application/json")
                            .header("X-CSRF-Token", session.csrf())
                            .POST(HttpRequest.BodyPublishers.ofString("{\"preview\":false}")).build();
                    starts.add(pool.submit(() -> {
                        go.await();
                        return HTTP.send(start, HttpResponse.BodyHandlers.ofString());
                    }));
                }
            }
            go.countDown();
            for (int r = 0; r < rounds.size(); r++) {
                HttpResponse<String> first = starts.get(2 * r).get();
                HttpResponse<String> second = starts.get(2 * r + 1).get();
                assertThat(first.statusCode()).as(first.body()).isEqualTo(202);
                assertThat(second.statusCode()).as(second.body()).isEqualTo(202);
                assertThat(JSON.readTree(second.body()).path("jobId").asLong())
                        .as("both starts of round %d answer with one job", rounds.get(r))
                        .isEqualTo(JSON.readTree(first.body()).path("jobId").asLong());
            }
        } finally {
            pool.shutdownNow();
        }
        long until = System.nanoTime() + Duration.ofSeconds(40).toNanos();
        long unfinished = Long.MAX_VALUE;
        while (unfinished > 0 && System.nanoTime() < until) {
            Thread.sleep(500);
            try (Connection c = db()) {
                unfinished = ServerData.count(c, "SELECT count(*) FROM job WHERE kind = 'round-evaluation' "
                        + "AND status IN ('QUEUED', 'RUNNING')");
            }
        }
        assertThat(unfinished).as("evaluation jobs still waiting after 40 s").isZero();
        Thread.sleep(2500); // both pollers look again: a job run twice would show now
        try (Connection c = db()) {
            for (long round : rounds) {
                String rid = Long.toString(round);
                assertThat(ServerData.count(c, "SELECT count(*) FROM job WHERE kind = 'round-evaluation' "
                        + "AND (payload::jsonb ->> 'roundId') = ?", rid)).as("jobs of round %d", round).isEqualTo(1);
                assertThat(ServerData.count(c, "SELECT count(*) FROM job WHERE kind = 'round-evaluation' "
                        + "AND (payload::jsonb ->> 'roundId') = ? AND status = 'SUCCEEDED' AND attempts = 1", rid))
                        .as("the job of round %d succeeded at its first attempt", round).isEqualTo(1);
                assertThat(ServerData.count(c, "SELECT count(*) FROM evaluation_run WHERE round_id = ? AND NOT preview", round))
                        .as("evaluation versions of round %d", round).isEqualTo(1);
                assertThat(ServerData.count(c, "SELECT count(*) FROM audit_event WHERE action = 'evaluation.run' "
                        + "AND object_id = ?", rid)).as("evaluation events of round %d", round).isEqualTo(1);
            }
        }
    }

    @Test
    void whenTheirPostgresqlRestartsBothInstancesAnswer503MeanwhileAndRecoverByThemselves() throws Exception {
        long round;
        String[] tokens;
        try (Connection c = db()) {
            round = ServerData.openRound(c, code("RESTART"), OffsetDateTime.now().plusDays(1));
            tokens = ServerData.laboratories(c, round, code("restart"), 2);
        }
        postgres.close();
        postgres = null;
        // during the outage: 503 with Retry-After, never another 5xx; readiness DOWN on both
        for (PackagedServer server : new PackagedServer[]{a, b}) {
            for (int i = 0; i < 3; i++) {
                HttpResponse<String> refused = HTTP.send(ServerData.submission(server.uri("/"), round, tokens[0],
                        "restart-outage-" + i, ServerData.payload(i)), HttpResponse.BodyHandlers.ofString());
                assertThat(refused.statusCode()).as(refused.body()).isEqualTo(503);
                assertThat(refused.headers().firstValue("Retry-After")).isPresent();
                assertThat(JSON.readTree(refused.body()).path("requestId").asText()).isNotBlank();
            }
            assertThat(server.ready()).as("readiness during the outage").isFalse();
        }
        long stoppedAt = System.nanoTime();
        postgres = startPostgres();
        long until = System.nanoTime() + Duration.ofSeconds(30).toNanos();
        while (!(a.ready() && b.ready()) && System.nanoTime() < until) {
            Thread.sleep(200);
        }
        double seconds = (System.nanoTime() - stoppedAt) / 1e9;
        assertThat(a.ready() && b.ready()).as("both ready within 30 s of the restart").isTrue();
        System.out.printf("TwoInstancesIT: both instances ready %.1f s after PostgreSQL was started again%n", seconds);
        for (PackagedServer server : new PackagedServer[]{a, b}) {
            HttpResponse<String> accepted = null;
            long retryUntil = System.nanoTime() + Duration.ofSeconds(15).toNanos();
            String key = "restart-after-" + server.port();
            do {
                if (accepted != null) {
                    Thread.sleep(500);
                }
                accepted = HTTP.send(ServerData.submission(server.uri("/"), round, tokens[1], key,
                        ServerData.payload(server.port() % 1000)), HttpResponse.BodyHandlers.ofString());
            } while (accepted.statusCode() == 503 && System.nanoTime() < retryUntil);
            assertThat(accepted.statusCode()).as(accepted.body()).isEqualTo(201);
            JsonNode receipt = JSON.readTree(accepted.body());
            assertThat(receipt.path("receiptId").asText()).isNotBlank();
        }
        assertThat(a.alive() && b.alive()).as("both are still the processes started at first").isTrue();
    }
}
