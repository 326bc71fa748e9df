package org.roundtable.testing;

import org.roundtable.job.JobRunner;
import org.roundtable.notice.NoticeService;

/**
 * Runs the queued jobs of a test that reads mail. A fresh connection to the test SMTP server is now and then left
 * without an answer until the server's 30 s read timeout ("421 … socket timeout"); the notice job would retry that
 * mail later, as it does with any refused send; here it is retried at once (at most twice), so that a test's count of
 * messages does not depend on that timing. Sends refused for other reasons keep their retry delay.
 */
public final class MailJobs {

    private MailJobs() {
    }

    /** Runs every queued job of {@code kind} (null: every kind), retrying sends the SMTP server timed out. */
    public static void runAll(JobRunner runner, World world, String kind) {
        for (int round = 0; round < 3; round++) {
            while (kind == null ? runner.runNext() : runner.runNext(kind)) {
                // run every queued job
            }
            String timedOut = " WHERE kind = ? AND status = 'QUEUED' AND error LIKE '%421%socket timeout%'";
            if (world.text("SELECT count(*) FROM job" + timedOut, NoticeService.JOB_KIND).strip().equals("0")) {
                return;
            }
            world.sql("UPDATE job SET not_before = now() - interval '1 second'" + timedOut, NoticeService.JOB_KIND);
        }
    }
}
