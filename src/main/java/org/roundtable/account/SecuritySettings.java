package org.roundtable.account;

import io.smallrye.config.ConfigMapping;
import io.smallrye.config.WithDefault;
import io.smallrye.config.WithName;

import java.time.Duration;
import java.util.Optional;

/** Security settings (application.properties, section "Security"). Values documented in docs/operations.md. */
@ConfigMapping(prefix = "roundtable.security")
public interface SecuritySettings {

    /** Secret for signing CSRF tokens; the same on every instance. Required outside tests and dev. */
    @WithName("session-key")
    Optional<String> sessionKey();

    /** A session ends after this long without a request (ASVS v5.0.0-7.3.1). */
    @WithDefault("30m")
    Duration idleTimeout();

    /** A session ends this long after sign-in, whatever the activity (ASVS v5.0.0-7.3.2). */
    @WithDefault("12h")
    Duration absoluteTimeout();

    /** Cookies are {@code Secure} and use the {@code __Host-} prefix; true behind HTTPS. */
    @WithDefault("true")
    boolean secureCookies();

    /** Failed sign-ins per username within {@link #throttleWindow()} after which sign-in is refused. */
    @WithDefault("10")
    int maxFailedSignIns();

    @WithDefault("10m")
    Duration throttleWindow();

    /** How long a one-time password link stays valid. */
    @WithDefault("72h")
    Duration passwordLinkValidity();

    /** Roles that must use two-step sign-in (ASVS v5.0.0-6.3.3); empty = optional for everyone. */
    Optional<java.util.List<String>> twoStepRequiredRoles();

    /** bcrypt work factor. */
    @WithDefault("12")
    int bcryptCost();
}
