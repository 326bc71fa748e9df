package org.roundtable.evaluation;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.roundtable.audit.Actor;
import org.roundtable.job.Job;
import org.roundtable.job.JobService;
import org.roundtable.platform.DomainException;

import java.time.OffsetDateTime;
import java.util.Optional;

/**
 * Evaluation runs as background jobs (table {@code job}): any instance may run them, and the coordinator's page
 * follows their progress in measurands evaluated. {@link EvaluationJobHandler} does the work.
 */
@ApplicationScoped
public class EvaluationJobs {

    /** The job kind of an evaluation run. */
    public static final String KIND = "round-evaluation";

    private static final ObjectMapper JSON = new ObjectMapper();

    private final EvaluationService evaluations;
    private final JobService jobs;
    private final EntityManager entityManager;

    public EvaluationJobs(EvaluationService evaluations, JobService jobs, EntityManager entityManager) {
        this.entityManager = entityManager;
        this.evaluations = evaluations;
        this.jobs = jobs;
    }

    /** What the job carries: the round, preview or not, and who asked (for the run and the audit trail). */
    public record Payload(long roundId, boolean preview, String actorName, String actorRole, Long actorLaboratoryId) {
        Actor actor() {
            return new Actor(actorName, actorRole, actorLaboratoryId);
        }
    }

    /** Measurands (of one item) evaluated, of all; both 0 before the job starts. */
    public record Progress(int done, int total) {
    }

    /**
     * An evaluation job as the API shows it.
     *
     * @param status  QUEUED, RUNNING, SUCCEEDED or FAILED
     * @param version the run the job produced, once it succeeded
     * @param error   why the last attempt failed (a failed attempt is retried until the job's attempts are used up)
     */
    public record JobView(long jobId, long roundId, boolean preview, String status, Progress progress, Integer version,
                          String error, int attempts, OffsetDateTime createdAt, OffsetDateTime finishedAt) {
    }

    /**
     * Queues an evaluation of the round. The round's state and plan are checked now (409 at once rather than a
     * failed job) and again when the job runs. While an evaluation of the same kind (run or preview) of the round
     * is queued or running, that job is answered instead of a second one, so a repeated click or request does not
     * make two versions.
     *
     * @return the queued (or already waiting) job
     */
    @Transactional
    public JobView start(long roundId, boolean preview, Actor actor) {
        evaluations.checkRunnable(roundId, preview);
        // serialises starts of the same round, so two requests cannot both find no waiting job
        entityManager.createNativeQuery("SELECT id FROM round WHERE id = :r FOR UPDATE").setParameter("r", roundId)
                .getResultList();
        Optional<JobView> waiting = unfinished(roundId).filter(j -> j.preview() == preview);
        if (waiting.isPresent()) {
            return waiting.get();
        }
        Payload payload = new Payload(roundId, preview, actor.name(), actor.role(), actor.laboratoryId());
        Job job = jobs.enqueue(KIND, write(payload), actor.name());
        return view(job, payload);
    }

    /** The round's newest evaluation job that is queued or running, if any. */
    @Transactional
    public Optional<JobView> unfinished(long roundId) {
        @SuppressWarnings("unchecked")
        java.util.List<Number> ids = entityManager.createNativeQuery("""
                SELECT id FROM job
                 WHERE kind = :kind AND status IN ('QUEUED', 'RUNNING')
                   AND CASE WHEN kind = :kind THEN (payload::jsonb ->> 'roundId')::bigint END = :round
                 ORDER BY id DESC LIMIT 1
                """).setParameter("kind", KIND).setParameter("round", roundId).getResultList();
        return ids.stream().findFirst().map(id -> status(roundId, id.longValue()));
    }

    /** An evaluation job of the round; a job of another round answers like a missing one (404). */
    @Transactional
    public JobView status(long roundId, long jobId) {
        Optional<Job> found = jobs.find(jobId).filter(j -> KIND.equals(j.kind));
        Payload payload = found.map(j -> read(j.payload)).filter(p -> p.roundId() == roundId)
                .orElseThrow(() -> new DomainException.NotFound("The evaluation job"));
        return view(found.get(), payload);
    }

    /**
     * The job's work, in one transaction with the record of its result: a crash leaves either nothing or a run
     * whose version the re-claimed job finds in its result.
     *
     * @return the job's result text ({@code {"version":n}})
     */
    @Transactional
    String runJob(long jobId, Payload payload, RoundEvaluator.Progress progress) {
        EvaluationViews.RunSummary run = evaluations.evaluateRound(payload.roundId(), payload.preview(),
                payload.actor(), progress);
        String result = "{\"version\":" + run.version() + "}";
        jobs.recordResult(jobId, result);
        return result;
    }

    static Payload read(String payload) {
        try {
            return JSON.readValue(payload, Payload.class);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("unreadable evaluation job payload", e);
        }
    }

    private static String write(Payload payload) {
        try {
            return JSON.writeValueAsString(payload);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static JobView view(Job job, Payload payload) {
        Integer version = null;
        if (job.result != null) {
            try {
                version = JSON.readTree(job.result).path("version").asInt();
            } catch (JsonProcessingException e) {
                throw new IllegalStateException("unreadable evaluation job result", e);
            }
        }
        return new JobView(job.id, payload.roundId(), payload.preview(), job.status,
                new Progress(job.progressDone, job.progressTotal), version, job.error, job.attempts,
                job.createdAt == null ? null : job.createdAt.withOffsetSameInstant(java.time.ZoneOffset.UTC),
                job.finishedAt == null ? null : job.finishedAt.withOffsetSameInstant(java.time.ZoneOffset.UTC));
    }
}
