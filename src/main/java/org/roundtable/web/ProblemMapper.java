package org.roundtable.web;

import io.quarkus.qute.Location;
import io.quarkus.qute.Template;
import io.quarkus.security.AuthenticationFailedException;
import io.quarkus.security.ForbiddenException;
import io.quarkus.security.UnauthorizedException;
import jakarta.validation.ConstraintViolationException;
import jakarta.ws.rs.core.Request;
import jakarta.ws.rs.core.UriInfo;
import io.quarkus.vertx.http.runtime.security.QuarkusHttpUser;
import io.vertx.ext.web.RoutingContext;
import org.roundtable.account.SecurityLog;
import org.roundtable.platform.DomainException;
import jakarta.ws.rs.WebApplicationException;
import jakarta.ws.rs.core.HttpHeaders;
import jakarta.ws.rs.core.MediaType;
import jakarta.ws.rs.core.Response;
import org.jboss.logging.Logger;
import org.jboss.resteasy.reactive.server.ServerExceptionMapper;

import java.net.URI;
import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * The one place where failures become HTTP answers: a {@link Problem} body for API clients, the error
 * page for browsers. Unexpected failures are logged with the request id and answered with a generic
 * message, never with a class name or stack trace.
 */
public class ProblemMapper {

    private static final Logger LOG = Logger.getLogger(ProblemMapper.class);

    private final Template error;
    private final RoutingContext routing;
    private final org.roundtable.platform.Admission admission;

    public ProblemMapper(@Location("web/error.html") Template error, RoutingContext routing,
                         org.roundtable.platform.Admission admission) {
        this.error = error;
        this.routing = routing;
        this.admission = admission;
    }

    /** The caller's name without blocking: the identity already established for this request, if any. */
    private String actor() {
        try {
            if (routing.user() instanceof QuarkusHttpUser user && !user.getSecurityIdentity().isAnonymous()) {
                return user.getSecurityIdentity().getPrincipal().getName();
            }
        } catch (RuntimeException ignored) {
            // no request context: nothing to name
        }
        return "anonymous";
    }

    /** Not signed in: browsers are sent to sign in (and back afterwards), API clients get 401. */
    @ServerExceptionMapper({UnauthorizedException.class, AuthenticationFailedException.class})
    public Response unauthenticated(RuntimeException e, HttpHeaders headers, UriInfo uri, Request request) {
        SecurityLog.denied(actor(), request.getMethod(), uri.getPath(), 401);
        if (wantsHtml(headers) && "GET".equals(request.getMethod())) {
            String next = uri.getRequestUri().getRawPath()
                    + (uri.getRequestUri().getRawQuery() == null ? "" : "?" + uri.getRequestUri().getRawQuery());
            return Response.seeOther(URI.create("/login?next=" + URLEncoder.encode(next, StandardCharsets.UTF_8))).build();
        }
        Response problem = answer(401, "Sign-in required", EdgeLimits.noLongerValid(e)
                ? org.roundtable.account.ApiTokenNoLongerValid.DETAIL : "Please sign in.", List.of(), headers);
        return Response.fromResponse(problem).header("WWW-Authenticate", "Bearer realm=\"roundtable\"").build();
    }

    @ServerExceptionMapper
    public Response forbidden(ForbiddenException e, HttpHeaders headers, UriInfo uri, Request request) {
        SecurityLog.denied(actor(), request.getMethod(), uri.getPath(), 403);
        return answer(403, "Not allowed", "You are not allowed to do this.", List.of(), headers);
    }

    @ServerExceptionMapper
    public Response domain(DomainException e, HttpHeaders headers, UriInfo uri, Request request) {
        if (e.status() == 403) {
            SecurityLog.denied(actor(), request.getMethod(), uri.getPath(), 403);
        }
        List<Problem.FieldError> details = e.details().stream()
                .map(d -> new Problem.FieldError(d.row(), d.column(), d.value(), d.key(), d.message())).toList();
        Response answer = answer(e.status(), e.title(), e.detail(), details, headers);
        if (e instanceof org.roundtable.platform.Admission.Unavailable unavailable) {
            return Response.fromResponse(answer).header("Retry-After", unavailable.retryAfterSeconds()).build();
        }
        return answer;
    }

    @ServerExceptionMapper
    public Response validation(ConstraintViolationException e, HttpHeaders headers) {
        List<Problem.FieldError> errors = e.getConstraintViolations().stream()
                .map(v -> new Problem.FieldError(null, lastNode(v.getPropertyPath().toString()), null, "invalid", v.getMessage()))
                .sorted((a, b) -> a.field().compareTo(b.field()))
                .toList();
        return answer(400, "Invalid request", "Some fields are not valid.", errors, headers);
    }

    /**
     * A JSON body that cannot be read (malformed, a wrong type, or a string {@link org.roundtable.platform.TextInput}
     * refuses): 400 naming the field, never the Java type it was meant for.
     */
    @ServerExceptionMapper
    public Response json(com.fasterxml.jackson.core.JsonProcessingException e, HttpHeaders headers, UriInfo uri,
                         Request request) {
        for (Throwable cause = e.getCause(); cause != null; cause = cause.getCause()) {
            if (cause instanceof DomainException domain) {
                return domain(domain, headers, uri, request);
            }
        }
        String field = null;
        if (e instanceof com.fasterxml.jackson.databind.JsonMappingException mapping && !mapping.getPath().isEmpty()) {
            var last = mapping.getPath().get(mapping.getPath().size() - 1);
            field = last.getFieldName() != null ? last.getFieldName() : "[" + last.getIndex() + "]";
        }
        List<Problem.FieldError> errors = field == null ? List.of()
                : List.of(new Problem.FieldError(null, field, null, "invalid", "This value cannot be read."));
        return answer(400, "Invalid request", field == null ? "The JSON body cannot be read."
                : "The JSON body cannot be read at '" + field + "'.", errors, headers);
    }

    @ServerExceptionMapper
    public Response web(WebApplicationException e, HttpHeaders headers, UriInfo uri, Request request) {
        int status = e.getResponse().getStatus();
        // a body reader's failure (e.g. JSON that cannot be read) arrives wrapped: answer it as itself
        for (Throwable cause = e.getCause(); cause != null && status == 400; cause = cause.getCause()) {
            if (cause instanceof DomainException domain) {
                return domain(domain, headers, uri, request);
            }
            if (cause instanceof com.fasterxml.jackson.core.JsonProcessingException json) {
                return json(json, headers, uri, request);
            }
        }
        if (status >= 500) {
            LOG.errorf(e, "request %s failed", RequestIds.current());
            return answer(status, "Server error", "Something went wrong on our side.", List.of(), headers);
        }
        String title = switch (status) {
            case 401 -> "Sign-in required";
            case 403 -> "Not allowed";
            case 404 -> "Not found";
            case 405 -> "Method not allowed";
            case 406 -> "Not acceptable";
            case 413 -> "Too large";
            case 415 -> "Unsupported media type";
            default -> "Request failed";
        };
        String detail = switch (status) {
            case 401 -> "Please sign in.";
            case 403 -> "You are not allowed to do this.";
            case 404 -> "Nothing was found at this address.";
            case 413 -> "The request body is larger than allowed.";
            default -> title + ".";
        };
        return answer(status, title, detail, List.of(), headers);
    }

    @ServerExceptionMapper(priority = 10_000)
    public Response unexpected(Throwable e, HttpHeaders headers, UriInfo uri, Request request) {
        if (admission.isDatabaseOutage(e)) {
            // logged once per outage by Admission, not once per request
            return domain(admission.databaseUnavailable(), headers, uri, request);
        }
        LOG.errorf(e, "request %s failed", RequestIds.current());
        return answer(500, "Server error", "Something went wrong on our side.", List.of(), headers);
    }

    private Response answer(int status, String title, String detail, List<Problem.FieldError> errors, HttpHeaders headers) {
        String requestId = RequestIds.current();
        if (wantsHtml(headers)) {
            String page = error.data("status", status).data("title", title).data("detail", detail)
                    .data("errors", errors).data("requestId", requestId).render();
            return Response.status(status).type(MediaType.TEXT_HTML_TYPE.withCharset("UTF-8")).entity(page).build();
        }
        return Response.status(status).type(MediaType.APPLICATION_JSON_TYPE)
                .entity(new Problem(status, title, detail, requestId, errors)).build();
    }

    static boolean wantsHtml(HttpHeaders headers) {
        if (headers == null) {
            return false;
        }
        for (MediaType type : headers.getAcceptableMediaTypes()) {
            if (type.isCompatible(MediaType.APPLICATION_JSON_TYPE) && !type.isWildcardType()) {
                return false;
            }
            if (type.isCompatible(MediaType.TEXT_HTML_TYPE) && !type.isWildcardType()) {
                return true;
            }
        }
        return false;
    }

    private static String lastNode(String path) {
        int dot = path.lastIndexOf('.');
        return dot < 0 ? path : path.substring(dot + 1);
    }
}
