package org.roundtable.report;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.job.Job;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobProgress;

/**
 * Issues a round's reports in the background ({@link ReportLifecycle#execute}): progress counts the documents,
 * one per laboratory report plus the round report. Safe to run again: documents issued already are skipped.
 */
@ApplicationScoped
public class ReportIssueJob implements JobHandler {

    private final ReportLifecycle lifecycle;

    public ReportIssueJob(ReportLifecycle lifecycle) {
        this.lifecycle = lifecycle;
    }

    @Override
    public String kind() {
        return ReportLifecycle.JOB_KIND;
    }

    @Override
    public String run(Job job, JobProgress progress) {
        return lifecycle.execute(ReportLifecycle.issueIdOf(job), progress);
    }
}
