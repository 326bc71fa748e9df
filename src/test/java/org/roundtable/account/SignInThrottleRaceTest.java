package org.roundtable.account;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * The sign-in throttle under parallel guesses: every attempt is reserved under a per-username lock before the
 * password is checked, so a burst cannot get more checks than the limit (10 in 10 minutes).
 */
@QuarkusTest
class SignInThrottleRaceTest {

    @Inject
    World world;

    @Test
    void fortyEightParallelWrongPasswordsGetAtMostTenChecks() throws Exception {
        String coordinator = world.user("coordinator", null);
        String[] form = world.anonymousForm();
        List<Callable<Integer>> guesses = new ArrayList<>();
        for (int i = 0; i < 48; i++) {
            String guess = "wrong-" + i;
            guesses.add(() -> attempt(form, coordinator, guess));
        }
        List<Integer> statuses = inParallel(guesses);
        // 401 = the password was checked and was wrong; 429 = refused before any check
        assertThat(statuses.stream().filter(s -> s == 401).count()).isLessThanOrEqualTo(10);
        assertThat(statuses).containsOnly(401, 429);
        assertThat(world.insert("SELECT count(*) FROM login_attempt WHERE username = ? AND NOT succeeded", coordinator))
                .isEqualTo(48);
    }

    @Test
    void aCorrectPasswordInsideABurstAfterTheLimitIsRefused() throws Exception {
        String coordinator = world.user("coordinator", null);
        String[] form = world.anonymousForm();
        List<Callable<Integer>> first = new ArrayList<>();
        for (int i = 0; i < 13; i++) {
            String guess = "wrong-" + i;
            first.add(() -> attempt(form, coordinator, guess));
        }
        ExecutorService pool = Executors.newFixedThreadPool(16);
        try {
            List<Future<Integer>> early = new ArrayList<>();
            for (Callable<Integer> c : first) {
                early.add(pool.submit(c));
            }
            // the 14th request of the burst goes out once the 13 before it have reached the server
            Instant until = Instant.now().plus(Duration.ofSeconds(30));
            while (world.insert("SELECT count(*) FROM login_attempt WHERE username = ?", coordinator) < 13
                    && Instant.now().isBefore(until)) {
                Thread.sleep(5);
            }
            Future<Integer> correct = pool.submit(() -> attempt(form, coordinator, World.PASSWORD));
            Future<Integer> later1 = pool.submit(() -> attempt(form, coordinator, "wrong-14"));
            Future<Integer> later2 = pool.submit(() -> attempt(form, coordinator, "wrong-15"));
            assertThat(correct.get()).isEqualTo(429);
            assertThat(later1.get()).isEqualTo(429);
            assertThat(later2.get()).isEqualTo(429);
            for (Future<Integer> f : early) {
                assertThat(f.get()).isIn(401, 429);
            }
        } finally {
            pool.shutdownNow();
        }
        assertThat(world.insert("SELECT count(*) FROM login_attempt WHERE username = ? AND succeeded", coordinator)).isZero();
    }

    private static int attempt(String[] form, String username, String password) {
        return given().redirects().follow(false).cookie("rt_form", form[0])
                .contentType("application/x-www-form-urlencoded").formParam("_csrf", form[1])
                .formParam("username", username).formParam("password", password)
                .post("/login").statusCode();
    }

    /** Runs the calls at once (released together by a latch) and returns their results in order. */
    static List<Integer> inParallel(List<Callable<Integer>> calls) throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(calls.size());
        CountDownLatch start = new CountDownLatch(1);
        try {
            List<Future<Integer>> futures = new ArrayList<>();
            for (Callable<Integer> call : calls) {
                futures.add(pool.submit(() -> {
                    start.await();
                    return call.call();
                }));
            }
            start.countDown();
            List<Integer> results = new ArrayList<>();
            for (Future<Integer> f : futures) {
                results.add(f.get());
            }
            return results;
        } finally {
            pool.shutdownNow();
        }
    }
}
