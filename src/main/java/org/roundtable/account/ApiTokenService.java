package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;
import org.roundtable.platform.Secrets;

import java.time.Clock;
import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * A laboratory's API tokens for its LIMS: 256 random bits, shown once at creation, stored as SHA-256,
 * named, revocable (at once, on every instance), with the time of last use.
 */
@ApplicationScoped
public class ApiTokenService {

    static final String PREFIX = "rt_";
    private static final Duration LAST_USE_RESOLUTION = Duration.ofMinutes(1);

    private final ApiTokenRepository tokens;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final Clock clock;

    public ApiTokenService(ApiTokenRepository tokens, AuditTrail audit, CurrentUser currentUser, Clock clock) {
        this.tokens = tokens;
        this.audit = audit;
        this.currentUser = currentUser;
        this.clock = clock;
    }

    public record TokenPrincipal(long tokenId, String name, long laboratoryId, ApiTokenScope scope) {
    }

    /** The longest a token may live when it is given an expiry. */
    static final int MAX_EXPIRY_DAYS = 730;

    /**
     * A token as listed; {@code expired} when its expiry has passed (then it no longer works, like a revoked one).
     */
    public record TokenView(long id, String name, String prefix, ApiTokenScope scope, OffsetDateTime createdAt,
                            OffsetDateTime lastUsedAt, OffsetDateTime expiresAt, OffsetDateTime revokedAt,
                            boolean expired) {
        static TokenView of(ApiToken t, OffsetDateTime now) {
            return new TokenView(t.id, t.name, t.tokenPrefix, t.scope, t.createdAt, t.lastUsedAt, t.expiresAt,
                    t.revokedAt, t.revokedAt == null && t.expiresAt != null && !t.expiresAt.isAfter(now));
        }

        /** Whether the token still works. */
        public boolean active() {
            return revokedAt == null && !expired;
        }
    }

    /** What resolving a presented secret found. */
    public sealed interface Resolution {
        /** A working token. */
        record Valid(TokenPrincipal principal) implements Resolution {
        }

        /** A token that was issued here but was revoked or has expired. */
        record NoLongerValid(boolean revoked) implements Resolution {
        }

        /** Nothing issued here matches. */
        record Unknown() implements Resolution {
        }
    }

    /** The created token with its secret, which is shown this once and never again. */
    public record CreatedToken(TokenView token, String secret) {
    }

    /**
     * A new token of the caller's laboratory with a scope and an optional expiry (the token stops working at that
     * moment; in the future, within {@value #MAX_EXPIRY_DAYS} days).
     */
    @Transactional
    public CreatedToken create(String name, ApiTokenScope scope, OffsetDateTime expiresAt) {
        OffsetDateTime now = now();
        if (expiresAt != null && (!expiresAt.isAfter(now) || expiresAt.isAfter(now.plusDays(MAX_EXPIRY_DAYS)))) {
            throw new DomainException.BadRequest("A token's expiry lies in the future, within " + MAX_EXPIRY_DAYS
                    + " days; leave it empty for a token that does not expire.");
        }
        long laboratoryId = currentUser.requireLaboratoryId();
        String cleanName = name == null ? "" : name.strip();
        if (cleanName.isEmpty() || cleanName.length() > 100) {
            throw new DomainException.BadRequest("A token needs a name of 1 to 100 characters.");
        }
        if (tokens.count("laboratoryId = ?1 and lower(name) = ?2 and revokedAt is null", laboratoryId,
                cleanName.toLowerCase(java.util.Locale.ROOT)) > 0) {
            throw new DomainException.Conflict("An active token with this name exists already.");
        }
        String secret = PREFIX + Secrets.randomToken(32);
        ApiToken token = new ApiToken();
        token.laboratoryId = laboratoryId;
        token.name = cleanName;
        token.tokenHash = Secrets.sha256Hex(secret);
        token.tokenPrefix = secret.substring(0, 10);
        token.createdBy = currentUser.requireUserId();
        token.createdAt = now;
        token.scope = scope == null ? ApiTokenScope.SUBMIT : scope;
        token.expiresAt = expiresAt == null ? null : expiresAt.withOffsetSameInstant(ZoneOffset.UTC);
        tokens.persist(token);
        audit.record(new AuditTrail.Event(currentUser.actor(), "api-token.created", "api-token", token.id.toString(),
                null, hash(token), "name=" + token.name + " scope=" + token.scope
                + (token.expiresAt == null ? "" : " expires=" + token.expiresAt)));
        return new CreatedToken(TokenView.of(token, now), secret);
    }

    @Transactional
    public List<TokenView> listOwn() {
        OffsetDateTime now = now();
        return tokens.list("laboratoryId = ?1 order by createdAt desc", currentUser.requireLaboratoryId())
                .stream().map(t -> TokenView.of(t, now)).toList();
    }

    @Transactional
    public TokenView revoke(long tokenId) {
        ApiToken token = ownToken(tokenId);
        if (token.revokedAt == null) {
            String before = hash(token);
            token.revokedAt = now();
            token.revokedBy = currentUser.requireUserId();
            audit.record(new AuditTrail.Event(currentUser.actor(), "api-token.revoked", "api-token",
                    token.id.toString(), before, hash(token), "name=" + token.name));
        }
        return TokenView.of(token, now());
    }

    /**
     * What a presented token is: valid (its last use is noted, to the minute), no longer valid (revoked or expired),
     * or unknown.
     */
    @Transactional
    public Resolution resolution(String secret) {
        if (secret == null || !secret.startsWith(PREFIX) || secret.length() > 100) {
            return new Resolution.Unknown();
        }
        Optional<ApiToken> found = tokens.find("tokenHash", Secrets.sha256Hex(secret)).firstResultOptional();
        if (found.isEmpty()) {
            return new Resolution.Unknown();
        }
        ApiToken t = found.get();
        OffsetDateTime now = now();
        if (t.revokedAt != null) {
            return new Resolution.NoLongerValid(true);
        }
        if (t.expiresAt != null && !t.expiresAt.isAfter(now)) {
            return new Resolution.NoLongerValid(false);
        }
        if (t.lastUsedAt == null || t.lastUsedAt.plus(LAST_USE_RESOLUTION).isBefore(now)) {
            tokens.update("lastUsedAt = ?1 where id = ?2", now, t.id);
        }
        return new Resolution.Valid(new TokenPrincipal(t.id, t.name, t.laboratoryId, t.scope));
    }

    private ApiToken ownToken(long tokenId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        return tokens.findByIdOptional(tokenId)
                .filter(t -> t.laboratoryId == laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The token"));
    }

    private static String hash(ApiToken t) {
        return ObjectHash.of(Map.of("id", t.id, "laboratoryId", t.laboratoryId, "name", t.name,
                "scope", t.scope.name(), "expires", String.valueOf(t.expiresAt), "revoked", String.valueOf(t.revokedAt)));
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
