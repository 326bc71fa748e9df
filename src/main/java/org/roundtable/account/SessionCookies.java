package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.ws.rs.core.NewCookie;

/**
 * The session cookie: HttpOnly, SameSite=Lax, path /, and behind HTTPS {@code Secure} with the
 * {@code __Host-} prefix (ASVS v5.0.0-3.3.1 to 3.3.4).
 */
@ApplicationScoped
public class SessionCookies {

    private final SecuritySettings settings;

    public SessionCookies(SecuritySettings settings) {
        this.settings = settings;
    }

    public String sessionCookieName() {
        return settings.secureCookies() ? "__Host-rt_session" : "rt_session";
    }

    /** Cookie that pairs an anonymous form (sign-in, password link) with its CSRF token. */
    public String formCookieName() {
        return settings.secureCookies() ? "__Host-rt_form" : "rt_form";
    }

    /** Cookie holding a sign-in that awaits its second step (not a session). */
    public String secondStepCookieName() {
        return settings.secureCookies() ? "__Host-rt_second_step" : "rt_second_step";
    }

    public NewCookie secondStep(String token) {
        return cookie(secondStepCookieName(), token, 300);
    }

    public NewCookie clearSecondStep() {
        return cookie(secondStepCookieName(), "", 0);
    }

    public NewCookie session(String token) {
        return cookie(sessionCookieName(), token, -1);
    }

    public NewCookie clearSession() {
        return cookie(sessionCookieName(), "", 0);
    }

    public NewCookie form(String value) {
        return cookie(formCookieName(), value, -1);
    }

    private NewCookie cookie(String name, String value, int maxAge) {
        return new NewCookie.Builder(name)
                .value(value)
                .path("/")
                .httpOnly(true)
                .secure(settings.secureCookies())
                .sameSite(NewCookie.SameSite.LAX)
                .maxAge(maxAge)
                .build();
    }
}
