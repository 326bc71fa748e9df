package org.roundtable.report.render;

/** Escaping for generated XHTML. */
final class Xhtml {

    private Xhtml() {
    }

    /** Escapes text for element content and attribute values; drops characters XML forbids. */
    static String esc(String text) {
        if (text == null) {
            return "";
        }
        StringBuilder out = new StringBuilder(text.length() + 16);
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            switch (c) {
                case '&' -> out.append("&amp;");
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '"' -> out.append("&quot;");
                case '\'' -> out.append("&#39;");
                default -> {
                    if (c >= 0x20 || c == '\n' || c == '\t' || c == '\r') {
                        out.append(c);
                    }
                }
            }
        }
        return out.toString();
    }

    /** Escaped text with the subscripts of "x_pt", "σ_pt", "u(x_pt)" and "s_s" written as {@code <sub>}. */
    static String sym(String text) {
        return esc(text).replace("_pt", "<sub>pt</sub>").replace("s_s", "s<sub>s</sub>");
    }
}
