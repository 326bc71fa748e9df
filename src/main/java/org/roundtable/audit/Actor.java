package org.roundtable.audit;

/**
 * Who did something: a user name (or {@code token:<name>} for an API token, {@code system} for scheduled
 * work), the role acted in, and the laboratory acted for, if any.
 */
public record Actor(String name, String role, Long laboratoryId) {

    public static final Actor SYSTEM = new Actor("system", "system", null);

    public Actor {
        if (name == null || name.isBlank()) {
            throw new IllegalArgumentException("an actor needs a name");
        }
    }
}
