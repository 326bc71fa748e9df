package org.roundtable.demo;

import io.quarkus.runtime.StartupEvent;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.account.Role;
import org.roundtable.audit.Actor;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.report.ReportLifecycle;
import jakarta.enterprise.context.control.ActivateRequestContext;
import jakarta.enterprise.event.Observes;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.jboss.logging.Logger;
import org.roundtable.account.DemoAccounts;
import org.roundtable.scheme.DemoSchemes;
import org.roundtable.submission.DemoSubmissions;

/**
 * Loads the demo scenario into an empty database when {@code roundtable.demo.enabled} is true (set by
 * rounds-demo/start.sh). Everything in it is invented: the scheme office, the laboratories, the people.
 * Two instances starting together load it once (advisory lock, then the emptiness check).
 */
@ApplicationScoped
public class DemoData {

    private static final Logger LOG = Logger.getLogger(DemoData.class);
    static final long LOAD_LOCK = 0x52_54_44_45_4D_4FL; // "RTDEMO"

    private final boolean enabled;
    private final EntityManager entityManager;
    private final DemoAccounts accounts;
    private final DemoSchemes schemes;
    private final DemoSubmissions submissions;
    private final EvaluationService evaluations;
    private final ReportLifecycle reports;

    public DemoData(@ConfigProperty(name = "roundtable.demo.enabled", defaultValue = "false") boolean enabled,
                    EntityManager entityManager, DemoAccounts accounts, DemoSchemes schemes,
                    DemoSubmissions submissions, EvaluationService evaluations, ReportLifecycle reports) {
        this.enabled = enabled;
        this.entityManager = entityManager;
        this.accounts = accounts;
        this.schemes = schemes;
        this.submissions = submissions;
        this.evaluations = evaluations;
        this.reports = reports;
    }

    void onStart(@Observes StartupEvent event) {
        if (!enabled) {
            return;
        }
        boolean loaded = load();
        if (loaded) {
            loadSubmissions();
            publishPastRound();
        }
        String logins = accounts.describeLogins();
        String banner = (loaded ? "Demo data loaded." : "Demo data already present.") + " Demo sign-ins (password for all: "
                + DemoAccounts.DEMO_PASSWORD + "):\n" + logins;
        LOG.info(banner);
    }

    /** Demo results go through the submission service, each in its own transaction, after the round is committed. */
    @ActivateRequestContext
    void loadSubmissions() {
        submissions.load();
        submissions.loadPastRound();
    }

    /**
     * The earlier round is closed, evaluated and published (preliminary, comment period, sign-off, final) by the demo
     * coordinator, so that laboratories and the auditor have reports to download.
     */
    @ActivateRequestContext
    void publishPastRound() {
        long started = System.nanoTime();
        long round = schemes.closePastRound();
        Actor coordinator = new Actor("coordinator", Role.COORDINATOR_NAME, null);
        int version = evaluations.run(round, false, coordinator).run().version();
        reports.publishWithoutJobs(round, version, "Five laboratories reported all ten measurands. With fewer than "
                        + "ten results the consensus values carry a larger uncertainty; read the scores with that in mind "
                        + "(demo data, invented).",
                new ReportLifecycle.Signer(coordinator, "Marta Ilves"));
        LOG.infof("Demo round %s evaluated and its reports issued in %d ms.", DemoSchemes.PAST_ROUND,
                (System.nanoTime() - started) / 1_000_000);
    }

    @Transactional
    @ActivateRequestContext
    boolean load() {
        entityManager.createNativeQuery("SELECT pg_advisory_xact_lock(:key)").setParameter("key", LOAD_LOCK).getSingleResult();
        long users = ((Number) entityManager.createNativeQuery("SELECT count(*) FROM app_user").getSingleResult()).longValue();
        if (users > 0) {
            return false;
        }
        accounts.load();
        schemes.load();
        return true;
    }
}
