package org.roundtable.account;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;

/**
 * The demo scenario's people and laboratories (all invented): the "Northmarch Alloy Proficiency Office" runs the
 * schemes; 24 laboratories in 18 countries take part, the first five with a manager and an analyst sign-in, the
 * others with a manager's; one auditor follows Kestrel Alloys, Brennholt and Lumeris with their permission.
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
            new DemoLab("Calderon Aceros SA", "Calderon Laboratorio de Ensayos", "ES", "Diego Arrabal", "calderon.manager", "calderon.analyst"),
            new DemoLab("Oakmere Forge Testing Ltd", "Oakmere Materials Laboratory", "GB", "Ruth Penhallow", "oakmere.manager", null),
            new DemoLab("Vystrany Hutni Zavody", "Vystrany Zkusebni Laborator", "CZ", "Tomas Rezac", "vystrany.manager", null),
            new DemoLab("Pomorze Stal SA", "Pomorze Laboratorium Chemiczne", "PL", "Agata Welna", "pomorze.manager", null),
            new DemoLab("Adriatica Metalli Srl", "Adriatica Laboratorio Analisi", "IT", "Paolo Ferrandi", "adriatica.manager", null),
            new DemoLab("Ferrovale Fundicao Lda", "Ferrovale Laboratorio Quimico", "PT", "Ines Valadim", "ferrovale.manager", null),
            new DemoLab("Dunmore Castings Ltd", "Dunmore Castings Test House", "IE", "Ciaran Tully", "dunmore.manager", null),
            new DemoLab("Veldhaven Metaal BV", "Veldhaven Metaallab", "NL", "Sanne de Ruiter", "veldhaven.manager", null),
            new DemoLab("Salzach Pruftechnik GmbH", "Salzach Werkstoffprufung", "AT", "Lukas Pernegger", "salzach.manager", null),
            new DemoLab("Kuusijarvi Teras Oy", "Kuusijarvi Teraslaboratorio", "FI", "Aino Rautio", "kuusijarvi.manager", null),
            new DemoLab("Nordfjell Stal AS", "Nordfjell Stallaboratorium", "NO", "Eirik Hovland", "nordfjell.manager", null),
            new DemoLab("Brabantse Gieterij NV", "Brabantse Gieterij Labo", "BE", "Wout Verhaegen", "brabant.manager", null),
            new DemoLab("Hrast Metalurgija", "Hrast Kemijski Laboratorij", "SI", "Maja Kovacic", "hrast.manager", null),
            new DemoLab("Mures Oteluri SRL", "Mures Laborator Analize", "RO", "Andrei Cozma", "mures.manager", null),
            new DemoLab("Tejo Forjados SA", "Tejo Laboratorio de Materiais", "PT", "Rui Amoedo", "tejo.manager", null),
            new DemoLab("Ebro Forja SL", "Ebro Laboratorio Metalurgico", "ES", "Lucia Sarrion", "ebro.manager", null),
            new DemoLab("Loire Aciers SAS", "Loire Laboratoire Metallurgie", "FR", "Manon Berthier", "loire.manager", null),
            new DemoLab("Weserstahl Analytik GmbH", "Weserstahl Prufabor", "DE", "Katrin Ostendorf", "weser.manager", null),
            new DemoLab("Skagen Metal Test ApS", "Skagen Metallaboratorium", "DK", "Mikkel Brandt", "skagen.manager", null),
            new DemoLab("Harrowdale Steel Services Ltd", "Harrowdale Analytical Laboratory", "GB", "Owen Pryce", "harrowdale.manager", null));

    /** The laboratories that grant the demo auditor access to their reports. */
    static final java.util.Set<String> GRANTING = java.util.Set.of("kestrel.manager", "brennholt.manager",
            "lumeris.manager");

    /** A loaded demo laboratory: its id, its manager's sign-in and its organisation. */
    public record Loaded(long id, String manager, String member, String organisation) {
    }

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

    /** Loads the people and laboratories (in the caller's transaction); returns the laboratories in list order. */
    @Transactional(Transactional.TxType.MANDATORY)
    public List<Loaded> load() {
        String hash = passwords.hash(DEMO_PASSWORD);
        accounts.createUser("admin", "Roundtable Administrator", null, Role.ADMIN, null);
        accounts.createUser("coordinator", "Marta Ilves", "marta.ilves@northmarch.example", Role.COORDINATOR, null);
        AccountService.UserWithLink auditor = accounts.createUser("auditor", "Jonas Peltier",
                "jonas.peltier@assessment.example", Role.AUDITOR, null);
        List<Loaded> loaded = new java.util.ArrayList<>();
        for (DemoLab lab : LABORATORIES) {
            LaboratoryService.CreatedLaboratory created = laboratories.create(new LaboratoryService.NewLaboratory(
                    lab.name(), lab.organisation(), lab.country(), lab.contact(),
                    lab.manager().replace(".manager", "") + "@lab.example", lab.manager(), lab.contact()));
            if (lab.member() != null) {
                accounts.createUser(lab.member(), "Analyst at " + lab.organisation(), null, Role.LAB_MEMBER,
                        created.laboratory().id());
            }
            loaded.add(new Loaded(created.laboratory().id(), lab.manager(), lab.member(), lab.organisation()));
        }
        OffsetDateTime now = OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
        entityManager.createNativeQuery("UPDATE app_user SET password_hash = :hash, password_changed_at = :now")
                .setParameter("hash", hash).setParameter("now", now).executeUpdate();
        entityManager.createNativeQuery("UPDATE password_reset SET used_at = :now WHERE used_at IS NULL")
                .setParameter("now", now).executeUpdate();
        for (Loaded lab : loaded) {
            if (!GRANTING.contains(lab.manager())) {
                continue;
            }
            long managerId = ((Number) entityManager.createNativeQuery("SELECT id FROM app_user WHERE username = :u")
                    .setParameter("u", lab.manager()).getSingleResult()).longValue();
            AuditorGrant grant = new AuditorGrant();
            grant.laboratoryId = lab.id();
            grant.auditorId = auditor.user().id();
            grant.grantedBy = managerId;
            grant.grantedAt = now;
            grant.validUntil = now.plusDays(800);
            entityManager.persist(grant);
        }
        return loaded;
    }

    public String describeLogins() {
        StringBuilder out = new StringBuilder();
        out.append("  admin              administrator\n");
        out.append("  coordinator        scheme coordinator (Northmarch Alloy Proficiency Office)\n");
        out.append("  auditor            auditor, granted access by Kestrel Alloys, Brennholt and Lumeris\n");
        List<String> others = new java.util.ArrayList<>();
        for (DemoLab lab : LABORATORIES) {
            if (lab.member() == null) {
                others.add(lab.manager());
                continue;
            }
            out.append(String.format("  %-18s lab manager, %s%n", lab.manager(), lab.organisation()));
            out.append(String.format("  %-18s lab member,  %s%n", lab.member(), lab.organisation()));
        }
        out.append("  and the managers of the other ").append(others.size()).append(" laboratories: ")
                .append(String.join(", ", others)).append('\n');
        return out.toString();
    }
}
