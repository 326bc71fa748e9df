package org.roundtable.testing;

import com.icegreen.greenmail.util.GreenMail;
import com.icegreen.greenmail.util.ServerSetup;
import jakarta.mail.BodyPart;
import jakarta.mail.MessagingException;
import jakarta.mail.Multipart;
import jakarta.mail.Part;
import jakarta.mail.internet.MimeMessage;

import java.io.IOException;
import java.util.Arrays;
import java.util.List;

/**
 * A real SMTP server for tests (GreenMail, in-process) on the port the application's mailer was given
 * ({@link SmtpTestPort}); start it before and stop it after each test that reads mail.
 */
public final class Mailbox implements AutoCloseable {

    /** A received message, decoded. */
    public record Message(String to, String subject, String text, String html) {
    }

    private final int port;
    private GreenMail server;

    public Mailbox(int port) {
        this.port = port;
        start();
    }

    public void start() {
        server = new GreenMail(new ServerSetup(port, "127.0.0.1", ServerSetup.PROTOCOL_SMTP));
        server.start();
    }

    /** Stops the server: the mailer's connections are refused, as with an SMTP server that is down. */
    public void stop() {
        server.stop();
    }

    @Override
    public void close() {
        server.stop();
    }

    /** Every message received for {@code address}. */
    public List<Message> to(String address) {
        return Arrays.stream(server.getReceivedMessages()).map(Mailbox::decode)
                .filter(m -> m.to().equalsIgnoreCase(address)).toList();
    }

    public List<Message> all() {
        return Arrays.stream(server.getReceivedMessages()).map(Mailbox::decode).toList();
    }

    private static Message decode(MimeMessage m) {
        try {
            String[] parts = new String[2];
            collect(m, parts);
            return new Message(m.getAllRecipients()[0].toString(), m.getSubject(), parts[0], parts[1]);
        } catch (MessagingException | IOException e) {
            throw new IllegalStateException(e);
        }
    }

    private static void collect(Part part, String[] parts) throws MessagingException, IOException {
        if (part.isMimeType("text/plain") && parts[0] == null) {
            parts[0] = part.getContent().toString();
        } else if (part.isMimeType("text/html") && parts[1] == null) {
            parts[1] = part.getContent().toString();
        } else if (part.isMimeType("multipart/*")) {
            Multipart multipart = (Multipart) part.getContent();
            for (int i = 0; i < multipart.getCount(); i++) {
                BodyPart body = multipart.getBodyPart(i);
                collect(body, parts);
            }
        }
    }
}
