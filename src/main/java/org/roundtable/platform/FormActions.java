package org.roundtable.platform;

import io.quarkus.qute.TemplateInstance;
import io.vertx.core.http.HttpServerRequest;
import jakarta.ws.rs.core.Response;

import java.util.function.Function;
import java.util.function.Supplier;

/** Shared handling of HTML form posts, so that every page answers failures the same way. */
public final class FormActions {

    private FormActions() {
    }

    /**
     * Runs a form action. "Not found" and "not allowed" propagate to the error mapper (so another laboratory's
     * object looks exactly like a missing one); other domain failures re-render the page with the message and the
     * failure's status.
     */
    public static Response attempt(Supplier<TemplateInstance> action, Function<String, TemplateInstance> onError) {
        try {
            return Response.ok(action.get()).build();
        } catch (DomainException.NotFound | DomainException.Forbidden e) {
            throw e;
        } catch (DomainException e) {
            return Response.status(e.status()).entity(onError.apply(e.detail())).build();
        }
    }

    /** Scheme and authority of the request, for links shown to the user (one-time links). */
    public static String baseUrl(HttpServerRequest request) {
        return request.scheme() + "://" + request.authority();
    }
}
