package org.roundtable.evaluation;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.job.Job;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobProgress;

/**
 * Runs an evaluation job. Safe to run again: the run is one transaction (an attempt that failed or whose instance
 * died left nothing), and a job whose run was committed carries its result, which is returned without a second run.
 */
@ApplicationScoped
public class EvaluationJobHandler implements JobHandler {

    /** Progress is recorded at the start, at the end and at most this often in between. */
    static final long PROGRESS_EVERY_NANOS = 200_000_000L;

    private final EvaluationJobs evaluationJobs;

    public EvaluationJobHandler(EvaluationJobs evaluationJobs) {
        this.evaluationJobs = evaluationJobs;
    }

    @Override
    public String kind() {
        return EvaluationJobs.KIND;
    }

    @Override
    public String run(Job job, JobProgress progress) {
        if (job.result != null) {
            return job.result;
        }
        EvaluationJobs.Payload payload = EvaluationJobs.read(job.payload);
        long[] last = {Long.MIN_VALUE};
        return evaluationJobs.runJob(job.id, payload, (done, total) -> {
            long now = System.nanoTime();
            if (done == 0 || done == total || last[0] == Long.MIN_VALUE || now - last[0] >= PROGRESS_EVERY_NANOS) {
                last[0] = now;
                progress.report(done, total);
            }
        });
    }
}
