package org.roundtable.account;

import io.quarkus.security.identity.SecurityIdentity;
import jakarta.enterprise.context.RequestScoped;
import jakarta.inject.Named;
import org.roundtable.audit.Actor;
import org.roundtable.platform.DomainException;

import java.util.Optional;

/**
 * The caller of the current request, as established by {@link RoundtableAuthentication}. The laboratory a
 * request acts for always comes from here — never from a request body or path.
 */
@RequestScoped
@Named("currentUser")
public class CurrentUser {

    private final SecurityIdentity identity;

    public CurrentUser(SecurityIdentity identity) {
        this.identity = identity;
    }

    public boolean signedIn() {
        return !identity.isAnonymous();
    }

    public Optional<Role> role() {
        return identity.getRoles().stream().map(Role::fromName).flatMap(Optional::stream).findFirst();
    }

    /** For templates: {@code {#if inject:currentUser.hasRole('admin')}}. */
    public boolean hasRole(String roleName) {
        return identity.hasRole(roleName);
    }

    public String roleName() {
        return role().map(Role::roleName).orElse("");
    }

    /** The role in words ("Laboratory manager"), for pages. */
    public String roleLabel() {
        return role().map(org.roundtable.platform.Labels::of).orElse("");
    }

    public boolean is(Role role) {
        return identity.hasRole(role.roleName());
    }

    public String username() {
        return identity.isAnonymous() ? "anonymous" : identity.getPrincipal().getName();
    }

    public String displayName() {
        String name = identity.getAttribute(IdentityAttributes.DISPLAY_NAME);
        return name == null ? username() : name;
    }

    /** The signed-in user's id; empty for API tokens and anonymous callers. */
    public Optional<Long> userId() {
        Long id = identity.getAttribute(IdentityAttributes.USER_ID);
        return Optional.ofNullable(id);
    }

    public long requireUserId() {
        return userId().orElseThrow(DomainException.Forbidden::new);
    }

    /** The laboratory the caller belongs to; empty for coordinators, admins, auditors and anonymous callers. */
    public Optional<Long> laboratoryId() {
        Long id = identity.getAttribute(IdentityAttributes.LABORATORY_ID);
        return id == null || id < 0 ? Optional.empty() : Optional.of(id);
    }

    public long requireLaboratoryId() {
        return laboratoryId().orElseThrow(DomainException.Forbidden::new);
    }

    /** Whether the signed-in user's two-step sign-in is on (read from the database on this request). */
    public boolean twoStepOn() {
        return Boolean.TRUE.equals(identity.getAttribute(IdentityAttributes.TWO_STEP_ON));
    }

    /** The scope of the API token the request was made with; empty for signed-in people. */
    public Optional<ApiTokenScope> tokenScope() {
        Object scope = identity.getAttribute(IdentityAttributes.TOKEN_SCOPE);
        return scope instanceof ApiTokenScope s ? Optional.of(s) : Optional.empty();
    }

    public boolean viaApiToken() {
        return IdentityAttributes.METHOD_TOKEN.equals(identity.getAttribute(IdentityAttributes.METHOD));
    }

    /** SHA-256 of the session token, for binding CSRF tokens; empty without a session. */
    public Optional<String> sessionHash() {
        return Optional.ofNullable(identity.getAttribute(IdentityAttributes.SESSION_HASH));
    }

    /** The actor for the audit trail; work done without a signed-in caller (startup, scheduled jobs) is the system's. */
    public Actor actor() {
        if (identity.isAnonymous()) {
            return Actor.SYSTEM;
        }
        return new Actor(username(), roleName(), laboratoryId().orElse(null));
    }
}
