package org.roundtable.report.model;

import java.util.Objects;
import java.util.Optional;

/**
 * Sign-off of the report: the named coordinator and, where the scheme requires one, a second
 * reviewer.
 *
 * @param coordinator the coordinator who signed the report off
 * @param secondReviewer the second reviewer, or {@code null}
 */
public record Signatures(Signatory coordinator, Signatory secondReviewer) {

    public Signatures {
        Objects.requireNonNull(coordinator, "coordinator");
    }

    /** The second reviewer, if any. */
    public Optional<Signatory> optionalSecondReviewer() {
        return Optional.ofNullable(secondReviewer);
    }
}
