package org.roundtable.scheme;

import io.quarkus.panache.common.Sort;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.LockModeType;
import jakarta.transaction.Transactional;
import org.roundtable.account.CurrentUser;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;

import java.math.BigDecimal;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Schemes and their measurand catalogue (coordinators). A catalogue entry is keyed by its element: adding
 * an element that is already there replaces its unit, digits, range and method groups. Rounds copy what
 * they need into their frozen plan, so a later catalogue change never alters a frozen plan.
 */
@ApplicationScoped
public class SchemeService {

    private final SchemeRepository schemes;
    private final MeasurandRepository measurands;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final EntityManager entityManager;
    private final Clock clock;

    public SchemeService(SchemeRepository schemes, MeasurandRepository measurands, AuditTrail audit,
                         CurrentUser currentUser, EntityManager entityManager, Clock clock) {
        this.schemes = schemes;
        this.measurands = measurands;
        this.audit = audit;
        this.currentUser = currentUser;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    public record NewScheme(String name, String materialFamily) {
    }

    /** A catalogue entry as entered: numbers of the range as decimal strings. */
    public record MeasurandEntry(String element, String unit, Integer reportingDigits, String expectedMin,
                                 String expectedMax, List<String> methodGroups) {
    }

    public record MeasurandView(long id, String element, String unit, int reportingDigits, BigDecimal expectedMin,
                                BigDecimal expectedMax, List<String> methodGroups) {
        static MeasurandView of(Measurand m) {
            return new MeasurandView(m.id, m.element, m.unit, m.reportingDigits, m.expectedMin, m.expectedMax,
                    List.of(m.methodGroups.split(",")));
        }
    }

    public record SchemeView(long id, String name, String materialFamily, OffsetDateTime createdAt,
                             List<MeasurandView> measurands) {
    }

    @Transactional
    public SchemeView create(NewScheme request) {
        if (request == null) {
            throw new DomainException.BadRequest("A scheme needs a name and a material family.");
        }
        Scheme scheme = new Scheme();
        scheme.name = text(request.name(), "scheme name", 200);
        scheme.materialFamily = family(request.materialFamily());
        scheme.createdAt = now();
        if (schemes.count("name", scheme.name) > 0) {
            throw new DomainException.Conflict("A scheme of that name exists already.");
        }
        schemes.persist(scheme);
        audit.record(new AuditTrail.Event(currentUser.actor(), "scheme.created", "scheme", scheme.id.toString(), null,
                hash(scheme), "name=" + scheme.name));
        return view(scheme);
    }

    @Transactional
    public List<SchemeView> list() {
        return schemes.listAll(Sort.by("name")).stream().map(this::view).toList();
    }

    @Transactional
    public SchemeView get(long schemeId) {
        return view(find(schemeId));
    }

    /** Adds an element to the catalogue, or replaces the entry of an element already there. */
    @Transactional
    public MeasurandView putMeasurand(long schemeId, MeasurandEntry entry) {
        Scheme scheme = find(schemeId);
        entityManager.lock(scheme, LockModeType.PESSIMISTIC_WRITE);
        if (entry == null) {
            throw new DomainException.BadRequest("A measurand needs an element, a unit and the reporting digits.");
        }
        String element = ChemicalElement.require(entry.element());
        String unit = MeasurandUnit.fromSymbol(entry.unit()).symbol();
        if (entry.reportingDigits() == null || entry.reportingDigits() < 0 || entry.reportingDigits() > 6) {
            throw new DomainException.BadRequest("The reporting digits (decimal places) are 0 to 6.");
        }
        BigDecimal min = decimal(entry.expectedMin(), "expected minimum");
        BigDecimal max = decimal(entry.expectedMax(), "expected maximum");
        if (min != null && max != null && min.compareTo(max) > 0) {
            throw new DomainException.BadRequest("The expected minimum is above the expected maximum.");
        }
        if ((min != null && min.signum() < 0) || (max != null && max.signum() < 0)) {
            throw new DomainException.BadRequest("An expected mass fraction cannot be negative.");
        }
        if ("%".equals(unit) && max != null && max.compareTo(BigDecimal.valueOf(100)) > 0) {
            throw new DomainException.BadRequest("A mass fraction in % cannot exceed 100.");
        }
        List<String> groups = methodGroups(entry.methodGroups());
        Measurand m = measurands.find("schemeId = ?1 and element = ?2", schemeId, element).firstResultOptional()
                .orElse(null);
        String before = m == null ? null : hash(m);
        if (m == null) {
            m = new Measurand();
            m.schemeId = schemeId;
            m.element = element;
        }
        m.unit = unit;
        m.reportingDigits = entry.reportingDigits();
        m.expectedMin = min;
        m.expectedMax = max;
        m.methodGroups = String.join(",", groups);
        if (m.id == null) {
            measurands.persist(m);
        }
        entityManager.flush();
        audit.record(new AuditTrail.Event(currentUser.actor(), before == null ? "measurand.added" : "measurand.changed",
                "measurand", m.id.toString(), before, hash(m), "scheme=" + schemeId + " element=" + element));
        return MeasurandView.of(m);
    }

    /** The catalogue of a scheme, in order of atomic number. */
    public List<Measurand> catalogue(long schemeId) {
        return measurands.ofScheme(schemeId);
    }

    /** Whether the scheme requires a second reviewer's sign-off on each final or amended report. */
    @Transactional
    public boolean secondReviewerRequired(long schemeId) {
        return find(schemeId).secondReviewerRequired;
    }

    /** Sets whether the scheme requires a second reviewer's sign-off on final and amended reports (audited). */
    @Transactional
    public void requireSecondReviewer(long schemeId, boolean required) {
        Scheme scheme = find(schemeId);
        String before = hash(scheme);
        scheme.secondReviewerRequired = required;
        audit.record(new AuditTrail.Event(currentUser.actor(), "scheme.second-reviewer", "scheme",
                scheme.id.toString(), before, hash(scheme), "secondReviewerRequired=" + required));
    }

    /**
     * The proficiency-testing provider named on reports: organisation, postal address, accreditation identifier
     * (address and accreditation may be null).
     */
    public record Provider(String name, String address, String accreditation) {
    }

    /** The scheme's own provider for its reports, where one is set (else the installation's applies). */
    @Transactional
    public java.util.Optional<Provider> providerOf(long schemeId) {
        Scheme s = find(schemeId);
        return s.providerName == null ? java.util.Optional.empty()
                : java.util.Optional.of(new Provider(s.providerName, s.providerAddress, s.providerAccreditation));
    }

    /**
     * Sets the provider named on the scheme's reports issued from now on; a blank name clears it, so that the
     * installation's provider applies again. Documents issued already keep the provider they name. Audited.
     */
    @Transactional
    public void setProvider(long schemeId, Provider provider) {
        Scheme scheme = find(schemeId);
        String before = hash(scheme);
        boolean clear = provider == null || provider.name() == null || provider.name().isBlank();
        scheme.providerName = clear ? null : text(provider.name(), "provider's name", 200);
        scheme.providerAddress = clear ? null : optional(provider.address(), "provider's address", 500);
        scheme.providerAccreditation = clear ? null : optional(provider.accreditation(), "accreditation identifier", 100);
        audit.record(new AuditTrail.Event(currentUser.actor(), "scheme.provider", "scheme", scheme.id.toString(), before,
                hash(scheme), clear ? "provider=installation" : "provider=" + scheme.providerName));
    }

    private static String optional(String value, String what, int max) {
        return value == null || value.isBlank() ? null : text(value, what, max);
    }

    Scheme find(long schemeId) {
        return schemes.findByIdOptional(schemeId).orElseThrow(() -> new DomainException.NotFound("The scheme"));
    }

    private SchemeView view(Scheme s) {
        return new SchemeView(s.id, s.name, s.materialFamily.name(), s.createdAt,
                measurands.ofScheme(s.id).stream().map(MeasurandView::of).toList());
    }

    static MaterialFamily family(String value) {
        try {
            return MaterialFamily.valueOf(value == null ? "" : value.strip().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new DomainException.BadRequest("The material family is one of " + List.of(MaterialFamily.values()) + ".");
        }
    }

    static List<String> methodGroups(List<String> values) {
        if (values == null || values.isEmpty()) {
            throw new DomainException.BadRequest("Name at least one method group: " + List.of(MethodGroup.values()) + ".");
        }
        Set<String> groups = new LinkedHashSet<>();
        for (String value : values) {
            try {
                groups.add(MethodGroup.valueOf(value == null ? "" : value.strip().toUpperCase(Locale.ROOT)).name());
            } catch (IllegalArgumentException e) {
                throw new DomainException.BadRequest("Unknown method group '" + value + "'; allowed: "
                        + List.of(MethodGroup.values()) + ".");
            }
        }
        return new ArrayList<>(groups);
    }

    static BigDecimal decimal(String value, String what) {
        if (value == null || value.isBlank()) {
            return null;
        }
        String clean = value.strip();
        if (!clean.matches("[0-9]{1,12}(\\.[0-9]{1,12})?")) {
            throw new DomainException.BadRequest("The " + what + " is a plain decimal number such as 0.25.");
        }
        return new BigDecimal(clean);
    }

    static String text(String value, String what, int max) {
        String clean = value == null ? "" : value.strip();
        if (clean.isEmpty() || clean.length() > max) {
            throw new DomainException.BadRequest("The " + what + " needs 1 to " + max + " characters.");
        }
        return clean;
    }

    private static String hash(Scheme s) {
        Map<String, Object> fields = new HashMap<>();
        fields.put("id", s.id);
        fields.put("name", s.name);
        fields.put("materialFamily", s.materialFamily);
        fields.put("secondReviewerRequired", s.secondReviewerRequired);
        if (s.providerName != null) {
            // only when set, so that the hash of a scheme without its own provider is what it always was
            fields.put("providerName", s.providerName);
            fields.put("providerAddress", s.providerAddress);
            fields.put("providerAccreditation", s.providerAccreditation);
        }
        return ObjectHash.of(fields);
    }

    private static String hash(Measurand m) {
        Map<String, Object> fields = new HashMap<>();
        fields.put("id", m.id);
        fields.put("schemeId", m.schemeId);
        fields.put("element", m.element);
        fields.put("unit", m.unit);
        fields.put("reportingDigits", m.reportingDigits);
        fields.put("expectedMin", m.expectedMin == null ? null : m.expectedMin.toPlainString());
        fields.put("expectedMax", m.expectedMax == null ? null : m.expectedMax.toPlainString());
        fields.put("methodGroups", m.methodGroups);
        return ObjectHash.of(fields);
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
