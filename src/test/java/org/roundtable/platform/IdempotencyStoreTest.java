package org.roundtable.platform;

import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import jakarta.persistence.EntityManager;
import org.junit.jupiter.api.Test;

import java.util.List;
import java.util.Optional;
import java.util.UUID;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

@QuarkusTest
class IdempotencyStoreTest {

    @Inject
    IdempotencyStore idempotency;

    @Inject
    EntityManager entityManager;

    /** The work being protected: counts how often it really ran. */
    private String doWorkOnce(String scope, String key, String hash, AtomicInteger executions) {
        return QuarkusTransaction.requiringNew().call(() -> {
            Optional<IdempotencyStore.StoredAnswer> earlier = idempotency.claim(scope, key, hash);
            if (earlier.isPresent()) {
                return earlier.get().body();
            }
            int run = executions.incrementAndGet();
            Thread.sleep(200); // hold the claim while a concurrent duplicate arrives
            String receipt = "receipt-" + run;
            idempotency.complete(scope, key, 201, receipt);
            return receipt;
        });
    }

    @Test
    void aRetryGetsTheOriginalAnswerAndTheWorkRunsOnce() {
        AtomicInteger executions = new AtomicInteger();
        String key = "retry-" + UUID.randomUUID();
        String first = doWorkOnce("lab-1", key, "a".repeat(64), executions);
        String retry = doWorkOnce("lab-1", key, "a".repeat(64), executions);
        assertThat(retry).isEqualTo(first);
        assertThat(executions).hasValue(1);
    }

    @Test
    void twoSimultaneousRequestsWithOneKeyDoTheWorkOnce() throws Exception {
        AtomicInteger executions = new AtomicInteger();
        String key = "race-" + UUID.randomUUID();
        CountDownLatch start = new CountDownLatch(1);
        Callable<String> request = () -> {
            start.await();
            return doWorkOnce("lab-2", key, "b".repeat(64), executions);
        };
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            List<Future<String>> answers = List.of(pool.submit(request), pool.submit(request));
            start.countDown();
            assertThat(answers.get(0).get()).isEqualTo(answers.get(1).get());
        } finally {
            pool.shutdownNow();
        }
        assertThat(executions).hasValue(1);
    }

    @Test
    void theSameKeyWithADifferentPayloadIsRefused() {
        AtomicInteger executions = new AtomicInteger();
        String key = "reuse-" + UUID.randomUUID();
        doWorkOnce("lab-3", key, "c".repeat(64), executions);
        assertThatThrownBy(() -> doWorkOnce("lab-3", key, "d".repeat(64), executions))
                .isInstanceOf(DomainException.Unprocessable.class);
        assertThat(executions).hasValue(1);
    }

    @Test
    void keysAreScopedSoTwoLaboratoriesMayUseTheSameKey() {
        AtomicInteger executions = new AtomicInteger();
        String key = "shared-" + UUID.randomUUID();
        doWorkOnce("lab-4", key, "e".repeat(64), executions);
        doWorkOnce("lab-5", key, "f".repeat(64), executions);
        assertThat(executions).hasValue(2);
    }

    @Test
    void aFailedAttemptLeavesNoRecordSoTheRetryDoesTheWork() {
        AtomicInteger executions = new AtomicInteger();
        String key = "fails-" + UUID.randomUUID();
        assertThatThrownBy(() -> QuarkusTransaction.requiringNew().run(() -> {
            idempotency.claim("lab-6", key, "a".repeat(64));
            throw new IllegalStateException("the work failed half-way");
        })).isInstanceOf(IllegalStateException.class);
        assertThat(doWorkOnce("lab-6", key, "a".repeat(64), executions)).isEqualTo("receipt-1");
    }

    @Test
    void malformedKeysAreRefused() {
        assertThatThrownBy(() -> QuarkusTransaction.requiringNew().run(() -> idempotency.claim("lab-7", "short", "a".repeat(64))))
                .isInstanceOf(DomainException.BadRequest.class);
    }
}
