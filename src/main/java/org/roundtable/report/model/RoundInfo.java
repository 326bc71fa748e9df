package org.roundtable.report.model;

import java.time.LocalDate;
import java.util.Objects;

/**
 * The round being reported.
 *
 * @param roundId round identifier, e.g. {@code LAS-2026-2}
 * @param title short title of the round
 * @param dispatchDate date the items were sent
 * @param closingDate deadline for results
 * @param participantsEnrolled number of enrolled participants
 * @param participantsReporting number of participants who reported at least one result
 */
public record RoundInfo(String roundId, String title, LocalDate dispatchDate, LocalDate closingDate,
        int participantsEnrolled, int participantsReporting) {

    public RoundInfo {
        Objects.requireNonNull(roundId, "roundId");
        title = title == null ? "" : title;
    }
}
