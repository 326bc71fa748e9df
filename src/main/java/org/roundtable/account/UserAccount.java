package org.roundtable.account;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** A person who signs in: one role, and for laboratory roles exactly one laboratory. */
@Entity
@Table(name = "app_user")
public class UserAccount {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(nullable = false)
    public String username;

    @Column(name = "display_name", nullable = false)
    public String displayName;

    public String email;

    @Column(nullable = false)
    public String role;

    @Column(name = "laboratory_id")
    public Long laboratoryId;

    @Column(name = "password_hash")
    public String passwordHash;

    @Column(nullable = false)
    public boolean enabled = true;

    @Column(name = "password_changed_at")
    public OffsetDateTime passwordChangedAt;

    /** IANA zone name chosen by the user; {@code null} means the installation's zone. */
    @Column(name = "time_zone")
    public String timeZone;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    @Version
    public int version;

    public Role roleValue() {
        return Role.fromName(role).orElseThrow();
    }
}
