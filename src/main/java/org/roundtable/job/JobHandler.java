package org.roundtable.job;

/**
 * Runs jobs of one kind. Implementations are CDI beans; the runner finds them by {@link #kind()}.
 * A handler must be safe to run again after a crash (a job whose instance died is re-queued).
 */
public interface JobHandler {

    /** The job kind this handler runs, e.g. {@code "round-evaluation"}. */
    String kind();

    /**
     * Does the work.
     *
     * @param job      the claimed job (read-only view)
     * @param progress where to report progress; each report is committed at once
     * @return a short result text stored with the job (e.g. the id of what was produced)
     * @throws Exception any failure; the job is retried until its attempts are used up
     */
    String run(Job job, JobProgress progress) throws Exception;
}
