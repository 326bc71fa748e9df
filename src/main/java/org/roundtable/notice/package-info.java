/**
 * Notices that reach people: in the application (a list per person with the unread count in the header, kept
 * 12 months) and by e-mail (plain text and HTML, through the SMTP server configured from the environment, or the
 * admin's outbox in demo mode), each sent once, never blocking the request that caused it.
 *
 * <h2>For other features: one call</h2>
 * <pre>{@code
 * notices.notify(NoticeKind.PERFORMANCE_WARNING, "history:" + laboratoryId + ":" + roundCode, userId,
 *         Map.of("summary", "Two z-scores of Cr above 2 in the last three rounds.", "link", "/my-history"));
 * }</pre>
 * {@link org.roundtable.notice.NoticeService#notify NoticeService.notify(kind, objectKey, recipientUserId, params)}
 * creates a notice in the caller's transaction; when it commits the person sees it, and an e-mail job (job table,
 * kind {@value org.roundtable.notice.NoticeService#JOB_KIND}) sends it. The same (kind, objectKey, recipient) a
 * second time is a no-op (UNIQUE key), so a caller may call again after a retry or from a second instance. The
 * helpers {@code notifyLaboratory}, {@code notifyLaboratoriesOfRound}, {@code notifyCoordinators} and
 * {@code notifyAuditorsGrantedBy} choose the recipients. Params are the facts the words are made from; instants under
 * {@code deadline} or {@code until} are shown in the reader's time zone ({@code app_user.time_zone}, else
 * {@code roundtable.display.time-zone}), the zone named. Pass only what the recipient may see: never another
 * laboratory's identity or results to a laboratory.
 *
 * <h2>Kinds</h2>
 * {@link org.roundtable.notice.NoticeKind}: each with its words ({@code NoticeTexts}) and the page it links to; a
 * person may opt out of any kind by e-mail (account page), never out of the list.
 *
 * <h2>Reliability</h2>
 * E-mails are sent by {@link org.roundtable.notice.NoticeMailJob} from the job runner: one worker of any instance
 * claims a job ({@code FOR UPDATE SKIP LOCKED}); a failing SMTP server is retried with doubling delays up to
 * {@code roundtable.notices.mail-attempts}. {@link org.roundtable.notice.NoticeSchedule} creates the notices that no
 * request causes (deadlines, grants ending and ended) and purges old ones; every instance runs it, the UNIQUE key
 * makes it create each notice once.
 */
package org.roundtable.notice;
