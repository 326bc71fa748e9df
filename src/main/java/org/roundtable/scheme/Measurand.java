package org.roundtable.scheme;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.math.BigDecimal;

/**
 * One entry of a scheme's measurand catalogue: an element, its unit, the digits results are reported to,
 * the expected range (for warnings only) and the method groups allowed.
 */
@Entity
@Table(name = "measurand")
public class Measurand {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(name = "scheme_id", nullable = false)
    public Long schemeId;

    /** Element symbol, H to U. */
    @Column(nullable = false)
    public String element;

    /** "%" or "mg/kg". */
    @Column(nullable = false)
    public String unit;

    @Column(name = "reporting_digits", nullable = false)
    public int reportingDigits;

    @Column(name = "expected_min")
    public BigDecimal expectedMin;

    @Column(name = "expected_max")
    public BigDecimal expectedMax;

    /** Comma-separated {@link MethodGroup} names. */
    @Column(name = "method_groups", nullable = false)
    public String methodGroups;

    @Version
    public int version;
}
