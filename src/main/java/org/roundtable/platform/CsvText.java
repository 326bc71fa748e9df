package org.roundtable.platform;

/**
 * Text cells for CSV exports (RFC 4180). A cell that a spreadsheet would read as a formula — leading
 * {@code = + - @}, tab, carriage return or NUL — is prefixed with an apostrophe (ASVS v5.0.0-1.2.10); cells
 * with a comma, quote or line break are quoted. Numbers written by our own code use {@link #number}.
 */
public final class CsvText {

    private CsvText() {
    }

    public static String cell(String value) {
        if (value == null || value.isEmpty()) {
            return "";
        }
        String text = value;
        char first = text.charAt(0);
        if (first == '=' || first == '+' || first == '-' || first == '@' || first == '\t' || first == '\r' || first == '\0') {
            text = "'" + text;
        }
        if (text.indexOf(',') >= 0 || text.indexOf('"') >= 0 || text.indexOf('\n') >= 0 || text.indexOf('\r') >= 0) {
            text = '"' + text.replace("\"", "\"\"") + '"';
        }
        return text;
    }

    /** A number we computed ourselves (never user text): written plainly, a minus sign allowed. */
    public static String number(Number value) {
        return value == null ? "" : value.toString();
    }
}
