package org.roundtable.report.model;

import java.time.LocalDate;
import java.util.Objects;

/**
 * A person who authorised the report.
 *
 * @param name full name
 * @param function role, e.g. "Round coordinator"
 * @param signedOn date of sign-off
 */
public record Signatory(String name, String function, LocalDate signedOn) {

    public Signatory {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(function, "function");
        Objects.requireNonNull(signedOn, "signedOn");
    }
}
