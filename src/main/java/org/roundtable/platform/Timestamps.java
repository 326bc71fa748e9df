package org.roundtable.platform;

import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;

/** Time in UTC: "now" from the injected clock, and timestamps read back from native queries. */
public final class Timestamps {

    private Timestamps() {
    }

    /** The clock's current instant as a UTC {@link OffsetDateTime}. */
    public static OffsetDateTime now(Clock clock) {
        return OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC);
    }

    /**
     * A {@code timestamptz} column as a native query returns it (the JDBC driver and Hibernate give an
     * {@link OffsetDateTime}, an {@link Instant} or a {@link java.sql.Timestamp}) as UTC; null stays null.
     */
    public static OffsetDateTime utc(Object value) {
        if (value == null) {
            return null;
        }
        if (value instanceof OffsetDateTime odt) {
            return odt.withOffsetSameInstant(ZoneOffset.UTC);
        }
        if (value instanceof Instant instant) {
            return instant.atOffset(ZoneOffset.UTC);
        }
        if (value instanceof java.sql.Timestamp ts) {
            return ts.toInstant().atOffset(ZoneOffset.UTC);
        }
        throw new IllegalStateException("unexpected timestamp type " + value.getClass());
    }
}
