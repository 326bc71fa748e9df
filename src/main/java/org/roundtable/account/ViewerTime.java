package org.roundtable.account;

import jakarta.enterprise.context.RequestScoped;
import jakarta.inject.Named;
import org.roundtable.platform.DisplaySettings;
import org.roundtable.platform.TimeDisplay;

import java.time.Instant;
import java.time.LocalDate;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.util.List;

/**
 * Times for the person looking at the page, in the zone chosen on their account page or, where they chose none
 * (or are not signed in), in the installation's zone ({@code roundtable.display.time-zone}). The rules are
 * {@link TimeDisplay}'s; this bean only knows whose zone applies. Templates use it through the
 * {@code time} and {@code deadline} tags.
 */
@RequestScoped
@Named("viewerTime")
public class ViewerTime {

    private final CurrentUser currentUser;
    private final UserAccountRepository users;
    private final DisplaySettings settings;
    private ZoneId zone;

    public ViewerTime(CurrentUser currentUser, UserAccountRepository users, DisplaySettings settings) {
        this.currentUser = currentUser;
        this.users = users;
        this.settings = settings;
    }

    /** The installation's zone (UTC where the configured name is not a zone). */
    public ZoneId installationZone() {
        return TimeDisplay.zoneOr(settings.timeZone(), ZoneOffset.UTC);
    }

    /** The viewer's zone: their own choice, else the installation's. Read once per request. */
    public ZoneId zone() {
        if (zone == null) {
            String chosen = currentUser.userId().map(users::findById).map(u -> u.timeZone).orElse(null);
            zone = TimeDisplay.zoneOr(chosen, installationZone());
        }
        return zone;
    }

    /** The zone the viewer chose, or null where they follow the installation's. */
    public String chosenZone() {
        return currentUser.userId().map(users::findById).map(u -> u.timeZone).orElse(null);
    }

    /** A moment (or a date) as people read it: {@code 2026-12-02 18:00 Europe/Berlin}. */
    public String at(Object value) {
        if (value instanceof LocalDate date) {
            return TimeDisplay.date(date);
        }
        return TimeDisplay.at(TimeDisplay.instant(value), zone());
    }

    /** With seconds, for receipts. */
    public String exact(Object value) {
        return TimeDisplay.exact(TimeDisplay.instant(value), zone());
    }

    /** A deadline in the round's zone and, if it differs, the viewer's. */
    public String deadline(Object value, String roundZone) {
        return TimeDisplay.deadline(TimeDisplay.instant(value), TimeDisplay.zoneOr(roundZone, installationZone()), zone());
    }

    /** For {@code <time datetime>}. */
    public String iso(Object value) {
        if (value instanceof LocalDate date) {
            return date.toString();
        }
        Instant instant = TimeDisplay.instant(value);
        return TimeDisplay.iso(instant);
    }

    /** The zones offered on the account page. */
    public List<String> zones() {
        return TimeDisplay.zones();
    }
}
