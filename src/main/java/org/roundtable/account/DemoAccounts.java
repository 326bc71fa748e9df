package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/**
 * The demo scenario's people and laboratories (all invented): the "Northmarch Alloy Proficiency Office"
 * runs the scheme; five laboratories take part; one auditor follows Kestrel Alloys with its permission.
 */
@ApplicationScoped
public class DemoAccounts {

    /** Shared by every demo account; satisfies the password policy. Demo only. */
    public static final String DEMO_PASSWORD = "spark-stand-demo";

    record DemoLab(String organisation, String name, String country, String contact, String manager, String member) {
    }

    static final List<DemoLab> LABORATORIES = List.of(
            new DemoLab("Kestrel Alloys Ltd", "Kestrel Alloys QC Laboratory", "GB", "Priya Halden", "kestrel.manager", "kestrel.analyst"),
            new DemoLab("Brennholt Giesserei GmbH", "Brennholt Werkstofflabor", "DE", "Jens Maraun", "brennholt.manager", "brennholt.analyst"),
            new DemoLab("Lumeris Aluminium SAS", "Lumeris Laboratoire d'analyse", "FR", "Claire Vautrin", "lumeris.manager", "lumeris.analyst"),
            new DemoLab("Tarnvik Kopparverk AB", "Tarnvik Metallab", "SE", "Elin Sjoholm", "tarnvik.manager", "tarnvik.analyst"),
            new DemoLab("Calderon Aceros SA", "Calderon Laboratorio de Ensayos", "ES", "Diego Arrabal", "calderon.manager", "calderon.analyst"));

    private final AccountService accounts;
    private final LaboratoryService laboratories;
    private final Passwords passwords;
    private final EntityManager entityManager;
    private final Clock clock;

    public DemoAccounts(AccountService accounts, LaboratoryService laboratories, Passwords passwords,
                        EntityManager entityManager, Clock clock) {
        this.accounts = accounts;
        this.laboratories = laboratories;
        this.passwords = passwords;
        this.entityManager = entityManager;
        this.clock = clock;
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public void load() {
        String hash = passwords.hash(DEMO_PASSWORD);
        accounts.createUser("admin", "Roundtable Administrator", null, Role.ADMIN, null);
        accounts.createUser("coordinator", "Marta Ilves", "marta.ilves@northmarch.example", Role.COORDINATOR, null);
        AccountService.UserWithLink auditor = accounts.createUser("auditor", "Jonas Peltier",
                "jonas.peltier@assessment.example", Role.AUDITOR, null);
        Long kestrelId = null;
        for (DemoLab lab : LABORATORIES) {
            LaboratoryService.CreatedLaboratory created = laboratories.create(new LaboratoryService.NewLaboratory(
                    lab.name(), lab.organisation(), lab.country(), lab.contact(),
                    lab.manager().replace(".manager", "") + "@lab.example", lab.manager(), lab.contact()));
            accounts.createUser(lab.member(), "Analyst at " + lab.organisation(), null, Role.LAB_MEMBER,
                    created.laboratory().id());
            if (kestrelId == null) {
                kestrelId = created.laboratory().id();
            }
        }
        entityManager.createNativeQuery("UPDATE app_user SET password_hash = :hash, password_changed_at = now()")
                .setParameter("hash", hash).executeUpdate();
        entityManager.createNativeQuery("UPDATE password_reset SET used_at = now() WHERE used_at IS NULL").executeUpdate();
        OffsetDateTime now = OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
        long managerId = ((Number) entityManager.createNativeQuery("SELECT id FROM app_user WHERE username = 'kestrel.manager'")
                .getSingleResult()).longValue();
        AuditorGrant grant = new AuditorGrant();
        grant.laboratoryId = kestrelId;
        grant.auditorId = auditor.user().id();
        grant.grantedBy = managerId;
        grant.grantedAt = now;
        grant.validUntil = now.plusDays(365);
        entityManager.persist(grant);
    }

    public String describeLogins() {
        StringBuilder out = new StringBuilder();
        out.append("  admin              administrator\n");
        out.append("  coordinator        scheme coordinator (Northmarch Alloy Proficiency Office)\n");
        out.append("  auditor            auditor, granted access to Kestrel Alloys\n");
        for (DemoLab lab : LABORATORIES) {
            out.append(String.format("  %-18s lab manager, %s%n", lab.manager(), lab.organisation()));
            out.append(String.format("  %-18s lab member,  %s%n", lab.member(), lab.organisation()));
        }
        return out.toString();
    }
}
