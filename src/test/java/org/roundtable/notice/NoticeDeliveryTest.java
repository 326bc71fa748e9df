package org.roundtable.notice;

import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.enterprise.inject.Any;
import jakarta.enterprise.inject.Instance;
import jakarta.inject.Inject;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.roundtable.job.JobHandler;
import org.roundtable.job.JobRunner;
import org.roundtable.job.JobService;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.Mailbox;
import org.roundtable.testing.World;

import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Notices by e-mail against a real SMTP server (GreenMail): who receives each kind, once, with times in their own
 * zone; opt-outs; an SMTP server that is down; two workers and two instances' checks on one database.
 */
@QuarkusTest
class NoticeDeliveryTest {

    private static final DateTimeFormatter TIME = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm", Locale.ROOT);

    @Inject
    World world;

    @Inject
    JobRunner runner;

    @Inject
    JobService jobService;

    @Inject
    @Any
    Instance<JobHandler> handlers;

    @Inject
    NoticeService notices;

    @Inject
    NoticeSchedule schedule;

    @Inject
    org.roundtable.platform.Admission admission;

    @ConfigProperty(name = "quarkus.mailer.port")
    int smtpPort;

    private Mailbox mailbox;

    @BeforeEach
    void startSmtp() {
        // notice e-mails that earlier test classes left queued are not this test's: set aside, so that this test's
        // runners send only its own and its counts do not depend on the order of the test classes
        world.sql("UPDATE job SET status = 'FAILED', error = 'left queued by an earlier test', finished_at = now() "
                + "WHERE kind = ? AND status IN ('QUEUED', 'RUNNING')", NoticeService.JOB_KIND);
        mailbox = new Mailbox(smtpPort);
    }

    @AfterEach
    void stopSmtp() {
        mailbox.close();
    }

    /** A person with an e-mail address and, when {@code zone} is not null, a time zone of their own. */
    private String person(String role, Long laboratory, String zone) {
        String username = world.user(role, laboratory);
        world.sql("UPDATE app_user SET email = ?, time_zone = ? WHERE username = ?", address(username), zone, username);
        return username;
    }

    private static String address(String username) {
        return username + "@mail.example";
    }

    private void sendMail() {
        org.roundtable.testing.MailJobs.runAll(runner, world, NoticeService.JOB_KIND);
    }

    private Instant deadline(long round) {
        return Instant.parse(world.text("SELECT to_char(result_deadline AT TIME ZONE 'UTC', 'YYYY-MM-DD\"T\"HH24:MI:SS\"Z\"') FROM round WHERE id = ?", round));
    }

    private static String inZone(Instant instant, String zone) {
        return TIME.format(instant.atZone(ZoneId.of(zone))) + " " + zone;
    }

    @Test
    void openingARoundTellsEveryMemberOfTheEnrolledLaboratoriesOnceInTheirOwnZone() {
        long labA = world.laboratory();
        long labB = world.laboratory();
        long labC = world.laboratory();
        String tokyo = person("lab-manager", labA, "Asia/Tokyo");
        String plain = person("lab-member", labA, null);
        String chicago = person("lab-member", labB, "America/Chicago");
        String outsider = person("lab-manager", labC, "Europe/Paris");
        long round = world.round(RoundState.DISPATCHED, labA, labB);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        coordinator.json().body("{\"action\":\"OPEN_FOR_RESULTS\"}").post("/api/v1/rounds/" + round + "/transitions")
                .then().statusCode(200);
        sendMail();
        sendMail();

        Instant deadline = deadline(round);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        List<Mailbox.Message> toTokyo = mailbox.to(address(tokyo));
        assertThat(toTokyo).hasSize(1);
        assertThat(toTokyo.get(0).subject()).contains("Round " + code + " is open for results");
        assertThat(toTokyo.get(0).text()).contains(inZone(deadline, "Asia/Tokyo")).contains("/my-rounds/" + round + "/results");
        assertThat(toTokyo.get(0).html()).contains(inZone(deadline, "Asia/Tokyo"));
        // no zone of one's own: the installation's (UTC in tests), named
        assertThat(mailbox.to(address(plain))).singleElement().satisfies(m -> assertThat(m.text()).contains(inZone(deadline, "UTC")));
        assertThat(mailbox.to(address(chicago))).singleElement()
                .satisfies(m -> assertThat(m.text()).contains(inZone(deadline, "America/Chicago")));
        assertThat(mailbox.to(address(outsider))).isEmpty();

        // the same notice again (a retried call) is a no-op
        boolean again = QuarkusTransaction.requiringNew().call(() -> notices.notify(NoticeKind.ROUND_OPENED, "round:" + round,
                world.userId(tokyo), Map.of("round", code, "roundId", round)));
        sendMail();
        assertThat(again).isFalse();
        assertThat(mailbox.to(address(tokyo))).hasSize(1);
    }

    @Test
    void scheduledChecksRunOnTwoInstancesCreateEachDeadlineAndGrantNoticeOnce() throws Exception {
        long silent = world.laboratory();
        long diligent = world.laboratory();
        String silentManager = person("lab-manager", silent, "Europe/Berlin");
        String diligentManager = person("lab-manager", diligent, null);
        String coordinator = person("coordinator", null, "America/New_York");
        long round = world.round(RoundState.OPEN_FOR_RESULTS, silent, diligent);
        world.submitCr(round, diligent, "18.21");
        String code = world.text("SELECT code FROM round WHERE id = ?", round);
        String silentCode = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, silent);
        String diligentCode = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", round, diligent);

        // five days ahead: "within 7 days", to the laboratory without results only; two instances check at once
        world.sql("UPDATE round SET result_deadline = now() + interval '5 days' WHERE id = ?", round);
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(silentManager))).singleElement().satisfies(m -> {
            assertThat(m.subject()).contains("Round " + code + ": results due by");
            assertThat(m.text()).contains(inZone(deadline(round), "Europe/Berlin"));
        });
        assertThat(mailbox.to(address(diligentManager))).isEmpty();

        // half a day ahead: "within a day"
        world.sql("UPDATE round SET result_deadline = now() + interval '12 hours' WHERE id = ?", round);
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(silentManager))).hasSize(2);
        assertThat(mailbox.to(address(silentManager)).get(1).subject()).contains("results due within a day");

        // passed: the coordinator, with the missing participant code; the laboratories hear nothing more
        world.sql("UPDATE round SET result_deadline = now() - interval '1 hour' WHERE id = ?", round);
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(coordinator))).singleElement().satisfies(m -> {
            assertThat(m.subject()).contains("deadline passed with results missing");
            assertThat(m.text()).contains(silentCode).doesNotContain(diligentCode)
                    .contains(inZone(deadline(round), "America/New_York"));
        });
        assertThat(mailbox.to(address(silentManager))).hasSize(2);

        // grants: one ending within 14 days, one ended
        String auditor = person("auditor", null, "Asia/Kolkata");
        long ending = world.grant(silent, auditor);
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '60 days', valid_until = now() + interval '10 days' WHERE id = ?", ending);
        long ended = world.grant(diligent, auditor);
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '60 days', valid_until = now() - interval '2 hours' WHERE id = ?", ended);
        checkOnTwoInstances();
        sendMail();
        List<Mailbox.Message> toAuditor = mailbox.to(address(auditor));
        assertThat(toAuditor).hasSize(2);
        String silentName = world.text("SELECT name FROM laboratory WHERE id = ?", silent);
        String diligentName = world.text("SELECT name FROM laboratory WHERE id = ?", diligent);
        assertThat(toAuditor).anySatisfy(m -> assertThat(m.subject()).isEqualTo("Roundtable: Your access to " + silentName + " ends soon"));
        assertThat(toAuditor).anySatisfy(m -> {
            assertThat(m.subject()).isEqualTo("Roundtable: Your access to " + diligentName + " ended");
            assertThat(m.text()).contains("Asia/Kolkata");
        });
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(auditor))).hasSize(2);
    }

    @Test
    void theEndOfACommentPeriodIsToldOnceToEachLaboratoryTwoDaysBeforeInTheReadersZone() throws Exception {
        long first = world.laboratory();
        long second = world.laboratory();
        String berlin = person("lab-member", first, "Europe/Berlin");
        String plain = person("lab-manager", second, null);
        long round = world.round(RoundState.COMMENT_PERIOD, first, second);
        String code = world.text("SELECT code FROM round WHERE id = ?", round);

        // three days before the end: too early (the notice goes 48 hours before, the tests' and default setting)
        world.sql("UPDATE round SET comment_period_ends_at = now() + interval '3 days' WHERE id = ?", round);
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(berlin))).isEmpty();

        // within two days of the end: each laboratory once, although two instances check twice
        world.sql("UPDATE round SET comment_period_ends_at = now() + interval '36 hours' WHERE id = ?", round);
        Instant end = Instant.parse(world.text("SELECT to_char(comment_period_ends_at AT TIME ZONE 'UTC', "
                + "'YYYY-MM-DD\"T\"HH24:MI:SS\"Z\"') FROM round WHERE id = ?", round));
        checkOnTwoInstances();
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(berlin))).singleElement().satisfies(m -> {
            assertThat(m.subject()).isEqualTo("Roundtable: Round " + code + ": the comment period is ending");
            assertThat(m.text()).contains("ends at " + inZone(end, "Europe/Berlin"))
                    .contains("/my-rounds/" + round + "/reports");
            assertThat(m.html()).contains(inZone(end, "Europe/Berlin"));
        });
        assertThat(mailbox.to(address(plain))).singleElement()
                .satisfies(m -> assertThat(m.text()).contains(inZone(end, "UTC")));
        assertThat(world.text("SELECT count(*)::text FROM notice WHERE kind = 'comment-period-ending' AND object_key = ?",
                "comment-period:" + round)).isEqualTo("2");

        // a comment period that has ended already is not announced
        long late = world.laboratory();
        String lateMember = person("lab-member", late, "Europe/Berlin");
        long ended = world.round(RoundState.COMMENT_PERIOD, late);
        world.sql("UPDATE round SET comment_period_ends_at = now() - interval '1 hour' WHERE id = ?", ended);
        checkOnTwoInstances();
        sendMail();
        assertThat(mailbox.to(address(lateMember))).isEmpty();
    }

    @Test
    void aDeadlineWithinADayAGrantGivenAndAGrantEndingNameTheTimeInTheRecipientsZone() {
        // the three timed kinds the tests above check only by subject: the time in the reader's own zone, named,
        // in the e-mail's text and HTML and in the notice list
        long lab = world.laboratory();
        String manager = person("lab-manager", lab, "Asia/Tokyo");
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        world.sql("UPDATE round SET result_deadline = now() + interval '12 hours' WHERE id = ?", round);
        schedule.runChecks();
        sendMail();
        Instant deadline = deadline(round);
        assertThat(mailbox.to(address(manager))).singleElement().satisfies(m -> {
            assertThat(m.subject()).contains("results due within a day");
            assertThat(m.text()).contains(inZone(deadline, "Asia/Tokyo"));
            assertThat(m.html()).contains(inZone(deadline, "Asia/Tokyo"));
        });
        assertThat(world.signIn(manager).request().get("/notices").then().statusCode(200).extract().asString())
                .contains(inZone(deadline, "Asia/Tokyo"));

        String auditor = person("auditor", null, "Pacific/Auckland");
        long auditorId = world.userId(auditor);
        long ending = world.grant(lab, auditor);
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '60 days', valid_until = now() + interval '10 days' WHERE id = ?", ending);
        Instant until = Instant.parse(world.text("SELECT to_char(valid_until AT TIME ZONE 'UTC', "
                + "'YYYY-MM-DD\"T\"HH24:MI:SS\"Z\"') FROM auditor_grant WHERE id = ?", ending));
        String name = world.text("SELECT name FROM laboratory WHERE id = ?", lab);
        Instant given = Instant.parse("2027-06-30T22:00:00Z"); // 2027-07-01 10:00 in Auckland (NZST, UTC+12)
        QuarkusTransaction.requiringNew().run(() -> notices.notify(NoticeKind.GRANT_GIVEN, "grant:zone-" + ending,
                auditorId, Map.of("laboratory", name, "until", given)));
        schedule.runChecks();
        sendMail();
        List<Mailbox.Message> toAuditor = mailbox.to(address(auditor));
        assertThat(toAuditor).hasSize(2);
        assertThat(toAuditor).anySatisfy(m -> {
            assertThat(m.subject()).contains(name + " gave you access");
            assertThat(m.text()).contains("2027-07-01 10:00 Pacific/Auckland");
            assertThat(m.html()).contains("2027-07-01 10:00 Pacific/Auckland");
        });
        assertThat(toAuditor).anySatisfy(m -> {
            assertThat(m.subject()).contains("Your access to " + name + " ends soon");
            assertThat(m.text()).contains(inZone(until, "Pacific/Auckland"));
        });
        assertThat(world.signIn(auditor).request().get("/notices").then().statusCode(200).extract().asString())
                .contains("2027-07-01 10:00 Pacific/Auckland").contains(inZone(until, "Pacific/Auckland"));
    }

    private void checkOnTwoInstances() throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            Callable<Integer> check = schedule::runChecks;
            List<Future<Integer>> runs = pool.invokeAll(List.of(check, check));
            for (Future<Integer> run : runs) {
                run.get();
            }
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void anOptedOutKindStaysInTheListButComesByNoEMail() {
        long lab = world.laboratory();
        String manager = world.user("lab-manager", lab);
        String auditor = person("auditor", null, null);
        World.Browser auditorBrowser = world.signIn(auditor);
        // the auditor keeps every kind by e-mail except "grant given"
        auditorBrowser.form().formParam("byEmail", "grant-ending").formParam("byEmail", "grant-ended")
                .formParam("byEmail", "report-issued").post("/notices/choices").then().statusCode(303);
        assertThat(world.text("SELECT string_agg(kind, ',') FROM notice_opt_out WHERE user_id = ?", world.userId(auditor)))
                .isEqualTo("grant-given");

        world.signIn(manager).json().body("{\"auditorUsername\":\"" + auditor + "\",\"validUntil\":\"" + java.time.OffsetDateTime.now().plusDays(100) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants").then().statusCode(200);
        sendMail();

        assertThat(mailbox.to(address(auditor))).isEmpty();
        assertThat(world.text("SELECT mail_status FROM notice WHERE recipient_id = ? AND kind = 'grant-given'",
                world.userId(auditor))).isEqualTo("OPTED_OUT");
        String page = auditorBrowser.request().get("/notices").then().statusCode(200).extract().asString();
        assertThat(page).contains("gave you access").contains("1 unread of 1");
        assertThat(auditorBrowser.request().get("/account").then().statusCode(200).extract().asString())
                .contains("Notices by e-mail").contains("value=\"grant-given\">");
    }

    @Test
    void aFailingSmtpServerIsRetriedLaterAndNeverFailsTheRequest() {
        long lab = world.laboratory();
        String manager = world.user("lab-manager", lab);
        String auditor = person("auditor", null, null);
        mailbox.stop();

        world.signIn(manager).json().body("{\"auditorUsername\":\"" + auditor + "\",\"validUntil\":\"" + java.time.OffsetDateTime.now().plusDays(100) + "\"}")
                .post("/api/v1/my-laboratory/auditor-grants").then().statusCode(200);
        long notice = Long.parseLong(world.text("SELECT id::text FROM notice WHERE recipient_id = ?", world.userId(auditor)));
        sendMail();

        String job = "{\"notice\":" + notice + "}";
        assertThat(world.text("SELECT status || ' ' || attempts || ' ' || (not_before > now()) FROM job WHERE payload = ?", job))
                .isEqualTo("QUEUED 1 true");
        assertThat(world.text("SELECT mail_status FROM notice WHERE id = ?", notice)).isEqualTo("QUEUED");
        // the notice is in the application already
        assertThat(world.signIn(auditor).request().get("/notices").then().statusCode(200).extract().asString())
                .contains("gave you access");

        mailbox.start();
        world.sql("UPDATE job SET not_before = now() - interval '1 second' WHERE payload = ?", job);
        sendMail();
        sendMail();
        assertThat(mailbox.to(address(auditor))).singleElement()
                .satisfies(m -> assertThat(m.subject()).contains("gave you access"));
        assertThat(world.text("SELECT status || ' ' || attempts FROM job WHERE payload = ?", job)).isEqualTo("SUCCEEDED 2");
        assertThat(world.text("SELECT mail_status FROM notice WHERE id = ?", notice)).isEqualTo("SENT");
    }

    @Test
    void twoWorkersOnOneDatabaseSendEachMailOnceAndTwoCallersCreateOneNotice() throws Exception {
        String member = person("lab-member", world.laboratory(), null);
        long user = world.userId(member);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            // the same notice asked for twice at the same moment
            Callable<Boolean> same = () -> QuarkusTransaction.requiringNew().call(() -> notices.notify(NoticeKind.REMINDER,
                    "test:same", user, Map.of("round", "R-SAME", "message", "Send your results.")));
            List<Future<Boolean>> created = pool.invokeAll(List.of(same, same));
            assertThat(created.get(0).get() ^ created.get(1).get()).isTrue();
            for (int i = 0; i < 12; i++) {
                int n = i;
                QuarkusTransaction.requiringNew().run(() -> notices.notify(NoticeKind.REMINDER, "test:many:" + n + ":" + user,
                        user, Map.of("round", "R-" + n, "message", "Reminder number " + n)));
            }
            JobRunner first = new JobRunner(jobService, handlers, admission);
            JobRunner second = new JobRunner(jobService, handlers, admission);
            Callable<Integer> drainFirst = () -> drain(first);
            Callable<Integer> drainSecond = () -> drain(second);
            int ran = 0;
            for (Future<Integer> f : pool.invokeAll(List.of(drainFirst, drainSecond))) {
                ran += f.get();
            }
            assertThat(ran).isGreaterThanOrEqualTo(13);
        } finally {
            pool.shutdown();
        }
        sendMail(); // a send the test SMTP server timed out is retried (each notice still goes once)
        // the SMTP server may still be storing the last message the job handed over
        List<Mailbox.Message> received = mailbox.to(address(member));
        for (int wait = 0; wait < 50 && received.size() < 13; wait++) {
            Thread.sleep(200);
            received = mailbox.to(address(member));
        }
        assertThat(received).hasSize(13);
        assertThat(received.stream().map(Mailbox.Message::subject).distinct()).hasSize(13);
    }

    private static int drain(JobRunner runner) {
        int ran = 0;
        while (runner.runNext(NoticeService.JOB_KIND)) {
            ran++;
        }
        return ran;
    }

    @Test
    void aCoordinatorsReminderReachesTheLaboratoriesWithoutResults() {
        long silent = world.laboratory();
        long diligent = world.laboratory();
        String silentMember = person("lab-member", silent, "Australia/Sydney");
        String diligentMember = person("lab-member", diligent, null);
        long round = world.round(RoundState.OPEN_FOR_RESULTS, silent, diligent);
        world.submitCr(round, diligent, "18.30");

        int reached = world.signIn(world.user("coordinator", null)).json()
                .body("{\"message\":\"Please send the Cr result of item A this week.\"}")
                .post("/api/v1/rounds/" + round + "/reminders").then().statusCode(201).extract().path("recipients");
        sendMail();

        assertThat(reached).isEqualTo(1);
        assertThat(mailbox.to(address(silentMember))).singleElement().satisfies(m -> {
            assertThat(m.subject()).contains("a reminder from the round coordinator");
            assertThat(m.text()).contains("Please send the Cr result of item A this week.")
                    .contains(inZone(deadline(round), "Australia/Sydney"));
        });
        assertThat(mailbox.to(address(diligentMember))).isEmpty();
        assertThat(world.text("SELECT count(*)::text FROM audit_event WHERE action = 'notice.reminder-sent' AND detail LIKE ?",
                "round=" + round + " %")).isEqualTo("1");
    }
}
