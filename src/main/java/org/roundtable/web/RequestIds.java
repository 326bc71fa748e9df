package org.roundtable.web;

import io.vertx.core.http.HttpServerRequest;
import jakarta.ws.rs.container.ContainerResponseContext;
import org.jboss.logging.MDC;
import org.jboss.resteasy.reactive.server.ServerRequestFilter;
import org.jboss.resteasy.reactive.server.ServerResponseFilter;

import java.security.SecureRandom;
import java.util.HexFormat;
import java.util.regex.Pattern;

/**
 * Gives every request an id (taken from a well-formed {@code X-Request-Id} header, else random), puts it
 * in the logging context and echoes it in the response, so a user's error message can be matched to a
 * log line.
 */
public class RequestIds {

    public static final String HEADER = "X-Request-Id";
    private static final String MDC_KEY = "requestId";
    private static final Pattern ACCEPTABLE = Pattern.compile("[A-Za-z0-9._-]{8,64}");
    private static final SecureRandom RANDOM = new SecureRandom();

    public static String current() {
        Object id = MDC.get(MDC_KEY);
        return id == null ? null : id.toString();
    }

    @ServerRequestFilter(preMatching = true)
    public void assign(HttpServerRequest request) {
        MDC.put(MDC_KEY, idFor(request.getHeader(HEADER)));
    }

    /** The id of a request: the given {@code X-Request-Id} when well-formed, else a new one. */
    static String idFor(String given) {
        return given != null && ACCEPTABLE.matcher(given).matches() ? given : newId();
    }

    @ServerResponseFilter
    public void echo(ContainerResponseContext response) {
        String id = current();
        if (id != null) {
            response.getHeaders().putSingle(HEADER, id);
        }
    }

    static String newId() {
        byte[] bytes = new byte[12];
        RANDOM.nextBytes(bytes);
        return HexFormat.of().formatHex(bytes);
    }
}
