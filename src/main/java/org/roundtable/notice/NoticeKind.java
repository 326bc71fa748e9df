package org.roundtable.notice;

import java.util.Arrays;
import java.util.EnumSet;
import java.util.Optional;
import java.util.Set;

/**
 * What a notice is about. {@link #code()} is stored; {@link #label()} is what people read (account page, notice list,
 * glossary). {@link #audience()} names the roles that can receive the kind, so that the account page offers only
 * the choices that matter to the reader.
 */
public enum NoticeKind {
    ROUND_OPENED("round-opened", "A round opened for results", Audience.LABORATORY),
    DEADLINE_IN_7_DAYS("deadline-7-days", "Results due within 7 days and not yet sent", Audience.LABORATORY),
    DEADLINE_IN_1_DAY("deadline-1-day", "Results due within a day and not yet sent", Audience.LABORATORY),
    DEADLINE_PASSED("deadline-passed", "A result deadline passed with results missing", Audience.COORDINATOR),
    REPORT_ISSUED("report-issued", "A report was issued", Audience.LABORATORY, Audience.AUDITOR),
    COMMENT_ANSWERED("comment-answered", "Your laboratory's comment was answered", Audience.LABORATORY),
    COMMENT_PERIOD_ENDING("comment-period-ending", "The comment period on a preliminary report is ending",
            Audience.LABORATORY),
    SIGN_OFF_WAITING("sign-off-waiting", "A report waits for your sign-off", Audience.COORDINATOR),
    GRANT_GIVEN("grant-given", "A laboratory gave you access", Audience.AUDITOR),
    GRANT_ENDING("grant-ending", "Your access to a laboratory ends within 14 days", Audience.AUDITOR),
    GRANT_ENDED("grant-ended", "Your access to a laboratory ended", Audience.AUDITOR),
    REMINDER("reminder", "A reminder from the round coordinator", Audience.LABORATORY),
    PERFORMANCE_WARNING("performance-warning", "An early warning on your laboratory's performance",
            Audience.LABORATORY);

    /** Who can receive a kind, by role. */
    public enum Audience {
        LABORATORY(Set.of("lab-manager", "lab-member")),
        COORDINATOR(Set.of("coordinator")),
        AUDITOR(Set.of("auditor"));

        private final Set<String> roles;

        Audience(Set<String> roles) {
            this.roles = roles;
        }

        boolean includes(String role) {
            return roles.contains(role);
        }
    }

    private final String code;
    private final String label;
    private final Set<Audience> audience;

    NoticeKind(String code, String label, Audience first, Audience... more) {
        this.code = code;
        this.label = label;
        this.audience = EnumSet.of(first, more);
    }

    /** The stored name, e.g. {@code round-opened}. */
    public String code() {
        return code;
    }

    /** The reader's words. */
    public String label() {
        return label;
    }

    public Set<Audience> audience() {
        return audience;
    }

    /** Whether a user of {@code role} can receive this kind. */
    public boolean reaches(String role) {
        return audience.stream().anyMatch(a -> a.includes(role));
    }

    public static Optional<NoticeKind> fromCode(String code) {
        return Arrays.stream(values()).filter(k -> k.code.equals(code)).findFirst();
    }
}
