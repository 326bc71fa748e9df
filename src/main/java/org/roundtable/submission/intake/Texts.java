package org.roundtable.submission.intake;

/** Small text helpers shared by the readers. */
final class Texts {

    private static final int SHOWN_LENGTH = 80;

    private Texts() {
    }

    /** The text as shown in a problem: at most 80 characters, control characters as {@code \\uXXXX}. */
    static String shown(String text) {
        if (text == null) {
            return null;
        }
        StringBuilder shown = new StringBuilder();
        int limit = Math.min(text.length(), SHOWN_LENGTH);
        for (int i = 0; i < limit; i++) {
            char c = text.charAt(i);
            if (c < 0x20 || c == 0x7f) {
                shown.append(String.format("\\u%04x", (int) c));
            } else {
                shown.append(c);
            }
        }
        if (text.length() > SHOWN_LENGTH) {
            shown.append('…');
        }
        return shown.toString();
    }

    /** Removes leading and trailing spaces (U+0020 only: a leading tab must stay visible to the formula check). */
    static String trimSpaces(String text) {
        int start = 0;
        int end = text.length();
        while (start < end && text.charAt(start) == ' ') {
            start++;
        }
        while (end > start && text.charAt(end - 1) == ' ') {
            end--;
        }
        return text.substring(start, end);
    }
}
