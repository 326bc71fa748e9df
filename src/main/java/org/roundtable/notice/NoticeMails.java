package org.roundtable.notice;

import io.quarkus.mailer.Mail;
import io.quarkus.mailer.Mailer;
import io.quarkus.qute.CheckedTemplate;
import io.quarkus.qute.TemplateInstance;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.platform.Timestamps;

import java.time.Clock;
import java.time.ZoneId;
import java.util.List;
import java.util.Locale;

/**
 * Writes a notice's e-mail (plain text and HTML, the same words as in the application, times in the recipient's
 * zone with the zone named) and hands it to the way mail leaves this installation ({@link NoticeSettings#mail()}):
 * the SMTP server through Quarkus Mailer, or the outbox table the admin reads in demo mode.
 */
@ApplicationScoped
public class NoticeMails {

    @CheckedTemplate(basePath = "notice")
    static class Templates {
        static native TemplateInstance mail(String name, String subject, List<String> paragraphs, String link,
                                            String zone, String accountLink);
    }

    enum Way { SMTP, OUTBOX, OFF }

    private final Mailer mailer;
    private final EntityManager entityManager;
    private final NoticeSettings settings;
    private final Clock clock;
    private final Way way;

    public NoticeMails(Mailer mailer, EntityManager entityManager, NoticeSettings settings, Clock clock,
                       @ConfigProperty(name = "roundtable.demo.enabled", defaultValue = "false") boolean demo) {
        this.mailer = mailer;
        this.entityManager = entityManager;
        this.settings = settings;
        this.clock = clock;
        String chosen = settings.mail().strip().toLowerCase(Locale.ROOT);
        this.way = switch (chosen) {
            case "smtp" -> Way.SMTP;
            case "outbox" -> Way.OUTBOX;
            case "off" -> Way.OFF;
            case "auto" -> demo ? Way.OUTBOX : Way.SMTP;
            default -> throw new IllegalStateException("roundtable.notices.mail is smtp, outbox, off or auto, not " + chosen);
        };
    }

    /** Whether e-mail leaves at all (SMTP or the outbox). */
    boolean sending() {
        return way != Way.OFF;
    }

    /** Whether messages go to the outbox (demo) rather than to an SMTP server. */
    public boolean outbox() {
        return way == Way.OUTBOX;
    }

    NoticeService.Mail compose(long noticeId, String to, String name, NoticeTexts.Text text, String link, ZoneId zone) {
        String base = settings.baseUrl().replaceAll("/+$", "");
        String url = base + (link == null ? "/notices" : link);
        String account = base + "/account";
        StringBuilder plain = new StringBuilder();
        plain.append("Hello ").append(name).append(",\n\n");
        for (String paragraph : text.paragraphs()) {
            plain.append(paragraph).append("\n\n");
        }
        plain.append("Open the page: ").append(url).append("\n\n");
        plain.append("-- \nTimes are in ").append(zone.getId()).append(". ")
                .append("You receive this because of your Roundtable account. Choose which notices come by e-mail ")
                .append("on your account page: ").append(account).append('\n');
        String html = Templates.mail(name, text.subject(), text.paragraphs(), url, zone.getId(), account).render();
        return new NoticeService.Mail(noticeId, to, "Roundtable: " + text.subject(), plain.toString(), html);
    }

    /** Sends the message; throws when the SMTP server refuses or cannot be reached (the job then retries). */
    void deliver(NoticeService.Mail mail) {
        switch (way) {
            case SMTP -> mailer.send(Mail.withText(mail.to(), mail.subject(), mail.text()).setHtml(mail.html()));
            case OUTBOX -> writeToOutbox(mail);
            case OFF -> {
            }
        }
    }

    @Transactional(Transactional.TxType.REQUIRES_NEW)
    void writeToOutbox(NoticeService.Mail mail) {
        entityManager.createNativeQuery("""
                INSERT INTO mail_outbox (notice_id, to_address, subject, text_body, html_body, written_at)
                VALUES (:n, :to, :s, :t, :h, :at)
                """).setParameter("n", mail.noticeId()).setParameter("to", mail.to()).setParameter("s", mail.subject())
                .setParameter("t", mail.text()).setParameter("h", mail.html()).setParameter("at", Timestamps.now(clock))
                .executeUpdate();
    }
}
