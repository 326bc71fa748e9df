package org.roundtable.submission;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.PackagedServer;
import org.roundtable.testing.ServerData;

import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Memory under parallel uploads (issue 13, part 6), against the packaged jar with {@code -Xmx768m} and the JVM's
 * default collector, as {@code rounds-demo/start.sh} runs it: 64 laboratories send a maximal CSV (just under 2 MiB,
 * 5 000 rows) at once, each retrying after a 503 until it has its answer. The heap in use after each collection
 * that reaches the old generation (from the JVM's own GC log) stays under 512 MiB.
 */
class ParallelUploadHeapIT {

    private static final int UPLOADS = 64;
    private static final long MIB = 1024 * 1024;
    private static final Pattern GC = Pattern.compile("(\\d+)([KMG])->(\\d+)([KMG])\\((\\d+)([KMG])\\)");
    /**
     * The collections whose result bounds the live heap from above: the end of a marking cycle (G1's Remark), a mixed
     * collection (young and old regions) and a full one. A young collection leaves the old generation's garbage in
     * place, so the heap after it says how long G1 waited, not what the uploads keep.
     */
    private static final Pattern OLD_GENERATION = Pattern.compile("Pause (Remark|Young \\(Mixed\\)|Full)");

    @Test
    void sixtyFourParallelMaximalUploadsKeepTheHeapUnder512MiB() throws Exception {
        Path work = Files.createTempDirectory("roundtable-heap");
        Path gcLog = work.resolve("gc.log");
        int pgPort = PackagedServer.freePort();
        try (EmbeddedPostgres postgres = EmbeddedPostgres.builder().setDataDirectory(work.resolve("pg"))
                .setCleanDataDirectory(true).setPort(pgPort).start()) {
            String jdbc = "jdbc:postgresql://127.0.0.1:" + pgPort + "/postgres";
            PackagedServer server = new PackagedServer("heap", work).database(jdbc, "postgres", "")
                    .jvmOnly("-Xmx768m", "-XX:TieredStopAtLevel=1", "-Xlog:gc:file=" + gcLog, "-Duser.timezone=UTC");
            try {
                server.start().awaitReady(Duration.ofSeconds(150));
                long round;
                String[] tokens;
                try (Connection c = DriverManager.getConnection(jdbc, "postgres", "")) {
                    round = ServerData.openRound(c, "HEAP-1", OffsetDateTime.now().plusDays(1));
                    tokens = ServerData.laboratories(c, round, "heap", UPLOADS);
                }
                byte[] csv = maximalCsv();
                assertThat((long) csv.length).isLessThanOrEqualTo(2 * MIB).isGreaterThan(2 * MIB - 8 * 1024);
                long gcLinesBefore = Files.readAllLines(gcLog).size();

                Map<Integer, Integer> answers = uploadAllAtOnce(server, round, tokens, csv);

                List<String> gcLines = Files.readAllLines(gcLog);
                long peakAfter = 0;
                long peakBefore = 0;
                long peakLive = 0;
                int collections = 0;
                int oldCollections = 0;
                for (String line : gcLines.subList((int) gcLinesBefore, gcLines.size())) {
                    Matcher m = GC.matcher(line);
                    if (m.find()) {
                        collections++;
                        long after = bytes(m.group(3), m.group(4));
                        peakBefore = Math.max(peakBefore, bytes(m.group(1), m.group(2)));
                        peakAfter = Math.max(peakAfter, after);
                        if (OLD_GENERATION.matcher(line).find()) {
                            oldCollections++;
                            peakLive = Math.max(peakLive, after);
                        }
                    }
                }
                long residentPeak = residentPeak(server.pid());
                System.out.printf("ParallelUploadHeapIT: %d uploads, answers %s, %d collections (%d that reach the old "
                                + "generation), heap after those at most %d MiB, after any collection at most %d MiB, "
                                + "before a collection at most %d MiB, resident set peak %d MiB%n", UPLOADS, answers,
                        collections, oldCollections, peakLive / MIB, peakAfter / MIB, peakBefore / MIB, residentPeak / MIB);
                assertThat(answers.values().stream().mapToInt(Integer::intValue).sum()).isEqualTo(UPLOADS);
                assertThat(answers).as("every upload was read and answered (not refused for load)").doesNotContainKey(503);
                assertThat(answers.keySet()).allSatisfy(status -> assertThat(status).isLessThan(500));
                assertThat(oldCollections).as("collections of the old generation while the uploads were parsed").isPositive();
                assertThat(peakLive).as("heap in use after a collection that reaches the old generation").isLessThan(512 * MIB);
                assertThat(server.alive()).isTrue();
            } finally {
                server.stop();
            }
        }
    }

    /** Every laboratory uploads at the same moment; a 503 is retried after its Retry-After. Answers by status. */
    private static Map<Integer, Integer> uploadAllAtOnce(PackagedServer server, long round, String[] tokens, byte[] csv)
            throws Exception {
        HttpClient http = HttpClient.newBuilder().version(HttpClient.Version.HTTP_1_1)
                .connectTimeout(Duration.ofSeconds(10)).build();
        ExecutorService pool = Executors.newFixedThreadPool(UPLOADS);
        CountDownLatch go = new CountDownLatch(1);
        List<Future<Integer>> results = new ArrayList<>();
        try {
            for (String token : tokens) {
                results.add(pool.submit(() -> {
                    go.await();
                    long until = System.nanoTime() + Duration.ofMinutes(5).toNanos();
                    while (true) {
                        HttpResponse<String> answer = http.send(HttpRequest.newBuilder(
                                        server.uri("/api/v1/my-rounds/" + round + "/submission/file"))
                                .timeout(Duration.ofSeconds(120)).header("Authorization", "Bearer " + token)
                                .header("Content-Type", "text/csv").POST(HttpRequest.BodyPublishers.ofByteArray(csv)).build(),
                                HttpResponse.BodyHandlers.ofString());
                        if (answer.statusCode() != 503 || System.nanoTime() > until) {
                            return answer.statusCode();
                        }
                        Thread.sleep(1000L * Integer.parseInt(answer.headers().firstValue("Retry-After").orElse("1")));
                    }
                }));
            }
            go.countDown();
            Map<Integer, Integer> answers = new TreeMap<>();
            for (Future<Integer> result : results) {
                answers.merge(result.get(), 1, Integer::sum);
            }
            return answers;
        } finally {
            pool.shutdownNow();
        }
    }

    /**
     * A CSV at the upload limits: 5 000 data rows of 419 bytes (long values, uncertainties and replicate lists,
     * each cell under the 256-character limit), just under 2 MiB in all.
     */
    static byte[] maximalCsv() {
        StringBuilder csv = new StringBuilder("measurand,item,value,unit,expanded_uncertainty,coverage_factor,method,"
                + "replicates,replicate_values\n");
        String value = "1.2" + "1".repeat(97);
        String uncertainty = "0.0" + "5".repeat(57);
        StringBuilder replicates = new StringBuilder("1.21");
        while (replicates.length() + 5 <= 234) {
            replicates.append("|1.21");
        }
        for (int row = 0; row < 5_000; row++) {
            String element = ServerData.ELEMENTS.get(row % ServerData.ELEMENTS.size());
            String line = element + "," + (row % 2 == 0 ? "A" : "B") + "," + value + ",%," + uncertainty + ",2,spark-oes,3,"
                    + replicates;
            csv.append(line).append(" ".repeat(Math.max(0, 418 - line.length()))).append('\n');
        }
        return csv.toString().getBytes(StandardCharsets.UTF_8);
    }

    private static long bytes(String number, String unit) {
        long n = Long.parseLong(number);
        return switch (unit) {
            case "K" -> n * 1024;
            case "M" -> n * MIB;
            default -> n * 1024 * MIB;
        };
    }

    /** The process's peak resident set ({@code VmHWM}), 0 where {@code /proc} is missing. */
    private static long residentPeak(long pid) {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/" + pid + "/status"))) {
                if (line.startsWith("VmHWM:")) {
                    return Long.parseLong(line.replaceAll("\\D", "")) * 1024;
                }
            }
        } catch (java.io.IOException e) {
            // not Linux: no figure
        }
        return 0;
    }
}
