package org.roundtable.account;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** A participating laboratory: the tenant whose results and identity are kept confidential. */
@Entity
@Table(name = "laboratory")
public class Laboratory {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(nullable = false)
    public String name;

    @Column(nullable = false)
    public String organisation;

    /** ISO 3166-1 alpha-2 country code. */
    @Column(nullable = false, columnDefinition = "bpchar")
    public String country;

    @Column(name = "contact_name")
    public String contactName;

    @Column(name = "contact_email")
    public String contactEmail;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    @Version
    public int version;
}
