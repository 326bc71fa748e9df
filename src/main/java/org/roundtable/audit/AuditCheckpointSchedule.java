package org.roundtable.audit;

import io.quarkus.scheduler.Scheduled;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.platform.Admission;

/**
 * Advances the audit checkpoint in the background ({@code roundtable.audit.checkpoint-interval}, default one minute),
 * so that a view of the audit page only reads the latest checkpoint and writes nothing: each tick verifies the
 * entries added since the latest checkpoint, {@link AuditCheckpoints#ENTRIES_PER_PASS} at a time (one transaction
 * each), until it has caught up or {@link #PASSES_PER_TICK} passes are done. Instances share the work through the
 * pass's advisory lock.
 */
@ApplicationScoped
public class AuditCheckpointSchedule {

    /** Passes at most per tick (a million entries behind: about a minute of work, spread over the ticks). */
    static final int PASSES_PER_TICK = 20;
    /** Who the checkpoints name as having checked. */
    static final String CHECKED_BY = "audit-checkpoint";

    private final AuditCheckpoints checkpoints;
    private final Admission admission;

    public AuditCheckpointSchedule(AuditCheckpoints checkpoints, Admission admission) {
        this.checkpoints = checkpoints;
        this.admission = admission;
    }

    @Scheduled(every = "${roundtable.audit.checkpoint-interval}", delayed = "10s",
            concurrentExecution = Scheduled.ConcurrentExecution.SKIP)
    void tick() {
        if (!admission.databaseAvailable()) {
            return;
        }
        try {
            catchUp(PASSES_PER_TICK);
        } catch (RuntimeException e) {
            if (!admission.isDatabaseOutage(e)) {
                throw e;
            }
        }
    }

    /** Advances the checkpoint up to {@code passes} times; returns the status after the last pass. */
    public AuditCheckpoints.Status catchUp(int passes) {
        AuditCheckpoints.Status status = checkpoints.advance(CHECKED_BY);
        for (int i = 1; i < passes && status.intact() && status.unverified() > 0; i++) {
            AuditCheckpoints.Status next = checkpoints.advance(CHECKED_BY);
            if (next.verifiedTo() == status.verifiedTo()) {
                return next; // another instance holds the pass, or nothing was learnt
            }
            status = next;
        }
        return status;
    }
}
