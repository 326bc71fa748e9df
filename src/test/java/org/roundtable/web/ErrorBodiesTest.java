package org.roundtable.web;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import org.junit.jupiter.api.Test;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.Socket;
import java.net.URL;
import java.nio.charset.StandardCharsets;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * Errors that arise before an endpoint (a body or headers too large) carry the same problem body as every other
 * error, with the request id. Raw sockets, since an HTTP client would refuse to send such requests.
 */
@QuarkusTest
class ErrorBodiesTest {

    @TestHTTPResource("/")
    URL base;

    @Test
    void aBodyDeclaredLargerThanAllowedGetsAProblemBodyWithTheRequestId() throws IOException {
        String answer = exchange("POST /api/v1/reports/verify HTTP/1.1\r\nHost: localhost\r\n"
                + "Content-Type: application/json\r\nX-Request-Id: too-large-0001\r\nContent-Length: 30000000\r\n\r\n", 0);
        assertThat(answer).startsWith("HTTP/1.1 413").contains("\"requestId\":\"too-large-0001\"").contains("\"status\":413");
    }

    /**
     * A chunked body (no Content-Length) is counted while the endpoint reads it; the REST layer ends the exchange
     * itself when it passes the limit, so this one 413 has no body (a known limit, see docs/operations.md).
     */
    @Test
    void aChunkedBodyGrowingPastTheLimitIsRefused() throws IOException {
        String answer = exchange("POST /api/v1/reports/verify HTTP/1.1\r\nHost: localhost\r\n"
                + "Content-Type: application/json\r\nTransfer-Encoding: chunked\r\n\r\n", 22 * 1024 * 1024);
        assertThat(answer).startsWith("HTTP/1.1 413");
    }

    @Test
    void headersLargerThanAllowedGetAProblemBody() throws IOException {
        String answer = exchange("GET /api/v1/me HTTP/1.1\r\nHost: localhost\r\nX-Filler: " + "x".repeat(30_000)
                + "\r\n\r\n", 0);
        assertThat(answer).startsWith("HTTP/1.1 431").contains("\"status\":431").contains("\"requestId\":\"");
    }

    @Test
    void anUnknownApiTokenGetsAProblemBody() throws IOException {
        String answer = exchange("GET /api/v1/me HTTP/1.1\r\nHost: localhost\r\nAuthorization: Bearer rt_nothing\r\n"
                + "Connection: close\r\n\r\n", 0);
        assertThat(answer).startsWith("HTTP/1.1 401").contains("\"status\":401").contains("\"requestId\":\"");
    }

    /** Sends the head, then {@code chunkedBytes} of chunked body (if any), and returns what the server answered. */
    private String exchange(String head, int chunkedBytes) throws IOException {
        try (Socket socket = new Socket(base.getHost(), base.getPort())) {
            socket.setSoTimeout(20_000);
            OutputStream out = socket.getOutputStream();
            out.write(head.getBytes(StandardCharsets.ISO_8859_1));
            out.flush();
            byte[] chunk = ("8000\r\n" + " ".repeat(0x8000) + "\r\n").getBytes(StandardCharsets.ISO_8859_1);
            try {
                for (int sent = 0; sent < chunkedBytes; sent += 0x8000) {
                    out.write(chunk);
                }
                if (chunkedBytes > 0) {
                    out.write("0\r\n\r\n".getBytes(StandardCharsets.ISO_8859_1));
                }
                out.flush();
            } catch (IOException closedByServer) {
                // the server may answer and close before the body is sent: read what it said
            }
            InputStream in = socket.getInputStream();
            ByteArrayOutputStream answer = new ByteArrayOutputStream();
            byte[] buffer = new byte[8192];
            try {
                for (int n; (n = in.read(buffer)) > 0; ) {
                    answer.write(buffer, 0, n);
                    String sofar = answer.toString(StandardCharsets.UTF_8);
                    if (sofar.contains("\"errors\"") || sofar.contains("content-length: 0")) {
                        break;
                    }
                }
            } catch (IOException endOfAnswer) {
                // reset after the answer
            }
            return answer.toString(StandardCharsets.UTF_8);
        }
    }
}
