package org.roundtable.report.model;

import java.util.Objects;

/**
 * A result left out of the statistics, with the reason.
 *
 * @param participantCode the participant code
 * @param measurandId the measurand section, or empty when all the participant's results are excluded
 * @param reason why, e.g. "unit error confirmed by the participant"
 */
public record Exclusion(String participantCode, String measurandId, String reason) {

    public Exclusion {
        Objects.requireNonNull(participantCode, "participantCode");
        Objects.requireNonNull(reason, "reason");
        measurandId = measurandId == null ? "" : measurandId;
    }
}
