package org.roundtable.job;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;

/**
 * The database-backed job queue. Claiming uses {@code FOR UPDATE SKIP LOCKED}, so two instances
 * polling at the same moment never claim the same job; a job whose instance stops sending heartbeats
 * is put back in the queue.
 */
@ApplicationScoped
public class JobService {

    /** A running job whose heartbeat is older than this is considered abandoned. */
    static final Duration ABANDONED_AFTER = Duration.ofMinutes(5);
    private static final int MAX_ERROR_LENGTH = 4000;

    private final JobRepository jobs;
    private final EntityManager entityManager;
    private final Clock clock;

    public JobService(JobRepository jobs, EntityManager entityManager, Clock clock) {
        this.jobs = jobs;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    @Transactional
    public Job enqueue(String kind, String payload, String createdBy) {
        Job job = new Job();
        job.kind = kind;
        job.payload = payload == null ? "{}" : payload;
        job.createdBy = createdBy;
        job.createdAt = now();
        job.notBefore = job.createdAt;
        jobs.persist(job);
        return job;
    }

    /**
     * Queues a job unless one with {@code dedupKey} exists already (of any status), in the caller's transaction.
     * The key's UNIQUE index decides, so two instances or a retried request queue it once.
     *
     * @return whether this call queued it
     */
    @Transactional
    public boolean enqueueOnce(String kind, String dedupKey, String payload, int maxAttempts, String createdBy) {
        OffsetDateTime now = now();
        return entityManager.createNativeQuery("""
                INSERT INTO job (kind, dedup_key, payload, max_attempts, created_by, created_at, not_before)
                VALUES (:kind, :key, :payload, :max, :by, :now, :now)
                ON CONFLICT (dedup_key) WHERE dedup_key IS NOT NULL DO NOTHING
                """)
                .setParameter("kind", kind)
                .setParameter("key", dedupKey)
                .setParameter("payload", payload == null ? "{}" : payload)
                .setParameter("max", Math.max(1, maxAttempts))
                .setParameter("by", createdBy)
                .setParameter("now", now)
                .executeUpdate() == 1;
    }

    @Transactional
    public Optional<Job> find(long id) {
        return jobs.findByIdOptional(id);
    }

    /**
     * Claims the oldest due job for {@code worker}, or nothing. The claim is committed before the
     * work starts, so a crash mid-work leaves a RUNNING row that {@link #requeueAbandoned()} recovers.
     */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public Optional<Long> claimNext(String worker) {
        return claimNext(worker, null);
    }

    /** As {@link #claimNext(String)}, only jobs of {@code kind} (all kinds when null). */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public Optional<Long> claimNext(String worker, String kind) {
        @SuppressWarnings("unchecked")
        List<Number> claimed = entityManager.createNativeQuery("""
                UPDATE job SET status = 'RUNNING', claimed_by = :worker, claimed_at = :now,
                               heartbeat_at = :now, attempts = attempts + 1, version = version + 1
                 WHERE id = (SELECT id FROM job
                              WHERE status = 'QUEUED' AND not_before <= :now
                                AND (CAST(:kind AS varchar) IS NULL OR kind = CAST(:kind AS varchar))
                              ORDER BY not_before, id
                              LIMIT 1
                              FOR UPDATE SKIP LOCKED)
                RETURNING id
                """)
                .setParameter("worker", worker)
                .setParameter("now", now())
                .setParameter("kind", kind)
                .getResultList();
        return claimed.stream().findFirst().map(Number::longValue);
    }

    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public void reportProgress(long id, int done, int total) {
        entityManager.createNativeQuery("""
                UPDATE job SET progress_done = :done, progress_total = :total, heartbeat_at = :now,
                               version = version + 1
                 WHERE id = :id AND status = 'RUNNING'
                """)
                .setParameter("done", Math.max(0, done))
                .setParameter("total", Math.max(0, total))
                .setParameter("now", now())
                .setParameter("id", id)
                .executeUpdate();
    }

    /**
     * Records a job's result inside the caller's transaction, the one that does the work: when the instance dies
     * between that commit and {@link #succeed}, the re-claimed job carries the result and its handler can return it
     * instead of doing the work again. Call it last in that transaction (it locks the job row until the commit).
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public void recordResult(long id, String result) {
        entityManager.createNativeQuery("UPDATE job SET result = :result, version = version + 1 WHERE id = :id")
                .setParameter("result", result)
                .setParameter("id", id)
                .executeUpdate();
    }

    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public void succeed(long id, String result) {
        Job job = jobs.findById(id);
        job.status = JobStatus.SUCCEEDED.name();
        job.result = result;
        job.error = null;
        job.claimedBy = null;
        job.finishedAt = now();
        if (job.progressTotal > 0) {
            job.progressDone = job.progressTotal;
        }
    }

    /**
     * Records a failure: back to the queue with a doubling delay (10 s, 20 s, 40 s, … at most an hour), or FAILED
     * when attempts are used up.
     */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public void fail(long id, String error) {
        Job job = jobs.findById(id);
        job.claimedBy = null;
        job.error = error == null ? "failed" : truncate(error);
        if (job.attempts >= job.maxAttempts) {
            job.status = JobStatus.FAILED.name();
            job.finishedAt = now();
        } else {
            job.status = JobStatus.QUEUED.name();
            job.notBefore = now().plus(retryDelay(job.attempts));
        }
    }

    /**
     * Records a failure that another attempt cannot mend (a domain rule refused the work, e.g. the round's state
     * no longer allows it): FAILED at once, without using up the remaining attempts.
     */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public void failFinally(long id, String error) {
        Job job = jobs.findById(id);
        job.claimedBy = null;
        job.error = error == null ? "failed" : truncate(error);
        job.status = JobStatus.FAILED.name();
        job.finishedAt = now();
    }

    /** Puts jobs whose instance stopped sending heartbeats back in the queue. Safe on many instances. */
    @Transactional(Transactional.TxType.REQUIRES_NEW)
    public int requeueAbandoned() {
        return entityManager.createNativeQuery("""
                UPDATE job SET status = 'QUEUED', claimed_by = NULL, version = version + 1
                 WHERE status = 'RUNNING' AND heartbeat_at < :limit
                """)
                .setParameter("limit", now().minus(ABANDONED_AFTER))
                .executeUpdate();
    }

    /** The delay before attempt {@code attempts + 1}: 10 s doubled per attempt made, capped at one hour. */
    static Duration retryDelay(int attempts) {
        int doublings = Math.min(Math.max(attempts, 1) - 1, 9);
        return Duration.ofSeconds(Math.min(10L << doublings, 3600L));
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }

    private static String truncate(String text) {
        return text.length() <= MAX_ERROR_LENGTH ? text : text.substring(0, MAX_ERROR_LENGTH);
    }
}
