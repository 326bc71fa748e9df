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

    public record TokenPrincipal(long tokenId, String name, long laboratoryId) {
    }

    public record TokenView(long id, String name, String prefix, OffsetDateTime createdAt, OffsetDateTime lastUsedAt,
                            OffsetDateTime revokedAt) {
        static TokenView of(ApiToken t) {
            return new TokenView(t.id, t.name, t.tokenPrefix, t.createdAt, t.lastUsedAt, t.revokedAt);
        }
    }

    /** The created token with its secret, which is shown this once and never again. */
    public record CreatedToken(TokenView token, String secret) {
    }

    @Transactional
    public CreatedToken create(String name) {
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
        token.createdAt = now();
        tokens.persist(token);
        audit.record(new AuditTrail.Event(currentUser.actor(), "api-token.created", "api-token", token.id.toString(),
                null, hash(token), "name=" + token.name));
        return new CreatedToken(TokenView.of(token), secret);
    }

    @Transactional
    public List<TokenView> listOwn() {
        return tokens.list("laboratoryId = ?1 order by createdAt desc", currentUser.requireLaboratoryId())
                .stream().map(TokenView::of).toList();
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
        return TokenView.of(token);
    }

    /** The laboratory and name behind a presented token, or empty when unknown or revoked. */
    @Transactional
    public Optional<TokenPrincipal> resolve(String secret) {
        if (secret == null || !secret.startsWith(PREFIX) || secret.length() > 100) {
            return Optional.empty();
        }
        Optional<ApiToken> found = tokens.find("tokenHash = ?1 and revokedAt is null", Secrets.sha256Hex(secret))
                .firstResultOptional();
        found.ifPresent(t -> {
            OffsetDateTime now = now();
            if (t.lastUsedAt == null || t.lastUsedAt.plus(LAST_USE_RESOLUTION).isBefore(now)) {
                tokens.update("lastUsedAt = ?1 where id = ?2", now, t.id);
            }
        });
        return found.map(t -> new TokenPrincipal(t.id, t.name, t.laboratoryId));
    }

    private ApiToken ownToken(long tokenId) {
        long laboratoryId = currentUser.requireLaboratoryId();
        return tokens.findByIdOptional(tokenId)
                .filter(t -> t.laboratoryId == laboratoryId)
                .orElseThrow(() -> new DomainException.NotFound("The token"));
    }

    private static String hash(ApiToken t) {
        return ObjectHash.of(Map.of("id", t.id, "laboratoryId", t.laboratoryId, "name", t.name,
                "revoked", String.valueOf(t.revokedAt)));
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
