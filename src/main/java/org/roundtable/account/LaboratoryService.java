package org.roundtable.account;

import io.quarkus.panache.common.Sort;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.transaction.Transactional;
import org.roundtable.audit.AuditTrail;
import org.roundtable.audit.ObjectHash;
import org.roundtable.platform.DomainException;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Laboratories, the tenants. Coordinators and admins see all of them; a laboratory's own users see their
 * laboratory; an auditor sees a laboratory while it grants access. Everyone else gets the same "not found"
 * as for an id that does not exist.
 */
@ApplicationScoped
public class LaboratoryService {

    private final LaboratoryRepository laboratories;
    private final AccountService accounts;
    private final AuditorGrantService grants;
    private final AuditTrail audit;
    private final CurrentUser currentUser;
    private final Clock clock;

    public LaboratoryService(LaboratoryRepository laboratories, AccountService accounts, AuditorGrantService grants,
                             AuditTrail audit, CurrentUser currentUser, Clock clock) {
        this.laboratories = laboratories;
        this.accounts = accounts;
        this.grants = grants;
        this.audit = audit;
        this.currentUser = currentUser;
        this.clock = clock;
    }

    public record LaboratoryView(long id, String name, String organisation, String country, String contactName,
                                 String contactEmail, OffsetDateTime createdAt) {
        static LaboratoryView of(Laboratory l) {
            return new LaboratoryView(l.id, l.name, l.organisation, l.country, l.contactName, l.contactEmail, l.createdAt);
        }
    }

    public record NewLaboratory(String name, String organisation, String country, String contactName,
                                String contactEmail, String managerUsername, String managerDisplayName) {
    }

    public record CreatedLaboratory(LaboratoryView laboratory, AccountService.UserWithLink firstManager) {
    }

    /** Enrols a laboratory with its first lab manager, who sets a password through the returned one-time link. */
    @Transactional
    public CreatedLaboratory create(NewLaboratory request) {
        Laboratory lab = new Laboratory();
        lab.name = text(request.name(), "laboratory name", 200);
        lab.organisation = text(request.organisation(), "organisation", 200);
        lab.country = country(request.country());
        lab.contactName = optional(request.contactName(), 200);
        lab.contactEmail = optional(request.contactEmail(), 254);
        lab.createdAt = now();
        if (laboratories.count("organisation = ?1 and name = ?2", lab.organisation, lab.name) > 0) {
            throw new DomainException.Conflict("This organisation already has a laboratory of that name.");
        }
        laboratories.persist(lab);
        audit.record(new AuditTrail.Event(currentUser.actor(), "laboratory.created", "laboratory", lab.id.toString(),
                null, hash(lab), null));
        AccountService.UserWithLink manager = accounts.createUser(request.managerUsername(),
                request.managerDisplayName() == null || request.managerDisplayName().isBlank()
                        ? lab.contactName == null ? request.managerUsername() : lab.contactName
                        : request.managerDisplayName(),
                lab.contactEmail, Role.LAB_MANAGER, lab.id);
        return new CreatedLaboratory(LaboratoryView.of(lab), manager);
    }

    @Transactional
    public List<LaboratoryView> listAll() {
        return laboratories.listAll(Sort.by("organisation").and("name")).stream().map(LaboratoryView::of).toList();
    }

    /** Up to {@code limit} laboratories whose name or organisation contains {@code query} (all when blank), and the total. */
    public record Page<T>(List<T> items, long total) {
    }

    @Transactional
    public Page<LaboratoryView> search(String query, int limit) {
        return search(query, 0, limit);
    }

    /** Laboratories whose name or organisation contains {@code query}, {@code limit} from row {@code offset}. */
    @Transactional
    public Page<LaboratoryView> search(String query, int offset, int limit) {
        String like = org.roundtable.platform.LikePatterns.containing(
                query == null ? "" : query.strip().toLowerCase(Locale.ROOT));
        String where = "lower(name) like ?1 or lower(organisation) like ?1";
        List<LaboratoryView> items = laboratories.find(where, Sort.by("organisation").and("name"), like)
                .range(offset, offset + limit - 1).list().stream().map(LaboratoryView::of).toList();
        return new Page<>(items, laboratories.count(where, like));
    }

    /** The {@code limit} laboratories created last, newest first, and how many there are in all. */
    @Transactional
    public Page<LaboratoryView> recent(int limit) {
        List<LaboratoryView> items = laboratories.findAll(Sort.descending("id")).range(0, limit - 1).list().stream()
                .map(LaboratoryView::of).toList();
        return new Page<>(items, laboratories.count());
    }

    /** The laboratories with these ids, in one query (for a page of users). */
    @Transactional
    public java.util.Map<Long, LaboratoryView> byIds(java.util.Collection<Long> ids) {
        if (ids.isEmpty()) {
            return java.util.Map.of();
        }
        java.util.Map<Long, LaboratoryView> out = new java.util.HashMap<>();
        laboratories.list("id in ?1", java.util.Set.copyOf(ids)).forEach(l -> out.put(l.id, LaboratoryView.of(l)));
        return out;
    }

    /** One laboratory, if the caller may see it; otherwise "not found". */
    @Transactional
    public LaboratoryView get(long laboratoryId) {
        if (!maySee(laboratoryId)) {
            throw new DomainException.NotFound("The laboratory");
        }
        return laboratories.findByIdOptional(laboratoryId).map(LaboratoryView::of)
                .orElseThrow(() -> new DomainException.NotFound("The laboratory"));
    }

    /** Whether the caller may see the identity and history of this laboratory. */
    public boolean maySee(long laboratoryId) {
        if (currentUser.is(Role.COORDINATOR) || currentUser.is(Role.ADMIN)) {
            return true;
        }
        if (currentUser.laboratoryId().map(own -> own == laboratoryId).orElse(false)) {
            return true;
        }
        return currentUser.is(Role.AUDITOR) && currentUser.userId()
                .map(auditor -> grants.hasActiveGrant(auditor, laboratoryId)).orElse(false);
    }

    private static String hash(Laboratory l) {
        Map<String, Object> fields = new HashMap<>();
        fields.put("id", l.id);
        fields.put("name", l.name);
        fields.put("organisation", l.organisation);
        fields.put("country", l.country);
        fields.put("contactName", l.contactName);
        fields.put("contactEmail", l.contactEmail);
        return ObjectHash.of(fields);
    }

    private static String country(String code) {
        String clean = code == null ? "" : code.strip().toUpperCase(Locale.ROOT);
        if (!clean.matches("[A-Z]{2}") || !java.util.Set.of(Locale.getISOCountries()).contains(clean)) {
            throw new DomainException.BadRequest("The country is a two-letter ISO 3166 code, e.g. DE or FR.");
        }
        return clean;
    }

    private static String text(String value, String what, int max) {
        String clean = value == null ? "" : value.strip();
        if (clean.isEmpty() || clean.length() > max) {
            throw new DomainException.BadRequest("The " + what + " needs 1 to " + max + " characters.");
        }
        return clean;
    }

    private static String optional(String value, int max) {
        if (value == null || value.isBlank()) {
            return null;
        }
        String clean = value.strip();
        if (clean.length() > max) {
            throw new DomainException.BadRequest("A contact field may have at most " + max + " characters.");
        }
        return clean;
    }

    private OffsetDateTime now() {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }
}
