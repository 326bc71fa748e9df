package org.roundtable.job;

import io.quarkus.scheduler.Scheduled;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.inject.Any;
import jakarta.enterprise.inject.Instance;
import org.jboss.logging.Logger;
import org.roundtable.platform.DomainException;

import java.lang.management.ManagementFactory;
import java.util.Map;
import java.util.Optional;
import java.util.UUID;
import java.util.function.Function;
import java.util.stream.Collectors;

/**
 * Polls the job table and runs what it claims. Every instance runs its own poller; the claim query
 * keeps them from running the same job twice.
 */
@ApplicationScoped
public class JobRunner {

    private static final Logger LOG = Logger.getLogger(JobRunner.class);

    private final JobService jobService;
    private final Map<String, JobHandler> handlers;
    private final String workerId;
    private final org.roundtable.platform.Admission admission;

    public JobRunner(JobService jobService, @Any Instance<JobHandler> handlers, org.roundtable.platform.Admission admission) {
        this.jobService = jobService;
        this.admission = admission;
        this.handlers = handlers.stream().collect(Collectors.toUnmodifiableMap(JobHandler::kind, Function.identity()));
        this.workerId = ManagementFactory.getRuntimeMXBean().getName() + "/" + UUID.randomUUID().toString().substring(0, 8);
    }

    @Scheduled(every = "${roundtable.jobs.poll-interval}", concurrentExecution = Scheduled.ConcurrentExecution.SKIP)
    void poll() {
        if (!admission.databaseAvailable()) {
            return; // the outage is logged once by Admission; the poll resumes when the database answers
        }
        try {
            jobService.requeueAbandoned();
            while (runNext()) {
                // keep going while there is queued work
            }
        } catch (RuntimeException e) {
            if (!admission.isDatabaseOutage(e)) {
                throw e;
            }
        }
    }

    /** Claims and runs one job; false when nothing was due. */
    public boolean runNext() {
        return runNext(null);
    }

    /** Claims and runs one job of {@code kind} (any kind when null); false when nothing was due. */
    public boolean runNext(String kind) {
        Optional<Long> claimed = jobService.claimNext(workerId, kind);
        if (claimed.isEmpty()) {
            return false;
        }
        long id = claimed.get();
        Job job = jobService.find(id).orElseThrow();
        JobHandler handler = handlers.get(job.kind);
        if (handler == null) {
            jobService.fail(id, "no handler for job kind " + job.kind);
            return true;
        }
        try {
            String result = handler.run(job, (done, total) -> jobService.reportProgress(id, done, total));
            jobService.succeed(id, result);
        } catch (DomainException e) {
            // a rule of the domain refused the work; the same data will be refused again, so no retry
            LOG.warnf("job %d (%s) refused: %s", id, job.kind, e.detail());
            jobService.failFinally(id, "refused: " + e.detail());
        } catch (Exception e) {
            LOG.errorf(e, "job %d (%s) failed", id, job.kind);
            jobService.fail(id, e.getClass().getSimpleName() + ": " + e.getMessage());
        }
        return true;
    }

    String workerId() {
        return workerId;
    }
}
