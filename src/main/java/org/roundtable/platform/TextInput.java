package org.roundtable.platform;

import java.util.List;

/**
 * The one rule for text that a request brings in (form fields, multipart text fields, query parameters and every
 * string of a JSON body): control characters are refused, except tab, line feed and carriage return (browsers send
 * CR LF in multi-line text). Refused are U+0000–U+001F other than those three, U+007F–U+009F, and unpaired
 * surrogates (which no well-formed UTF-8 can carry). The web layer applies it to forms and query parameters
 * ({@code web.TextInputFilter}) and to JSON strings ({@code web.JsonText}); uploaded files go through their own
 * intake checks.
 * <p>
 * Bidirectional formatting characters (embeddings, overrides and isolates, U+202A–U+202E and U+2066–U+2069) are
 * text, not control characters: they are accepted and stored as sent, since names in right-to-left scripts may
 * carry them, and they are neutralised where text is shown ({@link #withoutBidiControls}), so that a name cannot
 * reorder the text around it or disguise itself on a page.
 */
public final class TextInput {

    private TextInput() {
    }

    /** Thrown for a text value with a refused character; 400 with the field named. */
    public static class Refused extends DomainException {
        public Refused(String field, int position) {
            super(400, "Invalid request", message(field), List.of(new Detail(null, field, null, "control-character",
                    "Contains a control character (at position " + (position + 1) + "). Remove it and try again.")));
        }

        private static String message(String field) {
            return field == null || field.isBlank()
                    ? "A text field contains a control character."
                    : "The field '" + field + "' contains a control character.";
        }
    }

    /** The index of the first refused character in {@code text}, or -1 when it is acceptable (null is). */
    public static int firstRefused(CharSequence text) {
        if (text == null) {
            return -1;
        }
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (c < 0x20) {
                if (c != '\t' && c != '\n' && c != '\r') {
                    return i;
                }
            } else if (c >= 0x7f && c <= 0x9f) {
                return i;
            } else if (Character.isHighSurrogate(c)) {
                if (i + 1 >= text.length() || !Character.isLowSurrogate(text.charAt(i + 1))) {
                    return i;
                }
                i++;
            } else if (Character.isLowSurrogate(c)) {
                return i;
            }
        }
        return -1;
    }

    /** Throws {@link Refused} naming {@code field} when {@code text} carries a refused character. */
    public static void require(String field, CharSequence text) {
        int at = firstRefused(text);
        if (at >= 0) {
            throw new Refused(field, at);
        }
    }

    /** True for the explicit bidirectional embedding, override and isolate characters. */
    public static boolean isBidiControl(char c) {
        return (c >= '\u202a' && c <= '\u202e') || (c >= '\u2066' && c <= '\u2069');
    }

    /** {@code text} as shown: the explicit bidirectional formatting characters left out; everything else as is. */
    public static String withoutBidiControls(String text) {
        if (text == null) {
            return null;
        }
        int i = 0;
        while (i < text.length() && !isBidiControl(text.charAt(i))) {
            i++;
        }
        if (i == text.length()) {
            return text;
        }
        StringBuilder out = new StringBuilder(text.length());
        out.append(text, 0, i);
        for (; i < text.length(); i++) {
            char c = text.charAt(i);
            if (!isBidiControl(c)) {
                out.append(c);
            }
        }
        return out.toString();
    }
}
