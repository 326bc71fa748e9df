package org.roundtable.notice;

import io.quarkus.mailer.Mailer;
import io.quarkus.narayana.jta.QuarkusTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import jakarta.persistence.EntityManager;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.time.Clock;
import java.time.ZoneId;
import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;

/** Demo mode's outbox (the messages that would be sent, for the admin to read) and the purge after 12 months. */
@QuarkusTest
class NoticeOutboxTest {

    @Inject
    World world;

    @Inject
    Mailer mailer;

    @Inject
    EntityManager entityManager;

    @Inject
    NoticeSettings settings;

    @Inject
    NoticeService notices;

    @Inject
    Clock clock;

    /** The settings of this installation, with e-mail left to "auto". */
    private NoticeSettings auto() {
        return new NoticeSettings() {
            public String mail() {
                return "auto";
            }

            public String baseUrl() {
                return settings.baseUrl();
            }

            public int mailAttempts() {
                return settings.mailAttempts();
            }

            public int keepMonths() {
                return settings.keepMonths();
            }

            public String checkInterval() {
                return settings.checkInterval();
            }

            public int commentPeriodNoticeHours() {
                return settings.commentPeriodNoticeHours();
            }
        };
    }

    @Test
    void inDemoModeTheMessageThatWouldBeSentIsKeptForTheAdminToRead() {
        NoticeMails demo = new NoticeMails(mailer, entityManager, auto(), clock, true);
        assertThat(demo.outbox()).isTrue();
        assertThat(new NoticeMails(mailer, entityManager, auto(), clock, false).outbox()).isFalse();
        long user = world.userId(world.user("lab-member", world.laboratory()));
        long notice = world.insert("INSERT INTO notice (kind, object_key, recipient_id, params, link, created_at) "
                + "VALUES ('round-opened', 'outbox', ?, '{}', '/my-rounds', now()) RETURNING id", user);
        String subject = "Round " + World.unique("R") + " is open for results";
        NoticeService.Mail mail = demo.compose(notice, "lab@mail.example", "Ana Analyst",
                new NoticeTexts.Text(subject, List.of("Results are accepted from now on.")), "/my-rounds",
                ZoneId.of("Europe/Vienna"));
        QuarkusTransaction.requiringNew().run(() -> demo.deliver(mail));
        String page = world.signIn(world.user("admin", null)).request().get("/admin/outbox").then().statusCode(200)
                .extract().asString();
        assertThat(page).contains("Roundtable: " + subject).contains("To lab@mail.example")
                .contains("Times are in Europe/Vienna");
    }

    @Test
    void noticesOlderThanTwelveMonthsArePurged() {
        long user = world.userId(world.user("lab-member", world.laboratory()));
        world.sql("INSERT INTO notice (kind, object_key, recipient_id, params, link, created_at) "
                + "VALUES ('reminder', 'old', ?, '{}', '/my-rounds', now() - interval '13 months')", user);
        world.sql("INSERT INTO notice (kind, object_key, recipient_id, params, link, created_at) "
                + "VALUES ('reminder', 'recent', ?, '{}', '/my-rounds', now() - interval '11 months')", user);

        int purged = QuarkusTransaction.requiringNew().call(notices::purge);

        assertThat(purged).isGreaterThanOrEqualTo(1);
        assertThat(world.text("SELECT string_agg(object_key, ',') FROM notice WHERE recipient_id = ?", user)).isEqualTo("recent");
        assertThat(notices.unreadCount(user)).isEqualTo(1);
    }
}
