package org.roundtable.account;

import io.vertx.core.http.HttpServerRequest;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.server.ServerRequestFilter;

import java.net.URI;
import java.util.List;
import java.util.Optional;
import java.util.Set;

/**
 * Requires two-step sign-in for the roles listed in {@code roundtable.security.two-step-required-roles}
 * (production default: admin and coordinator). A signed-in user of such a role without it reaches only the
 * set-up page, its account page and sign-out; everything else sends a browser to the set-up page and answers
 * API calls with 403.
 */
@ApplicationScoped
public class TwoStepEnforcement {

    private static final Set<String> ALWAYS_ALLOWED = Set.of("/account", "/account/two-step", "/account/two-step/start",
            "/account/two-step/confirm", "/logout", "/api/v1/me");

    private final Set<String> requiredRoles;
    private final CurrentUser currentUser;

    public TwoStepEnforcement(SecuritySettings settings, CurrentUser currentUser) {
        this.requiredRoles = Set.copyOf(settings.twoStepRequiredRoles().orElse(List.of()));
        this.currentUser = currentUser;
    }

    boolean requiredFor(CurrentUser user) {
        return user.signedIn() && !user.viaApiToken() && requiredRoles.contains(user.roleName());
    }

    boolean satisfiedBy(CurrentUser user) {
        return user.twoStepOn();
    }

    @ServerRequestFilter
    public Optional<Response> enforce(HttpServerRequest request) {
        if (!requiredFor(currentUser) || satisfiedBy(currentUser) || ALWAYS_ALLOWED.contains(request.path())) {
            return Optional.empty();
        }
        if ("GET".equals(request.method().name()) && !request.path().startsWith("/api/")) {
            return Optional.of(Response.seeOther(URI.create("/account/two-step")).build());
        }
        return Optional.of(Response.status(403).type("application/json")
                .entity("{\"status\":403,\"title\":\"Two-step sign-in required\",\"detail\":\"Set up two-step sign-in first (Your account).\"}")
                .build());
    }
}
