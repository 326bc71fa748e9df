package org.roundtable.account;

import io.vertx.core.http.HttpServerRequest;
import jakarta.annotation.security.PermitAll;
import jakarta.ws.rs.HttpMethod;
import jakarta.ws.rs.container.ContainerResponseContext;
import jakarta.ws.rs.core.NewCookie;
import jakarta.ws.rs.core.Response;
import org.jboss.resteasy.reactive.server.ServerRequestFilter;
import org.jboss.resteasy.reactive.server.ServerResponseFilter;
import org.jboss.resteasy.reactive.server.SimpleResourceInfo;
import org.jboss.resteasy.reactive.server.WithFormRead;
import org.jboss.resteasy.reactive.server.core.ResteasyReactiveRequestContext;
import org.jboss.resteasy.reactive.server.spi.ResteasyReactiveContainerRequestContext;
import org.roundtable.platform.CsrfExempt;
import org.roundtable.platform.DomainException;

import java.lang.reflect.Method;
import java.net.URI;
import java.util.Set;

/**
 * Refuses cross-site state changes (ASVS v5.0.0-3.5.1 to 3.5.3): every POST, PUT, PATCH and DELETE made with
 * a browser's ambient credential (the session cookie) or to an anonymous form must carry the CSRF token (form
 * field {@code _csrf} or header {@code X-CSRF-Token}) and, when the browser names an Origin or Referer, come
 * from this site. Requests authenticated by an API token carry no ambient credential and are not checked.
 */
public class CsrfGuard {

    private static final Set<String> UNSAFE = Set.of(HttpMethod.POST, HttpMethod.PUT, HttpMethod.PATCH, HttpMethod.DELETE);

    public static class CsrfRefused extends DomainException {
        public CsrfRefused(String detail) {
            super(403, "Request refused", detail);
        }
    }

    private final CurrentUser currentUser;
    private final CsrfTokens tokens;
    private final SessionCookies cookies;

    public CsrfGuard(CurrentUser currentUser, CsrfTokens tokens, SessionCookies cookies) {
        this.currentUser = currentUser;
        this.tokens = tokens;
        this.cookies = cookies;
    }

    @ServerRequestFilter
    @WithFormRead
    public void verify(ResteasyReactiveContainerRequestContext context, SimpleResourceInfo resource,
                       HttpServerRequest request) {
        if (!UNSAFE.contains(context.getMethod()) || currentUser.viaApiToken() || exempt(resource)) {
            return;
        }
        if (!currentUser.signedIn() && !permitsAnonymous(resource)) {
            return; // authorization answers 401 first
        }
        if (!sameOrigin(request)) {
            throw new CsrfRefused("This request did not come from this site.");
        }
        String token = context.getHeaderString(CsrfTokens.HEADER);
        if (token == null) {
            Object form = ((ResteasyReactiveRequestContext) context.getServerRequestContext())
                    .getFormParameter(CsrfTokens.FIELD, true, false);
            token = form == null ? null : form.toString();
        }
        if (!tokens.accepts(token)) {
            throw new CsrfRefused("The form has expired or did not come from this site. Reload the page and try again.");
        }
    }

    @ServerResponseFilter
    public void setFormCookie(ContainerResponseContext response) {
        String created = tokens.newFormCookie();
        if (created != null) {
            NewCookie cookie = cookies.form(created);
            response.getHeaders().add("Set-Cookie", cookie);
        }
    }

    static boolean sameOrigin(HttpServerRequest request) {
        String host = request.getHeader("Host");
        String origin = request.getHeader("Origin");
        if (origin != null && !origin.isBlank()) {
            return !"null".equals(origin) && authorityMatches(origin, host);
        }
        String referer = request.getHeader("Referer");
        return referer == null || referer.isBlank() || authorityMatches(referer, host);
    }

    private static boolean authorityMatches(String url, String host) {
        try {
            String authority = URI.create(url).getRawAuthority();
            return authority != null && host != null && authority.equalsIgnoreCase(host);
        } catch (IllegalArgumentException e) {
            return false;
        }
    }

    private static boolean exempt(SimpleResourceInfo resource) {
        Method method = method(resource);
        return (method != null && method.isAnnotationPresent(CsrfExempt.class))
                || (resource.getResourceClass() != null && resource.getResourceClass().isAnnotationPresent(CsrfExempt.class));
    }

    private static boolean permitsAnonymous(SimpleResourceInfo resource) {
        Method method = method(resource);
        return (method != null && method.isAnnotationPresent(PermitAll.class))
                || (resource.getResourceClass() != null && resource.getResourceClass().isAnnotationPresent(PermitAll.class));
    }

    private static Method method(SimpleResourceInfo resource) {
        if (resource.getResourceClass() == null) {
            return null;
        }
        try {
            return resource.getResourceClass().getMethod(resource.getMethodName(), resource.parameterTypes());
        } catch (NoSuchMethodException e) {
            return null;
        }
    }
}
