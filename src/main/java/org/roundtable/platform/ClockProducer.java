package org.roundtable.platform;

import io.quarkus.arc.DefaultBean;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.inject.Produces;
import jakarta.inject.Singleton;

import java.time.Clock;

/** The one source of "now". Tests and the demo replace it to place rounds in the past. */
@ApplicationScoped
public class ClockProducer {

    @Produces
    @DefaultBean
    @Singleton
    Clock clock() {
        return Clock.systemUTC();
    }
}
