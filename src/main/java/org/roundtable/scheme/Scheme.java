package org.roundtable.scheme;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.EnumType;
import jakarta.persistence.Enumerated;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** A PT scheme: a material family and its measurand catalogue; rounds are run under it. */
@Entity
@Table(name = "scheme")
public class Scheme {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(nullable = false)
    public String name;

    @Enumerated(EnumType.STRING)
    @Column(name = "material_family", nullable = false)
    public MaterialFamily materialFamily;

    /** The provider named on this scheme's reports where it differs from the installation's; null for none. */
    @Column(name = "provider_name")
    public String providerName;

    @Column(name = "provider_address")
    public String providerAddress;

    @Column(name = "provider_accreditation")
    public String providerAccreditation;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    /** Whether each final or amended report needs a second reviewer's sign-off (a different coordinator). */
    @Column(name = "second_reviewer_required", nullable = false)
    public boolean secondReviewerRequired;

    @Version
    public int version;
}
