package org.roundtable.platform;

import java.time.Clock;
import java.time.Instant;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.util.function.Supplier;

/**
 * The application's clock, with a time that only a loader's own thread sees: the demo loader sets it to place past
 * rounds in the past (every service reads "now" from the injected clock, so receipts, deadlines, audit entries and
 * issue dates follow it), while requests and schedulers on other threads keep the real time.
 *
 * <p>{@link #at} runs a piece of work at a given instant on the calling thread and restores the real time after it.
 */
public final class LoaderClock extends Clock {

    private static final ThreadLocal<Instant> LOADER_TIME = new ThreadLocal<>();

    private final Clock real;

    LoaderClock(Clock real) {
        this.real = real;
    }

    /** Runs {@code work} on this thread with "now" at {@code instant}. */
    public static <T> T at(Instant instant, Supplier<T> work) {
        Instant before = LOADER_TIME.get();
        LOADER_TIME.set(instant);
        try {
            return work.get();
        } finally {
            if (before == null) {
                LOADER_TIME.remove();
            } else {
                LOADER_TIME.set(before);
            }
        }
    }

    /** As {@link #at(Instant, Supplier)} for work without a result. */
    public static void at(Instant instant, Runnable work) {
        at(instant, () -> {
            work.run();
            return null;
        });
    }

    @Override
    public Instant instant() {
        Instant loader = LOADER_TIME.get();
        return loader != null ? loader : real.instant();
    }

    @Override
    public ZoneId getZone() {
        return ZoneOffset.UTC;
    }

    @Override
    public Clock withZone(ZoneId zone) {
        Clock zoned = real.withZone(zone);
        return new Clock() {
            @Override
            public ZoneId getZone() {
                return zone;
            }

            @Override
            public Clock withZone(ZoneId other) {
                return LoaderClock.this.withZone(other);
            }

            @Override
            public Instant instant() {
                Instant loader = LOADER_TIME.get();
                return loader != null ? loader : zoned.instant();
            }
        };
    }
}
