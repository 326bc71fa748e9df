package org.roundtable.platform;

/**
 * SQL {@code LIKE} patterns built from what a user typed into a search box: the user's {@code %}, {@code _} and
 * {@code \} match themselves. PostgreSQL's default escape character for {@code LIKE} and {@code ILIKE} is the
 * backslash, so the patterns work with or without {@code ESCAPE '\'}.
 */
public final class LikePatterns {

    private LikePatterns() {
    }

    /** The pattern matching any text that contains {@code typed} as it was typed (no case folding here). */
    public static String containing(String typed) {
        return "%" + escaped(typed == null ? "" : typed) + "%";
    }

    /** {@code typed} with the LIKE wildcards and the escape character escaped. */
    public static String escaped(String typed) {
        return typed.replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_");
    }
}
