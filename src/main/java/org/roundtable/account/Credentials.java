package org.roundtable.account;

import io.quarkus.security.identity.request.BaseAuthenticationRequest;

/** The two kinds of credential Roundtable accepts on a request. */
final class Credentials {

    private Credentials() {
    }

    /** The token of a session cookie. */
    static final class SessionCookie extends BaseAuthenticationRequest {
        final String token;

        SessionCookie(String token) {
            this.token = token;
        }
    }

    /** A laboratory API token sent as {@code Authorization: Bearer ...}. */
    static final class BearerToken extends BaseAuthenticationRequest {
        final String token;

        BearerToken(String token) {
            this.token = token;
        }
    }
}
