package org.roundtable.account;

import jakarta.ws.rs.container.ContainerRequestContext;
import jakarta.ws.rs.container.ResourceInfo;
import org.jboss.resteasy.reactive.server.ServerRequestFilter;
import org.roundtable.platform.DomainException;

import java.lang.reflect.Method;

/**
 * Enforces the token scopes before the endpoint runs (403): a token that reads scores may only read; an endpoint
 * marked {@link ApiTokenScope.Required} — scores, reports, history, published results — takes only a token of that
 * scope. Requests of signed-in people pass.
 */
public class ApiTokenScopeFilter {

    /** The refusal of a token whose scope does not cover the endpoint. */
    public static class OutOfScope extends DomainException {
        public OutOfScope(ApiTokenScope needed) {
            super(403, "Not allowed", needed == ApiTokenScope.SUBMIT
                    ? "This API token reads scores only; submitting results needs a token that submits results."
                    : "This API token submits results only; reading scores needs a token that reads scores.");
        }
    }

    private final CurrentUser currentUser;

    public ApiTokenScopeFilter(CurrentUser currentUser) {
        this.currentUser = currentUser;
    }

    @ServerRequestFilter
    public void checkScope(ContainerRequestContext context, ResourceInfo resource) {
        Method method = resource.getResourceMethod();
        if (method == null || !currentUser.viaApiToken()) {
            return;
        }
        ApiTokenScope scope = currentUser.tokenScope().orElse(ApiTokenScope.SUBMIT);
        // a token that reads scores changes nothing: every request of it other than a read is refused
        String verb = context.getMethod();
        if (scope == ApiTokenScope.READ_SCORES && !"GET".equals(verb) && !"HEAD".equals(verb)) {
            throw new OutOfScope(ApiTokenScope.SUBMIT);
        }
        ApiTokenScope.Required required = method.getAnnotation(ApiTokenScope.Required.class);
        if (required == null) {
            required = resource.getResourceClass().getAnnotation(ApiTokenScope.Required.class);
        }
        if (required != null && scope != required.value()) {
            throw new OutOfScope(required.value());
        }
    }
}
