package org.roundtable.history;

import java.util.Locale;

/** A published score's classification as the history reads it (stored by the evaluation as a word or a name). */
public enum Verdict {
    SATISFACTORY("satisfactory"),
    QUESTIONABLE("questionable"),
    UNSATISFACTORY("unsatisfactory");

    private final String word;

    Verdict(String word) {
        this.word = word;
    }

    /** The word shown on pages and in exports. */
    public String word() {
        return word;
    }

    /** The verdict of a stored classification, or null for none (not scored). */
    public static Verdict of(String classification) {
        if (classification == null || classification.isBlank()) {
            return null;
        }
        String c = classification.strip().toUpperCase(Locale.ROOT);
        for (Verdict v : values()) {
            if (v.name().equals(c)) {
                return v;
            }
        }
        return null;
    }
}
