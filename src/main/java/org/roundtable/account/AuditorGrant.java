package org.roundtable.account;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** A laboratory's permission for one auditor to see its history and per-laboratory reports, until a date. */
@Entity
@Table(name = "auditor_grant")
public class AuditorGrant {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(name = "laboratory_id", nullable = false)
    public Long laboratoryId;

    @Column(name = "auditor_id", nullable = false)
    public Long auditorId;

    @Column(name = "granted_by", nullable = false)
    public Long grantedBy;

    @Column(name = "granted_at", nullable = false)
    public OffsetDateTime grantedAt;

    @Column(name = "valid_until", nullable = false)
    public OffsetDateTime validUntil;

    /** First day of the data window (rounds whose final report was issued on or after it), or open. */
    @Column(name = "data_from")
    public java.time.LocalDate dataFrom;

    /** Last day of the data window (rounds whose final report was issued on or before it), or open. */
    @Column(name = "data_until")
    public java.time.LocalDate dataUntil;

    @Column(name = "revoked_at")
    public OffsetDateTime revokedAt;

    @Column(name = "revoked_by")
    public Long revokedBy;

    @Version
    public int version;

    public boolean activeAt(OffsetDateTime now) {
        return revokedAt == null && validUntil.isAfter(now);
    }
}
