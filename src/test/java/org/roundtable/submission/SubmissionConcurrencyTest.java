package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/** Races a laboratory can run into in the last minutes before a deadline. */
@QuarkusTest
class SubmissionConcurrencyTest {

    @Inject
    World world;

    private static String cr(String value) {
        return "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"" + value + "\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":1}]}";
    }

    private static List<Response> race(int requests, Callable<Response> request) throws Exception {
        CountDownLatch start = new CountDownLatch(1);
        ExecutorService pool = Executors.newFixedThreadPool(requests);
        try {
            List<Future<Response>> futures = new ArrayList<>();
            for (int i = 0; i < requests; i++) {
                futures.add(pool.submit(() -> {
                    start.await();
                    return request.call();
                }));
            }
            start.countDown();
            List<Response> responses = new ArrayList<>();
            for (Future<Response> f : futures) {
                responses.add(f.get());
            }
            return responses;
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void twoSimultaneousSubmitsFromOneLaboratoryBecomeTwoConsistentRevisions() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        // two different sets of values: identical ones would be "no change" and make no second revision
        java.util.concurrent.atomic.AtomicInteger next = new java.util.concurrent.atomic.AtomicInteger();
        List<Response> answers = race(2, () -> given().header("Authorization", "Bearer " + token)
                .contentType("application/json").body(cr("18.1" + next.incrementAndGet()))
                .post("/api/v1/my-rounds/" + round + "/submission"));
        assertThat(answers).allSatisfy(r -> assertThat(r.statusCode()).isEqualTo(201));
        assertThat(answers.stream().map(r -> (Integer) r.path("revision")).sorted().toList()).containsExactly(1, 2);
        assertThat(world.text("SELECT current_revision FROM submission WHERE round_id = ?", round)).isEqualTo("2");
    }

    @Test
    void aRetriedIdempotencyKeyNeverDuplicatesEvenWhenTheRetriesRace() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        String key = "lims-" + World.unique("race");
        List<Response> answers = race(4, () -> given().header("Authorization", "Bearer " + token)
                .header("Idempotency-Key", key).contentType("application/json").body(cr("18.12"))
                .post("/api/v1/my-rounds/" + round + "/submission"));
        assertThat(answers).allSatisfy(r -> assertThat(r.statusCode()).isEqualTo(201));
        assertThat(answers.stream().map(r -> (String) r.path("receiptId")).distinct()).hasSize(1);
        assertThat(world.insert("SELECT count(*) FROM submission_revision v JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?", round))
                .isEqualTo(1);
    }

    @Test
    void submitsRacingTheCloseAreEitherFullyInWithAReceiptOrRefused() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        List<Callable<Response>> mixed = new ArrayList<>();
        CountDownLatch start = new CountDownLatch(1);
        ExecutorService pool = Executors.newFixedThreadPool(9);
        List<Future<Response>> submits = new ArrayList<>();
        try {
            for (int i = 0; i < 8; i++) {
                String value = "18." + (10 + i);
                submits.add(pool.submit(() -> {
                    start.await();
                    return given().header("Authorization", "Bearer " + token).contentType("application/json").body(cr(value))
                            .post("/api/v1/my-rounds/" + round + "/submission");
                }));
            }
            Future<Response> close = pool.submit(() -> {
                start.await();
                return coordinator.json().body("{\"action\":\"CLOSE\"}").post("/api/v1/rounds/" + round + "/transitions");
            });
            start.countDown();
            assertThat(close.get().statusCode()).isEqualTo(200);
            int receipts = 0;
            for (Future<Response> f : submits) {
                int status = f.get().statusCode();
                assertThat(status).isIn(201, 409);
                receipts += status == 201 ? 1 : 0;
            }
            long stored = world.insert("SELECT count(*) FROM submission_revision v JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?", round);
            assertThat(stored).as("every receipt has its revision, and nothing without a receipt was stored").isEqualTo(receipts);
            long resultRows = world.insert("SELECT count(*) FROM reported_result r JOIN submission_revision v ON v.id = r.revision_id "
                    + "JOIN submission s ON s.id = v.submission_id WHERE s.round_id = ?", round);
            assertThat(resultRows).as("no half-written revision").isEqualTo(receipts);
        } finally {
            pool.shutdownNow();
        }
        assertThat(mixed).isEmpty();
    }

    @Test
    void aFewHundredLaboratoriesSubmitThroughTheApi() throws Exception {
        int laboratories = 300;
        long[] labs = new long[laboratories];
        for (int i = 0; i < laboratories; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.OPEN_FOR_RESULTS, labs);
        List<String> tokens = new ArrayList<>();
        for (long lab : labs) {
            tokens.add(world.apiToken(lab));
        }
        ExecutorService pool = Executors.newFixedThreadPool(8);
        try {
            List<Future<Integer>> statuses = new ArrayList<>();
            for (int i = 0; i < laboratories; i++) {
                String token = tokens.get(i);
                String value = String.format("%.2f", 17.5 + (i % 100) / 50.0).replace(',', '.');
                statuses.add(pool.submit(() -> given().header("Authorization", "Bearer " + token)
                        .contentType("application/json").body(cr(value))
                        .post("/api/v1/my-rounds/" + round + "/submission").statusCode()));
            }
            for (Future<Integer> status : statuses) {
                assertThat(status.get()).isEqualTo(201);
            }
        } finally {
            pool.shutdownNow();
        }
        assertThat(world.insert("SELECT count(*) FROM submission WHERE round_id = ? AND current_revision = 1", round))
                .isEqualTo(laboratories);
    }
}
