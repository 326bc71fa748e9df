package org.roundtable.audit;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.job.Job;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobProgress;

/**
 * The on-demand check of the whole audit chain, as a background job (a long trail takes seconds to verify; the
 * page does not wait for it). Its outcome is a full-check checkpoint ({@link AuditCheckpoints#verifyAll}), which
 * the audit page then shows. Safe to run again: a second run appends a second checkpoint with the same outcome.
 */
@ApplicationScoped
public class AuditVerificationJob implements JobHandler {

    /** The job kind. */
    public static final String KIND = "audit-verification";

    private final AuditCheckpoints checkpoints;

    public AuditVerificationJob(AuditCheckpoints checkpoints) {
        this.checkpoints = checkpoints;
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public String run(Job job, JobProgress progress) {
        AuditCheckpoints.Status status = checkpoints.verifyAll(job.createdBy);
        return status.intact() ? "intact to entry " + status.verifiedTo()
                : "broken at entry " + status.brokenAt() + ": " + status.problem();
    }
}
