package org.roundtable.job;

import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.UUID;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.assertj.core.api.Assertions.assertThat;

@QuarkusTest
class JobServiceTest {

    @Inject
    JobService jobs;

    @Test
    void twoWorkersClaimingAtOnceNeverGetTheSameJob() throws Exception {
        String kind = "test-claim-" + UUID.randomUUID();
        Set<Long> queued = new HashSet<>();
        for (int i = 0; i < 30; i++) {
            queued.add(jobs.enqueue(kind, "{}", "test").id);
        }
        List<Long> claimed = Collections.synchronizedList(new ArrayList<>());
        Callable<Void> worker = () -> {
            String name = "worker-" + Thread.currentThread().getId();
            Optional<Long> next;
            while ((next = jobs.claimNext(name)).isPresent()) {
                claimed.add(next.get());
                jobs.succeed(next.get(), "done");
            }
            return null;
        };
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            List<Future<Void>> futures = pool.invokeAll(List.of(worker, worker));
            for (Future<Void> f : futures) {
                f.get();
            }
        } finally {
            pool.shutdownNow();
        }
        assertThat(claimed).doesNotHaveDuplicates();
        assertThat(new HashSet<>(claimed)).containsAll(queued);
    }

    @Test
    void aFailingJobIsRetriedThenMarkedFailedWithItsError() {
        Job job = jobs.enqueue("test-fail-" + UUID.randomUUID(), "{}", "test");
        for (int attempt = 1; attempt <= job.maxAttempts; attempt++) {
            forceDue(job.id);
            assertThat(jobs.claimNext("w")).contains(job.id);
            jobs.fail(job.id, "boom " + attempt);
        }
        Job after = jobs.find(job.id).orElseThrow();
        assertThat(after.jobStatus()).isEqualTo(JobStatus.FAILED);
        assertThat(after.error).isEqualTo("boom 3");
        assertThat(after.attempts).isEqualTo(3);
    }

    @Test
    void progressIsRecordedWhileTheJobRuns() {
        Job job = jobs.enqueue("test-progress-" + UUID.randomUUID(), "{}", "test");
        forceDue(job.id);
        assertThat(jobs.claimNext("w")).isPresent();
        jobs.reportProgress(job.id, 40, 100);
        Job running = jobs.find(job.id).orElseThrow();
        assertThat(running.jobStatus()).isEqualTo(JobStatus.RUNNING);
        assertThat(running.progressDone).isEqualTo(40);
        assertThat(running.progressTotal).isEqualTo(100);
        jobs.succeed(job.id, "ok");
        assertThat(jobs.find(job.id).orElseThrow().progressDone).isEqualTo(100);
    }

    @Inject
    jakarta.persistence.EntityManager entityManager;

    private void forceDue(long id) {
        // other tests' jobs may be queued too: put this one first so claimNext picks it
        QuarkusTransaction.requiringNew().run(() -> entityManager
                .createNativeQuery("UPDATE job SET not_before = '2000-01-01T00:00:00Z' WHERE id = :id")
                .setParameter("id", id).executeUpdate());
    }
}
