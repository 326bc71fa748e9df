package org.roundtable.testing;

import io.quarkus.test.common.QuarkusTestResourceLifecycleManager;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.ServerSocket;
import java.util.Map;

/**
 * Chooses a free local port for the test SMTP server before the application starts and points Quarkus Mailer at it.
 * The server itself ({@link Mailbox}, GreenMail) is started by the tests that read mail, so that they can also stop
 * it to play a failing SMTP server.
 */
public class SmtpTestPort implements QuarkusTestResourceLifecycleManager {

    @Override
    public Map<String, String> start() {
        try (ServerSocket socket = new ServerSocket(0)) {
            return Map.of("quarkus.mailer.host", "127.0.0.1", "quarkus.mailer.port", Integer.toString(socket.getLocalPort()));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    @Override
    public void stop() {
    }
}
