package org.roundtable.web;

import io.quarkus.runtime.configuration.MemorySize;
import io.vertx.core.MultiMap;
import io.vertx.core.http.HttpHeaders;
import io.vertx.core.http.HttpServerRequest;
import io.vertx.core.http.HttpServerResponse;
import io.vertx.core.json.JsonObject;
import io.vertx.ext.web.Router;
import io.vertx.ext.web.RoutingContext;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.event.Observes;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.platform.Admission;

import java.util.Map;

/**
 * The limits that are enforced before a request reaches an endpoint, answered with the same problem body as every
 * other error (status, title, detail, request id): a body larger than {@code quarkus.http.limits.max-body-size}
 * (413) and headers larger than {@code roundtable.http.max-header-size} (431). The HTTP codec's own header limit
 * ({@code quarkus.http.limits.max-header-size}) is set well above ours, so that requests reach this check; only a
 * request beyond the codec's limit still gets the codec's bare answer.
 * <p>
 * Submissions through the JSON API that carry a credential take their place in the submission queue here, on the event
 * loop, before they wait for a worker thread ({@link Admission#submissionQueue()}): a free place is held until the response ends;
 * without one the request is looked at again every 20 ms for the queue's short wait, then answered 503 with
 * {@code Retry-After} (the worker pool's own queue, which has no bound, is never reached).
 * <p>
 * A failure handler gives the same body to an API token refused during authentication (401), which Quarkus would
 * otherwise answer with an empty challenge.
 */
@ApplicationScoped
public class EdgeLimits {

    private final long maxBodyBytes;
    private final long maxHeaderBytes;
    private final Admission admission;

    public EdgeLimits(@ConfigProperty(name = "quarkus.http.limits.max-body-size") MemorySize maxBody,
                      @ConfigProperty(name = "roundtable.http.max-header-size", defaultValue = "20K") MemorySize maxHeader,
                      Admission admission) {
        this.admission = admission;
        this.maxBodyBytes = maxBody.asLongValue();
        this.maxHeaderBytes = maxHeader.asLongValue();
    }

    void install(@Observes Router router) {
        router.route().order(Integer.MIN_VALUE + 10).handler(this::check);
        router.route().order(Integer.MIN_VALUE + 10).failureHandler(this::failed);
    }

    private void check(RoutingContext context) {
        HttpServerRequest request = context.request();
        long headerBytes = request.uri().length() + 16L;
        for (Map.Entry<String, String> header : request.headers()) {
            headerBytes += header.getKey().length() + header.getValue().length() + 4L;
        }
        if (headerBytes > maxHeaderBytes) {
            problem(context, 431, "Headers too large", "The request's headers are larger than allowed.");
            return;
        }
        if (!admission.databaseAvailable() && !request.path().startsWith("/q/") && !request.path().startsWith("/assets/")) {
            context.response().headers().set("Retry-After", "5");
            Admission.Unavailable refused = admission.databaseUnavailable();
            problem(context, 503, refused.title(), refused.detail());
            return;
        }
        String length = request.getHeader(HttpHeaders.CONTENT_LENGTH);
        if (length != null) {
            try {
                if (Long.parseLong(length.strip()) > maxBodyBytes) {
                    problem(context, 413, "Too large", "The request body is larger than allowed.");
                    return;
                }
            } catch (NumberFormatException e) {
                problem(context, 400, "Invalid request", "The Content-Length header is not a number.");
                return;
            }
        }
        if (request.method() == io.vertx.core.http.HttpMethod.POST && SUBMISSION_API.matcher(context.normalizedPath()).matches()
                && carriesCredentials(request)) {
            admitSubmission(context, System.nanoTime() + admission.submissionQueue().waitFor().toNanos());
            return;
        }
        context.next();
    }

    /**
     * Whether the request carries a credential (an API token or a cookie, which may be a session): only these take a
     * place in the submission queue, so that anonymous requests, which authentication refuses at once with 401, cannot
     * fill it. A forged credential still takes a place until authentication refuses it, which happens before its body
     * is read.
     */
    static boolean carriesCredentials(HttpServerRequest request) {
        return request.getHeader(HttpHeaders.AUTHORIZATION) != null || request.getHeader(HttpHeaders.COOKIE) != null;
    }

    /** POST of results through the JSON API (JSON body or file), on the normalised path. */
    private static final java.util.regex.Pattern SUBMISSION_API =
            java.util.regex.Pattern.compile("/api/v1/my-rounds/[^/]+/submission(/file)?/?");

    private void admitSubmission(RoutingContext context, long until) {
        Admission.Slot place = admission.submissionQueue().tryEnter();
        if (place != null) {
            java.util.concurrent.atomic.AtomicBoolean left = new java.util.concurrent.atomic.AtomicBoolean();
            context.addEndHandler(ended -> {
                if (left.compareAndSet(false, true)) {
                    place.close();
                }
            });
            context.next();
            return;
        }
        if (context.response().closed()) {
            return;
        }
        if (System.nanoTime() >= until) {
            Admission.Unavailable refused = admission.submissionQueue().refusal();
            context.response().headers().set("Retry-After", Integer.toString(refused.retryAfterSeconds()));
            problem(context, 503, refused.title(), refused.detail());
            return;
        }
        context.vertx().setTimer(20, id -> admitSubmission(context, until));
    }

    private void failed(RoutingContext context) {
        if (context.failure() != null && admission.isDatabaseOutage(context.failure()) && !context.response().headWritten()) {
            // e.g. the session lookup during authentication found the database gone
            context.response().headers().set("Retry-After", "5");
            Admission.Unavailable refused = admission.databaseUnavailable();
            problem(context, 503, refused.title(), refused.detail());
            return;
        }
        if (context.failure() instanceof io.quarkus.security.AuthenticationFailedException
                && !context.response().headWritten()) {
            // an unknown or revoked API token: the same 401 problem body the endpoints give
            org.roundtable.account.SecurityLog.denied("anonymous", context.request().method().name(),
                    context.request().path(), 401);
            context.response().headers().set("WWW-Authenticate", "Bearer realm=\"roundtable\"");
            problem(context, 401, "Sign-in required", noLongerValid(context.failure())
                    ? org.roundtable.account.ApiTokenNoLongerValid.DETAIL
                    : "The API token is not valid. Please sign in or use a valid token.");
            return;
        }
        int status = context.statusCode();
        if ((status == 413 || status == 431) && !context.response().headWritten()) {
            problem(context, status, status == 413 ? "Too large" : "Headers too large",
                    status == 413 ? "The request body is larger than allowed." : "The request's headers are larger than allowed.");
            return;
        }
        context.next();
    }

    /** Whether the failure (or a cause of it) is a revoked or expired API token. */
    static boolean noLongerValid(Throwable failure) {
        for (Throwable t = failure; t != null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof org.roundtable.account.ApiTokenNoLongerValid) {
                return true;
            }
        }
        return false;
    }

    /** Ends the exchange with a problem body carrying the request id (taken from the request or new). */
    static void problem(RoutingContext context, int status, String title, String detail) {
        HttpServerRequest request = context.request();
        String id = RequestIds.idFor(request.getHeader(RequestIds.HEADER));
        HttpServerResponse response = context.response();
        MultiMap headers = response.headers();
        headers.set(HttpHeaders.CONTENT_TYPE, "application/json");
        headers.set(RequestIds.HEADER, id);
        if (status == 413 || status == 431) {
            headers.set(HttpHeaders.CONNECTION, "close");
        }
        String body = new JsonObject().put("status", status).put("title", title).put("detail", detail)
                .put("requestId", id).put("errors", new io.vertx.core.json.JsonArray()).encode();
        response.setStatusCode(status).end(body);
    }
}
