package org.roundtable.demo;

import jakarta.enterprise.context.ApplicationScoped;
import org.jboss.logging.Logger;
import org.roundtable.account.Role;
import org.roundtable.audit.Actor;
import org.roundtable.job.Job;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobProgress;
import org.roundtable.report.ReportLifecycle;
import org.roundtable.scheme.DemoSchemes;

import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Publishes the demo's earlier round after start-up: preliminary report, comment period, sign-off and final report,
 * by the demo coordinator. Resumable (see {@link ReportLifecycle#publishWithoutJobs}), so a restart during the work
 * finishes it; queued once, by the demo loader.
 */
@ApplicationScoped
public class DemoPublication implements JobHandler {

    static final String KIND = "demo-publication";
    static final Actor COORDINATOR = new Actor("coordinator", Role.COORDINATOR_NAME, null);
    private static final Logger LOG = Logger.getLogger(DemoPublication.class);
    private static final Pattern PAYLOAD = Pattern.compile("\\{\"round\":(\\d+),\"version\":(\\d+)}");

    private final ReportLifecycle reports;

    public DemoPublication(ReportLifecycle reports) {
        this.reports = reports;
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public String run(Job job, JobProgress progress) {
        Matcher m = PAYLOAD.matcher(job.payload);
        if (!m.matches()) {
            throw new IllegalArgumentException("unexpected payload " + job.payload);
        }
        long started = System.nanoTime();
        reports.publishWithoutJobs(Long.parseLong(m.group(1)), Integer.parseInt(m.group(2)),
                "Five laboratories reported all ten measurands. Five results are too few for a consensus, so the "
                        + "scores are against the lot's certified values (demo data, invented).",
                new ReportLifecycle.Signer(COORDINATOR, "Marta Ilves"));
        long ms = (System.nanoTime() - started) / 1_000_000;
        LOG.infof("Demo round %s published (preliminary and final reports) in %d ms.", DemoSchemes.PAST_ROUND, ms);
        return DemoSchemes.PAST_ROUND + " published in " + ms + " ms";
    }
}
