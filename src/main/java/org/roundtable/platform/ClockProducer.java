package org.roundtable.platform;

import io.quarkus.arc.DefaultBean;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.inject.Produces;
import jakarta.inject.Singleton;

import java.time.Clock;

/**
 * The one source of "now": the system clock in UTC, which a loader's thread may set to another time
 * ({@link LoaderClock}). Tests replace the bean.
 */
@ApplicationScoped
public class ClockProducer {

    @Produces
    @DefaultBean
    @Singleton
    Clock clock() {
        return new LoaderClock(Clock.systemUTC());
    }
}
