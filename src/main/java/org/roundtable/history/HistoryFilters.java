package org.roundtable.history;

import org.roundtable.platform.DomainException;

import java.time.LocalDate;
import java.time.format.DateTimeParseException;

/** Reads the history's filter from query parameters; bad input is a 400 with the field named. */
final class HistoryFilters {

    private HistoryFilters() {
    }

    static HistoryService.Filter of(String scheme, String measurand, String method, String from, String until,
                                    String rounds, String years) {
        HistoryService.Filter f = new HistoryService.Filter(number(scheme, "scheme"), text(measurand), text(method),
                date(from, "from"), date(until, "until"), count(rounds, "rounds"), count(years, "years"));
        if (f.from() != null && f.until() != null && f.from().isAfter(f.until())) {
            throw new DomainException.BadRequest("The period starts on or before the day it ends.");
        }
        return f;
    }

    private static String text(String s) {
        return s == null || s.isBlank() ? null : s.strip();
    }

    private static Long number(String s, String field) {
        if (text(s) == null) {
            return null;
        }
        try {
            return Long.parseLong(s.strip());
        } catch (NumberFormatException e) {
            throw new DomainException.BadRequest("The " + field + " is not a valid choice.");
        }
    }

    private static Integer count(String s, String field) {
        Long n = number(s, field);
        if (n != null && (n < 1 || n > 100)) {
            throw new DomainException.BadRequest("The window's " + field + " is a whole number from 1 to 100.");
        }
        return n == null ? null : n.intValue();
    }

    private static LocalDate date(String s, String field) {
        if (text(s) == null) {
            return null;
        }
        try {
            return LocalDate.parse(s.strip());
        } catch (DateTimeParseException e) {
            throw new DomainException.BadRequest("The period's '" + field + "' is a date like 2026-01-31.");
        }
    }
}
