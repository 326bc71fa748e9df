package org.roundtable.account;

import io.vertx.core.http.Cookie;
import io.vertx.core.http.HttpServerRequest;
import jakarta.enterprise.context.RequestScoped;
import jakarta.inject.Named;
import org.roundtable.platform.Secrets;

import java.nio.charset.StandardCharsets;
import java.util.Base64;

/**
 * CSRF tokens (ASVS v5.0.0-3.5.1). For a signed-in browser the token is HMAC-SHA256(key, session hash), so it
 * needs no storage and is the same on every instance. Anonymous forms (sign-in, password link) pair a random
 * form cookie with HMAC-SHA256(key, cookie) — a signed double-submit cookie. The key is
 * derived from {@link SessionKey}.
 *
 * <p>Templates use {@code {inject:csrf.token}} in a hidden field named {@value #FIELD}.
 */
@RequestScoped
@Named("csrf")
public class CsrfTokens {

    public static final String FIELD = "_csrf";
    public static final String HEADER = "X-CSRF-Token";


    private final CurrentUser currentUser;
    private final SessionCookies cookies;
    private final HttpServerRequest request;
    private final byte[] key;
    private String newFormCookie;

    public CsrfTokens(CurrentUser currentUser, SessionCookies cookies, HttpServerRequest request, SessionKey sessionKey) {
        this.currentUser = currentUser;
        this.cookies = cookies;
        this.request = request;
        this.key = sessionKey.derive("csrf");
    }

    /** The token a form on the current page must send back. */
    public String getToken() {
        return currentUser.sessionHash()
                .map(hash -> sign("session\n" + hash))
                .orElseGet(() -> sign("form\n" + formCookieValue()));
    }

    /** Whether a presented token is right for this request. */
    boolean accepts(String presented) {
        if (presented == null || presented.isBlank()) {
            return false;
        }
        if (currentUser.sessionHash().isPresent()) {
            return Secrets.constantTimeEquals(presented, sign("session\n" + currentUser.sessionHash().get()));
        }
        Cookie form = request.getCookie(cookies.formCookieName());
        return form != null && Secrets.constantTimeEquals(presented, sign("form\n" + form.getValue()));
    }

    /** A form cookie created on this request, to be set on the response; null if none was needed. */
    String newFormCookie() {
        return newFormCookie;
    }

    private String formCookieValue() {
        Cookie existing = request.getCookie(cookies.formCookieName());
        if (existing != null && !existing.getValue().isBlank()) {
            return existing.getValue();
        }
        if (newFormCookie == null) {
            newFormCookie = Secrets.randomToken(32);
        }
        return newFormCookie;
    }

    private String sign(String message) {
        return Base64.getUrlEncoder().withoutPadding().encodeToString(
                SessionKey.hmac(key, message.getBytes(StandardCharsets.UTF_8)));
    }
}
