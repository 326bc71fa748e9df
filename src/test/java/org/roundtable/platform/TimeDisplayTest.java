package org.roundtable.platform;

import org.junit.jupiter.api.Test;

import java.time.Instant;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.OffsetDateTime;
import java.time.ZoneId;
import java.time.ZoneOffset;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

/**
 * The one time format. Zone rules and the 2026 daylight-saving dates are the IANA database's (EU: last Sunday of
 * March and October at 01:00 UTC; US: second Sunday of March, first Sunday of November at 02:00 local).
 */
class TimeDisplayTest {

    private static final ZoneId LONDON = ZoneId.of("Europe/London");
    private static final ZoneId BERLIN = ZoneId.of("Europe/Berlin");
    private static final ZoneId NEW_YORK = ZoneId.of("America/New_York");
    private static final ZoneId TOKYO = ZoneId.of("Asia/Tokyo");

    @Test
    void aMomentIsWrittenWithItsZoneNamed() {
        assertThat(TimeDisplay.at(Instant.parse("2026-12-02T18:00:00Z"), LONDON)).isEqualTo("2026-12-02 18:00 Europe/London");
        assertThat(TimeDisplay.at(Instant.parse("2026-12-02T18:00:00Z"), ZoneOffset.UTC)).isEqualTo("2026-12-02 18:00 Z");
        assertThat(TimeDisplay.at(Instant.parse("2026-12-02T18:00:00Z"), ZoneId.of("UTC"))).isEqualTo("2026-12-02 18:00 UTC");
        assertThat(TimeDisplay.exact(Instant.parse("2026-12-02T18:00:07Z"), BERLIN)).isEqualTo("2026-12-02 19:00:07 Europe/Berlin");
        assertThat(TimeDisplay.at(null, BERLIN)).isEmpty();
    }

    @Test
    void aDeadlineShowsTheRoundsZoneAndTheViewersWhenItDiffers() {
        Instant six = Instant.parse("2026-12-02T18:00:00Z");
        assertThat(TimeDisplay.deadline(six, LONDON, BERLIN)).isEqualTo("2026-12-02 18:00 Europe/London (19:00 Europe/Berlin)");
        assertThat(TimeDisplay.deadline(six, LONDON, LONDON)).isEqualTo("2026-12-02 18:00 Europe/London");
        assertThat(TimeDisplay.deadline(six, LONDON, null)).isEqualTo("2026-12-02 18:00 Europe/London");
    }

    @Test
    void aDeadlineRepeatsTheDateWhereTheViewersClockShowsAnotherDay() {
        Instant six = Instant.parse("2026-12-02T18:00:00Z");
        assertThat(TimeDisplay.deadline(six, LONDON, TOKYO)).isEqualTo("2026-12-02 18:00 Europe/London (2026-12-03 03:00 Asia/Tokyo)");
        assertThat(TimeDisplay.deadline(Instant.parse("2026-12-02T01:00:00Z"), LONDON, NEW_YORK))
                .isEqualTo("2026-12-02 01:00 Europe/London (2026-12-01 20:00 America/New_York)");
    }

    @Test
    void theOffsetBetweenZonesIsTakenAtTheMomentShownAcrossDaylightSavingChanges() {
        // 2026-03-08: New York is on summer time (UTC−4), London still on winter time (UTC+0): 4 hours apart
        assertThat(TimeDisplay.deadline(Instant.parse("2026-03-20T17:00:00Z"), LONDON, NEW_YORK))
                .isEqualTo("2026-03-20 17:00 Europe/London (13:00 America/New_York)");
        // 2026-03-29 01:00 UTC London moves to UTC+1: 5 hours apart again
        assertThat(TimeDisplay.deadline(Instant.parse("2026-04-02T17:00:00Z"), LONDON, NEW_YORK))
                .isEqualTo("2026-04-02 18:00 Europe/London (13:00 America/New_York)");
        // a winter deadline
        assertThat(TimeDisplay.deadline(Instant.parse("2026-01-15T17:00:00Z"), LONDON, NEW_YORK))
                .isEqualTo("2026-01-15 17:00 Europe/London (12:00 America/New_York)");
    }

    @Test
    void theSpringGapAndTheAutumnRepeatedHourPrintAsTheClockShowedThem() {
        // Berlin 2026-03-29: 02:00 CET becomes 03:00 CEST at 01:00 UTC; no 02:xx exists
        assertThat(TimeDisplay.at(Instant.parse("2026-03-29T00:59:00Z"), BERLIN)).isEqualTo("2026-03-29 01:59 Europe/Berlin");
        assertThat(TimeDisplay.at(Instant.parse("2026-03-29T01:00:00Z"), BERLIN)).isEqualTo("2026-03-29 03:00 Europe/Berlin");
        // Berlin 2026-10-25: 03:00 CEST becomes 02:00 CET at 01:00 UTC; 02:30 happens twice
        assertThat(TimeDisplay.at(Instant.parse("2026-10-25T00:30:00Z"), BERLIN)).isEqualTo("2026-10-25 02:30 Europe/Berlin");
        assertThat(TimeDisplay.at(Instant.parse("2026-10-25T01:30:00Z"), BERLIN)).isEqualTo("2026-10-25 02:30 Europe/Berlin");
    }

    @Test
    void valuesFromTheDatabaseAndTheViewsAreReadAsMoments() {
        Instant t = Instant.parse("2026-12-02T18:00:00Z");
        assertThat(TimeDisplay.instant(t.atOffset(ZoneOffset.ofHours(2)))).isEqualTo(t);
        assertThat(TimeDisplay.instant(t.atZone(BERLIN))).isEqualTo(t);
        assertThat(TimeDisplay.instant(LocalDateTime.of(2026, 12, 2, 18, 0))).isEqualTo(t);
        assertThat(TimeDisplay.instant(OffsetDateTime.parse("2026-12-02T18:00:00Z"))).isEqualTo(t);
        assertThat(TimeDisplay.instant(null)).isNull();
        assertThatThrownBy(() -> TimeDisplay.instant(LocalDate.of(2026, 12, 2))).isInstanceOf(IllegalArgumentException.class);
        assertThat(TimeDisplay.date(LocalDate.of(2026, 12, 2))).isEqualTo("2026-12-02");
        assertThat(TimeDisplay.iso(t)).isEqualTo("2026-12-02T18:00:00Z");
    }

    @Test
    void onlyZonesOfTheIanaRegionListAreOfferedAndAccepted() {
        assertThat(TimeDisplay.zones()).first().isEqualTo("UTC");
        assertThat(TimeDisplay.zones()).contains("Europe/Berlin", "America/Sao_Paulo", "Asia/Kolkata", "Pacific/Auckland")
                .doesNotContain("US/Eastern", "EST5EDT", "Etc/GMT+5", "SystemV/AST4");
        assertThat(TimeDisplay.zones().subList(1, TimeDisplay.zones().size())).isSorted();
        assertThat(TimeDisplay.zoneOr("Europe/Berlin", LONDON)).isEqualTo(BERLIN);
        assertThat(TimeDisplay.zoneOr("Mars/Olympus", LONDON)).isEqualTo(LONDON);
        assertThat(TimeDisplay.zoneOr("US/Eastern", LONDON)).isEqualTo(LONDON);
        assertThat(TimeDisplay.zoneOr(null, LONDON)).isEqualTo(LONDON);
    }
}
