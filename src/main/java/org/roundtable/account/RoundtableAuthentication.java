package org.roundtable.account;

import io.netty.handler.codec.http.HttpHeaderNames;
import io.quarkus.security.AuthenticationFailedException;
import io.quarkus.security.identity.IdentityProviderManager;
import io.quarkus.security.identity.SecurityIdentity;
import io.quarkus.security.identity.request.AuthenticationRequest;
import io.quarkus.vertx.http.runtime.security.ChallengeData;
import io.quarkus.vertx.http.runtime.security.HttpAuthenticationMechanism;
import io.smallrye.mutiny.Uni;
import io.vertx.core.http.Cookie;
import io.vertx.ext.web.RoutingContext;
import jakarta.enterprise.context.ApplicationScoped;

import java.util.Set;

/**
 * Reads the credential of a request: an API token ({@code Authorization: Bearer}) or the session cookie.
 * An unknown or expired session cookie makes the request anonymous (the user is sent to sign in); an
 * unknown or revoked API token fails the request with 401.
 */
@ApplicationScoped
public class RoundtableAuthentication implements HttpAuthenticationMechanism {

    private final SessionCookies cookies;

    public RoundtableAuthentication(SessionCookies cookies) {
        this.cookies = cookies;
    }

    @Override
    public Uni<SecurityIdentity> authenticate(RoutingContext context, IdentityProviderManager identityProviderManager) {
        String authorization = context.request().getHeader(HttpHeaderNames.AUTHORIZATION);
        if (authorization != null) {
            if (!authorization.regionMatches(true, 0, "Bearer ", 0, 7)) {
                return Uni.createFrom().failure(new AuthenticationFailedException("unsupported authorization scheme"));
            }
            return identityProviderManager.authenticate(new Credentials.BearerToken(authorization.substring(7).strip()));
        }
        Cookie session = context.request().getCookie(cookies.sessionCookieName());
        if (session == null || session.getValue().isBlank()) {
            return Uni.createFrom().nullItem();
        }
        return identityProviderManager.authenticate(new Credentials.SessionCookie(session.getValue()))
                .onFailure(AuthenticationFailedException.class).recoverWithNull();
    }

    @Override
    public Uni<ChallengeData> getChallenge(RoutingContext context) {
        return Uni.createFrom().item(new ChallengeData(401, "WWW-Authenticate", "Bearer realm=\"roundtable\""));
    }

    @Override
    public Set<Class<? extends AuthenticationRequest>> getCredentialTypes() {
        return Set.of(Credentials.SessionCookie.class, Credentials.BearerToken.class);
    }
}
