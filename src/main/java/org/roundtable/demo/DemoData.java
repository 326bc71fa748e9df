package org.roundtable.demo;

import io.quarkus.runtime.StartupEvent;
import io.quarkus.scheduler.Scheduler;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.context.control.ActivateRequestContext;
import jakarta.enterprise.event.Observes;
import jakarta.persistence.EntityManager;
import jakarta.transaction.Transactional;
import java.time.Clock;
import java.time.Instant;
import java.util.List;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.jboss.logging.Logger;
import org.roundtable.account.DemoAccounts;
import org.roundtable.platform.LoaderClock;

/**
 * Loads the demo scenario ({@link DemoScenario}) into an empty database when {@code roundtable.demo.enabled} is
 * true (set by rounds-demo/start.sh). Everything in it is invented: the scheme office, the laboratories, the people.
 *
 * <p>The scenario is a list of steps, each with its moment relative to the first start; they run in time order on
 * this thread with the loader's clock ({@link LoaderClock}) at that moment, through the same services the API uses,
 * while the schedulers wait. So receipts, deadlines, audit entries and issue dates agree with each other, the open
 * round is open whatever the day of the first start, and nothing is moved by SQL afterwards. Later starts leave the
 * data alone. Two instances starting together load it once (advisory lock, then the emptiness check, in the
 * transaction that creates the accounts).
 */
@ApplicationScoped
public class DemoData {

    private static final Logger LOG = Logger.getLogger(DemoData.class);
    static final long LOAD_LOCK = 0x52_54_44_45_4D_4FL; // "RTDEMO"

    private final boolean enabled;
    private final EntityManager entityManager;
    private final DemoAccounts accounts;
    private final DemoScenario scenario;
    private final Scheduler scheduler;
    private final Clock clock;

    public DemoData(@ConfigProperty(name = "roundtable.demo.enabled", defaultValue = "false") boolean enabled,
                    EntityManager entityManager, DemoAccounts accounts, DemoScenario scenario, Scheduler scheduler,
                    Clock clock) {
        this.enabled = enabled;
        this.entityManager = entityManager;
        this.accounts = accounts;
        this.scenario = scenario;
        this.scheduler = scheduler;
        this.clock = clock;
    }

    void onStart(@Observes StartupEvent event) {
        if (!enabled) {
            return;
        }
        Instant firstStart = clock.instant();
        scheduler.pause();
        boolean loaded;
        long started = System.nanoTime();
        try {
            List<DemoAccounts.Loaded> laboratories = LoaderClock.at(DemoScenario.accountsAt(firstStart),
                    this::loadAccounts);
            loaded = laboratories != null;
            if (loaded) {
                runSteps(scenario.steps(firstStart, laboratories));
            }
        } finally {
            scheduler.resume();
        }
        String logins = accounts.describeLogins();
        String banner = (loaded ? "Demo data loaded in " + (System.nanoTime() - started) / 1_000_000_000 + " s."
                : "Demo data already present.") + " Demo sign-ins (password for all: " + DemoAccounts.DEMO_PASSWORD
                + "):\n" + logins;
        LOG.info(banner);
    }

    /** The steps in time order, each at its moment on the loader's clock. */
    @ActivateRequestContext
    void runSteps(List<DemoScenario.Step> steps) {
        for (DemoScenario.Step step : steps) {
            long started = System.nanoTime();
            try {
                LoaderClock.at(step.at(), step.work());
                long ms = (System.nanoTime() - started) / 1_000_000;
                if (ms > 5_000) {
                    LOG.infof("Demo: %s took %d s.", step.what(), ms / 1000);
                }
            } catch (RuntimeException e) {
                throw new IllegalStateException("demo step '" + step.what() + "' at " + step.at() + " failed: "
                        + e.getMessage(), e);
            }
        }
    }

    /** The accounts, in the transaction that claims the empty database; null when data are present already. */
    @Transactional
    @ActivateRequestContext
    List<DemoAccounts.Loaded> loadAccounts() {
        entityManager.createNativeQuery("SELECT pg_advisory_xact_lock(:key)").setParameter("key", LOAD_LOCK).getSingleResult();
        long users = ((Number) entityManager.createNativeQuery("SELECT count(*) FROM app_user").getSingleResult()).longValue();
        if (users > 0) {
            return null;
        }
        return accounts.load();
    }
}
