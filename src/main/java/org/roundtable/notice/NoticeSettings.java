package org.roundtable.notice;

import io.smallrye.config.ConfigMapping;
import io.smallrye.config.WithDefault;

/** Settings of the notices (application.properties, section "Notices"; docs/operations.md). */
@ConfigMapping(prefix = "roundtable.notices")
public interface NoticeSettings {

    /**
     * How e-mail leaves: {@code smtp} (Quarkus Mailer, the {@code quarkus.mailer.*} settings), {@code outbox} (kept
     * in the database for the admin's outbox page, nothing sent), {@code off} (in the application only), or
     * {@code auto}: the outbox in demo mode, SMTP otherwise.
     */
    @WithDefault("auto")
    String mail();

    /** The address people reach this installation at, for links in e-mails (no trailing slash). */
    @WithDefault("http://localhost:8080")
    String baseUrl();

    /** Attempts to send one e-mail before it is given up (delays double from 10 s to at most an hour). */
    @WithDefault("12")
    int mailAttempts();

    /** How long notices are kept, in months. */
    @WithDefault("12")
    int keepMonths();

    /**
     * How many hours before the end of a round's comment period its laboratories are told that it is ending
     * (env {@code ROUNDTABLE_COMMENT_PERIOD_NOTICE_HOURS}).
     */
    @WithDefault("48")
    int commentPeriodNoticeHours();

    /** How often the scheduled checks run (deadlines, grants, the purge); {@code off} to not run them. */
    @WithDefault("5m")
    String checkInterval();
}
