package org.roundtable.evaluation;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import jakarta.enterprise.context.ApplicationScoped;
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

    public EvaluationJobs(EvaluationService evaluations, JobService jobs) {
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
     * failed job) and again when the job runs.
     *
     * @return the queued job
     */
    @Transactional
    public JobView start(long roundId, boolean preview, Actor actor) {
        evaluations.checkRunnable(roundId, preview);
        Payload payload = new Payload(roundId, preview, actor.name(), actor.role(), actor.laboratoryId());
        Job job = jobs.enqueue(KIND, write(payload), actor.name());
        return view(job, payload);
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
