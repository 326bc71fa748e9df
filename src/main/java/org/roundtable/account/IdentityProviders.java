package org.roundtable.account;

import io.quarkus.security.AuthenticationFailedException;
import io.quarkus.security.identity.AuthenticationRequestContext;
import io.quarkus.security.identity.IdentityProvider;
import io.quarkus.security.identity.SecurityIdentity;
import io.quarkus.security.runtime.QuarkusPrincipal;
import io.quarkus.security.runtime.QuarkusSecurityIdentity;
import io.smallrye.mutiny.Uni;
import jakarta.enterprise.context.ApplicationScoped;

/** Turns credentials into identities, reading the database on every request (off the event loop). */
final class IdentityProviders {

    private IdentityProviders() {
    }

    @ApplicationScoped
    static class SessionIdentityProvider implements IdentityProvider<Credentials.SessionCookie> {

        private final SessionService sessions;

        SessionIdentityProvider(SessionService sessions) {
            this.sessions = sessions;
        }

        @Override
        public Class<Credentials.SessionCookie> getRequestType() {
            return Credentials.SessionCookie.class;
        }

        @Override
        public Uni<SecurityIdentity> authenticate(Credentials.SessionCookie request, AuthenticationRequestContext context) {
            return context.runBlocking(() -> sessions.resolve(request.token)
                    .map(p -> (SecurityIdentity) QuarkusSecurityIdentity.builder()
                            .setPrincipal(new QuarkusPrincipal(p.username()))
                            .addRole(p.role().roleName())
                            .addAttribute(IdentityAttributes.USER_ID, p.userId())
                            .addAttribute(IdentityAttributes.DISPLAY_NAME, p.displayName())
                            .addAttribute(IdentityAttributes.SESSION_HASH, p.sessionHash())
                            .addAttribute(IdentityAttributes.TWO_STEP_ON, p.twoStepOn())
                            .addAttribute(IdentityAttributes.METHOD, IdentityAttributes.METHOD_SESSION)
                            .addAttribute(IdentityAttributes.LABORATORY_ID, p.laboratoryId() == null ? -1L : p.laboratoryId())
                            .build())
                    .orElseThrow(() -> new AuthenticationFailedException("no live session")));
        }
    }

    @ApplicationScoped
    static class BearerTokenIdentityProvider implements IdentityProvider<Credentials.BearerToken> {

        private final ApiTokenService tokens;

        BearerTokenIdentityProvider(ApiTokenService tokens) {
            this.tokens = tokens;
        }

        @Override
        public Class<Credentials.BearerToken> getRequestType() {
            return Credentials.BearerToken.class;
        }

        @Override
        public Uni<SecurityIdentity> authenticate(Credentials.BearerToken request, AuthenticationRequestContext context) {
            return context.runBlocking(() -> {
                ApiTokenService.Resolution found = tokens.resolution(request.token);
                if (found instanceof ApiTokenService.Resolution.NoLongerValid gone) {
                    throw new AuthenticationFailedException("API token no longer valid",
                            new ApiTokenNoLongerValid(gone.revoked()));
                }
                if (!(found instanceof ApiTokenService.Resolution.Valid valid)) {
                    throw new AuthenticationFailedException("unknown API token");
                }
                ApiTokenService.TokenPrincipal t = valid.principal();
                return (SecurityIdentity) QuarkusSecurityIdentity.builder()
                        .setPrincipal(new QuarkusPrincipal("token:" + t.name()))
                        // a LIMS token acts as a member of its laboratory within its scope: it submits results or
                        // reads scores, it never administers members, tokens or grants
                        .addRole(Role.LAB_MEMBER.roleName())
                        .addAttribute(IdentityAttributes.TOKEN_ID, t.tokenId())
                        .addAttribute(IdentityAttributes.TOKEN_SCOPE, t.scope())
                        .addAttribute(IdentityAttributes.DISPLAY_NAME, "API token " + t.name())
                        .addAttribute(IdentityAttributes.METHOD, IdentityAttributes.METHOD_TOKEN)
                        .addAttribute(IdentityAttributes.LABORATORY_ID, t.laboratoryId())
                        .build();
            });
        }
    }
}
