package org.roundtable.platform;

import java.time.DateTimeException;
import java.time.Instant;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.OffsetDateTime;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.time.ZonedDateTime;
import java.time.format.DateTimeFormatter;
import java.time.temporal.TemporalAccessor;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;

/**
 * The product's one way of writing times for people: {@code 2026-12-02 18:00 Europe/London} — date, hours and
 * minutes in a named zone, always with the zone's IANA name (never an offset alone, never "local time"). A
 * deadline is written in the round's zone and, where the viewer's zone is another one, in the viewer's too:
 * {@code 2026-12-02 18:00 Europe/London (19:00 Europe/Berlin)}; the viewer's part repeats the date only when it
 * falls on another day. Seconds are added only where the exact moment is evidence (a receipt).
 *
 * <p>Daylight-saving changes are the zone rules' business ({@link ZonedDateTime}): an instant in the
 * autumn's repeated hour prints the hour as it happened, and the offset between two zones is taken at the
 * instant shown, not today. Times are stored in UTC; this class only converts for display.
 */
public final class TimeDisplay {

    /** The one pattern for a moment shown to people (the zone's name follows it). */
    public static final String PATTERN = "yyyy-MM-dd HH:mm";
    private static final DateTimeFormatter MINUTES = DateTimeFormatter.ofPattern(PATTERN);
    private static final DateTimeFormatter SECONDS = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss");
    private static final DateTimeFormatter CLOCK = DateTimeFormatter.ofPattern("HH:mm");
    private static final DateTimeFormatter DATE = DateTimeFormatter.ofPattern("yyyy-MM-dd");
    private static final Set<String> REGIONS = Set.of("Africa", "America", "Antarctica", "Arctic", "Asia", "Atlantic",
            "Australia", "Europe", "Indian", "Pacific");
    private static final List<String> ZONES = regionZones();

    private TimeDisplay() {
    }

    /** {@code 2026-12-02 18:00 Europe/London}; empty text for null. */
    public static String at(Instant moment, ZoneId zone) {
        return moment == null ? "" : MINUTES.format(moment.atZone(zone)) + " " + zone.getId();
    }

    /** {@code 2026-12-02 18:00:07 Europe/London}: with seconds, for receipts; empty text for null. */
    public static String exact(Instant moment, ZoneId zone) {
        return moment == null ? "" : SECONDS.format(moment.atZone(zone)) + " " + zone.getId();
    }

    /**
     * A deadline in the round's zone and, when the viewer's zone is another one, in the viewer's:
     * {@code 2026-12-02 18:00 Europe/London (19:00 Europe/Berlin)}, or with the date repeated when the viewer's
     * clock shows another day ({@code (2026-12-03 03:00 Asia/Tokyo)}). Empty text for null.
     */
    public static String deadline(Instant moment, ZoneId roundZone, ZoneId viewerZone) {
        if (moment == null) {
            return "";
        }
        String inRound = at(moment, roundZone);
        if (viewerZone == null || viewerZone.getId().equals(roundZone.getId())) {
            return inRound;
        }
        ZonedDateTime there = moment.atZone(roundZone);
        ZonedDateTime here = moment.atZone(viewerZone);
        String viewer = there.toLocalDate().equals(here.toLocalDate()) ? CLOCK.format(here) : MINUTES.format(here);
        return inRound + " (" + viewer + " " + viewerZone.getId() + ")";
    }

    /** A calendar date, {@code 2026-12-02} (a date has no zone); empty text for null. */
    public static String date(LocalDate date) {
        return date == null ? "" : DATE.format(date);
    }

    /** The ISO-8601 instant for a {@code <time datetime>} attribute; empty text for null. */
    public static String iso(Instant moment) {
        return moment == null ? "" : DateTimeFormatter.ISO_INSTANT.format(moment);
    }

    /**
     * The instant of the temporal values the pages carry: {@link OffsetDateTime}, {@link ZonedDateTime},
     * {@link Instant}, or a {@link LocalDateTime} read as UTC (how the database gives it back); null for null.
     *
     * @throws IllegalArgumentException for a value without a moment (a {@link LocalDate}: use {@link #date})
     */
    public static Instant instant(Object value) {
        if (value == null) {
            return null;
        }
        if (value instanceof Instant i) {
            return i;
        }
        if (value instanceof OffsetDateTime o) {
            return o.toInstant();
        }
        if (value instanceof ZonedDateTime z) {
            return z.toInstant();
        }
        if (value instanceof LocalDateTime l) {
            return l.toInstant(ZoneOffset.UTC);
        }
        if (value instanceof TemporalAccessor t && t.isSupported(java.time.temporal.ChronoField.INSTANT_SECONDS)) {
            return Instant.from(t);
        }
        throw new IllegalArgumentException("not a moment: " + value.getClass().getSimpleName());
    }

    /**
     * The zone named {@code id} if it is a zone of the IANA list offered to people ({@link #zones()}), else
     * {@code fallback}; so a stored value that is no longer valid never breaks a page.
     */
    public static ZoneId zoneOr(String id, ZoneId fallback) {
        if (id == null || id.isBlank() || !isOffered(id)) {
            return fallback;
        }
        try {
            return ZoneId.of(id);
        } catch (DateTimeException e) {
            return fallback;
        }
    }

    /** Whether {@code id} is one of the zones a person may choose. */
    public static boolean isOffered(String id) {
        return id != null && (id.equals("UTC") || ZONES.contains(id));
    }

    /**
     * The zones offered in a choice list: "UTC" and the IANA region zones ({@code Europe/Berlin},
     * {@code America/Sao_Paulo}…) sorted by name; the legacy aliases ({@code US/Eastern}, {@code EST5EDT},
     * {@code SystemV/…}, {@code Etc/GMT+5}) are left out, since their names mislead.
     */
    public static List<String> zones() {
        return ZONES;
    }

    private static List<String> regionZones() {
        TreeSet<String> zones = new TreeSet<>();
        for (String id : ZoneId.getAvailableZoneIds()) {
            int slash = id.indexOf('/');
            if (slash > 0 && REGIONS.contains(id.substring(0, slash))) {
                zones.add(id);
            }
        }
        List<String> all = new java.util.ArrayList<>();
        all.add("UTC");
        all.addAll(zones);
        return List.copyOf(all);
    }
}
