package org.roundtable.platform;

import java.util.List;

/**
 * The second step before something that cannot be undone: what will happen, said plainly, and the one button
 * that does it. A page action that needs it answers a first post (without {@code confirmed=yes}) with this
 * step ({@link Confirmations#page}); the step's form repeats the first post's fields and adds
 * {@code confirmed=yes}.
 *
 * @param title       the question, e.g. "Cancel round R-2026-1?"
 * @param consequence what follows, in the reader's words ("Laboratories can no longer submit results…")
 * @param action      where the step posts to (the same address as the first post)
 * @param fields      the first post's fields, carried along as hidden inputs
 * @param reasonLabel the label of a reason field, or null for none
 * @param reasonRequired whether the reason must be given (checked by the service too)
 * @param reason      the reason typed on the first step, kept in the field (or null)
 * @param button      the label of the button that does it
 * @param back        where "Keep things as they are" leads
 */
public record Confirmation(String title, String consequence, String action, List<Field> fields, String reasonLabel,
                           boolean reasonRequired, String reason, String button, String back) {

    /** The value that marks a confirmed post. */
    public static final String CONFIRMED = "yes";

    /** A hidden field carried from the first post to the second. */
    public record Field(String name, String value) {
    }

    /** Whether the form value {@code confirmed} says the second step was taken. */
    public static boolean confirmed(String value) {
        return CONFIRMED.equals(value);
    }
}
