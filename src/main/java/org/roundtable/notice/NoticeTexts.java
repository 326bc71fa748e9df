package org.roundtable.notice;

import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The words of each notice kind, made from the notice's stored facts and the reader's time zone. The same text is
 * shown in the notice list and sent by e-mail. Only facts the recipient may see are ever stored with a notice (the
 * call sites choose them); the texts add none.
 */
final class NoticeTexts {

    /** Parameters holding instants: shown in the reader's zone, the zone named. */
    static final List<String> TIMES = List.of("deadline", "until");

    private static final DateTimeFormatter TIME = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm", Locale.ROOT);

    private NoticeTexts() {
    }

    /** A notice as read: its subject line and its paragraphs. */
    record Text(String subject, List<String> paragraphs) {
    }

    static Text render(NoticeKind kind, Map<String, String> p, ZoneId zone) {
        String round = p.getOrDefault("round", "");
        return switch (kind) {
            case ROUND_OPENED -> new Text("Round " + round + " is open for results",
                    List.of("Round " + round + " accepts results from now on. The result deadline is "
                            + time(p, "deadline", zone) + ".", "Enter your laboratory's results on the round's results page."));
            case DEADLINE_IN_7_DAYS -> new Text("Round " + round + ": results due by " + time(p, "deadline", zone),
                    List.of("We have no results from your laboratory for round " + round + " yet. The result deadline is "
                            + time(p, "deadline", zone) + ", within the next 7 days."));
            case DEADLINE_IN_1_DAY -> new Text("Round " + round + ": results due within a day",
                    List.of("We have no results from your laboratory for round " + round + " yet. The result deadline is "
                            + time(p, "deadline", zone) + ", less than a day from now."));
            case DEADLINE_PASSED -> new Text("Round " + round + ": deadline passed with results missing",
                    List.of("The result deadline of round " + round + " passed at " + time(p, "deadline", zone) + ".",
                            p.getOrDefault("missing", "?") + " enrolled laboratories sent no results (participant codes: "
                                    + p.getOrDefault("codes", "") + ")."));
            case REPORT_ISSUED -> p.containsKey("report")
                    ? new Text("Round " + round + ": " + p.getOrDefault("status", "") + " report issued",
                    List.of("The " + p.getOrDefault("status", "") + " round report " + p.getOrDefault("roundReport", "")
                            + " and your laboratory's report " + p.get("report") + " have been issued.",
                            "Both are on the round's reports page."))
                    : new Text("Round " + round + ": " + p.getOrDefault("status", "") + " report issued",
                    List.of("The " + p.getOrDefault("status", "") + " round report " + p.getOrDefault("roundReport", "")
                            + " has been issued. The reports of laboratories that grant you access are with it."));
            case COMMENT_ANSWERED -> new Text("Round " + round + ": your comment was answered",
                    List.of("The round coordinator answered a comment of your laboratory on the preliminary report of round "
                            + round + ". Read the answer on the round's reports page."));
            case COMMENT_PERIOD_ENDING -> new Text("Round " + round + ": the comment period is ending",
                    List.of("The comment period on the preliminary report of round " + round + " ends at "
                                    + time(p, "until", zone) + ".",
                            "Send your laboratory's comments on the round's reports page before then."));
            case SIGN_OFF_WAITING -> new Text("Round " + round + ": a report waits for your sign-off",
                    List.of(p.getOrDefault("signer", "A coordinator") + " signed off the next report of round " + round
                            + " for evaluation run " + p.getOrDefault("version", "?") + ".",
                            "The scheme needs a second reviewer, a different coordinator, before the report is issued."));
            case GRANT_GIVEN -> new Text(p.getOrDefault("laboratory", "A laboratory") + " gave you access",
                    List.of(p.getOrDefault("laboratory", "A laboratory") + " granted you access to its performance "
                            + "history and laboratory reports until " + time(p, "until", zone) + "."));
            case GRANT_ENDING -> new Text("Your access to " + p.getOrDefault("laboratory", "a laboratory") + " ends soon",
                    List.of("Your access to the history and reports of " + p.getOrDefault("laboratory", "a laboratory")
                            + " ends at " + time(p, "until", zone) + ". Only the laboratory can extend it."));
            case GRANT_ENDED -> new Text("Your access to " + p.getOrDefault("laboratory", "a laboratory") + " ended",
                    List.of("Your access to the history and reports of " + p.getOrDefault("laboratory", "a laboratory")
                            + " ended at " + time(p, "until", zone) + "."));
            case REMINDER -> new Text("Round " + round + ": a reminder from the round coordinator",
                    List.of(p.getOrDefault("message", ""), "The result deadline is " + time(p, "deadline", zone) + "."));
            case PERFORMANCE_WARNING -> new Text("An early warning on your laboratory's performance",
                    List.of(p.getOrDefault("summary", "Look at your laboratory's history.")));
        };
    }

    /** The page a notice leads to: {@code link} when the caller gave one, else the usual page of its kind. */
    static String link(NoticeKind kind, Map<String, String> p) {
        if (p.containsKey("link") && p.get("link").startsWith("/")) {
            return p.get("link");
        }
        String round = p.get("roundId");
        return switch (kind) {
            case ROUND_OPENED, DEADLINE_IN_7_DAYS, DEADLINE_IN_1_DAY, REMINDER ->
                    round == null ? "/my-rounds" : "/my-rounds/" + round + "/results";
            case DEADLINE_PASSED -> round == null ? "/rounds" : "/rounds/" + round + "/submissions";
            case REPORT_ISSUED, COMMENT_ANSWERED, COMMENT_PERIOD_ENDING ->
                    round == null ? "/my-rounds" : "/my-rounds/" + round + "/reports";
            case SIGN_OFF_WAITING -> round == null ? "/rounds" : "/rounds/" + round + "/reports";
            case GRANT_GIVEN, GRANT_ENDING, GRANT_ENDED -> "/auditor";
            case PERFORMANCE_WARNING -> "/my-rounds";
        };
    }

    /** An instant parameter in {@code zone}, e.g. {@code 2027-03-15 17:00 Europe/Berlin}; "?" when missing. */
    static String time(Map<String, String> p, String key, ZoneId zone) {
        String value = p.get(key);
        if (value == null) {
            return "?";
        }
        try {
            return format(Instant.parse(value), zone);
        } catch (DateTimeParseException e) {
            return value;
        }
    }

    static String format(Instant instant, ZoneId zone) {
        return TIME.format(instant.atZone(zone)) + " " + zone.getId();
    }
}
