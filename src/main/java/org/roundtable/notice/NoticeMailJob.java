package org.roundtable.notice;

import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.job.Job;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobProgress;

/**
 * Sends one notice's e-mail (job kind {@value NoticeService#JOB_KIND}). The job runner's claim lets one worker of
 * any instance run it; a failure (SMTP down) is retried with doubling delays, and the notice is marked FAILED when
 * the last attempt fails. The notice's row lock and its mail status keep a retried job from sending twice once the
 * send has been recorded.
 */
@ApplicationScoped
public class NoticeMailJob implements JobHandler {

    private final NoticeService notices;
    private final NoticeMails mails;

    public NoticeMailJob(NoticeService notices, NoticeMails mails) {
        this.notices = notices;
        this.mails = mails;
    }

    @Override
    public String kind() {
        return NoticeService.JOB_KIND;
    }

    @Override
    public String run(Job job, JobProgress progress) {
        long noticeId = Long.parseLong(job.payload.replaceAll("[^0-9]", ""));
        NoticeService.MailDecision decision = notices.mailFor(noticeId, mails);
        if (decision.mail() == null) {
            return "not sent: " + decision.skipped();
        }
        try {
            mails.deliver(decision.mail());
        } catch (RuntimeException e) {
            if (job.attempts >= job.maxAttempts) {
                notices.setMailStatus(noticeId, "FAILED");
            }
            throw e;
        }
        notices.setMailStatus(noticeId, "SENT");
        return mails.outbox() ? "written to the outbox" : "sent";
    }
}
