package org.roundtable.account;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** A laboratory's named API token for its LIMS. Only the SHA-256 of the secret is kept. */
@Entity
@Table(name = "api_token")
public class ApiToken {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(name = "laboratory_id", nullable = false)
    public Long laboratoryId;

    @Column(nullable = false)
    public String name;

    @Column(name = "token_hash", nullable = false, columnDefinition = "bpchar")
    public String tokenHash;

    /** The first characters of the token, shown in lists so that a token can be recognised. */
    @Column(name = "token_prefix", nullable = false)
    public String tokenPrefix;

    @Column(name = "created_by", nullable = false)
    public Long createdBy;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    @Column(name = "last_used_at")
    public OffsetDateTime lastUsedAt;

    /** What the token may do. */
    @Column(nullable = false)
    @jakarta.persistence.Enumerated(jakarta.persistence.EnumType.STRING)
    public ApiTokenScope scope = ApiTokenScope.SUBMIT;

    /** When the token stops working by itself, or null for never. */
    @Column(name = "expires_at")
    public OffsetDateTime expiresAt;

    @Column(name = "revoked_at")
    public OffsetDateTime revokedAt;

    @Column(name = "revoked_by")
    public Long revokedBy;

    @Version
    public int version;
}
