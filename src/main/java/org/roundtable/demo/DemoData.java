package org.roundtable.demo;

import io.quarkus.runtime.StartupEvent;
import jakarta.enterprise.context.ApplicationScoped;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.job.JobService;
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
    private final JobService jobs;

    public DemoData(@ConfigProperty(name = "roundtable.demo.enabled", defaultValue = "false") boolean enabled,
                    EntityManager entityManager, DemoAccounts accounts, DemoSchemes schemes,
                    DemoSubmissions submissions, EvaluationService evaluations, JobService jobs) {
        this.enabled = enabled;
        this.entityManager = entityManager;
        this.accounts = accounts;
        this.schemes = schemes;
        this.submissions = submissions;
        this.evaluations = evaluations;
        this.jobs = jobs;
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
     * The earlier round is closed and evaluated now; its preliminary and final reports are issued by the
     * {@link DemoPublication} job after start-up (rendering a dozen PDFs would otherwise hold up the start).
     */
    @ActivateRequestContext
    void publishPastRound() {
        long round = schemes.closePastRound();
        int version = evaluations.run(round, false, DemoPublication.COORDINATOR).run().version();
        jobs.enqueue(DemoPublication.KIND, "{\"round\":" + round + ",\"version\":" + version + "}",
                DemoPublication.COORDINATOR.name());
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
