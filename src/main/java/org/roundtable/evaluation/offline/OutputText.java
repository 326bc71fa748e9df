package org.roundtable.evaluation.offline;

import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import org.roundtable.platform.CsvText;
import org.roundtable.platform.DoubleText;
import org.roundtable.platform.NumberFormats;

/**
 * The {@code evaluate} command's output of one measurand, built as UTF-8 bytes with no string per field: the same
 * characters as Jackson's compact generator (strings escaped alike, full-precision numbers as
 * {@link Double#toString(double)}, a non-finite number as a quoted string) and as {@link NumberFormats#plain} for
 * the printed numbers, written by {@link DoubleText}.
 *
 * <p>Text of ASCII only is handed to the output stream as its bytes; text with other characters as a string, so
 * that the stream encodes it as before.
 */
final class OutputText {

    private byte[] bytes;
    private int size;
    private boolean ascii = true;
    private final DoubleText doubles = new DoubleText();

    OutputText(int capacity) {
        bytes = new byte[Math.max(64, capacity)];
    }

    /** Prints the text on {@code out}. */
    void printTo(PrintStream out) {
        if (ascii) {
            out.write(bytes, 0, size);
        } else {
            out.print(new String(bytes, 0, size, StandardCharsets.UTF_8));
        }
    }

    @Override
    public String toString() {
        return new String(bytes, 0, size, StandardCharsets.UTF_8);
    }

    private void room(int more) {
        if (size + more > bytes.length) {
            bytes = Arrays.copyOf(bytes, Math.max(size + more, bytes.length + (bytes.length >> 1)));
        }
    }

    /** Appends ASCII bytes as they are (field names, punctuation). */
    OutputText raw(byte[] text) {
        room(text.length);
        System.arraycopy(text, 0, bytes, size, text.length);
        size += text.length;
        return this;
    }

    OutputText raw(char c) {
        room(1);
        bytes[size++] = (byte) c;
        return this;
    }

    /** Appends text without escaping. */
    OutputText text(String s) {
        room(s.length());
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c < 0x80) {
                bytes[size++] = (byte) c;
            } else {
                i = encode(s, i);
            }
        }
        return this;
    }

    /** UTF-8 of the character at {@code i} (a pair of surrogates together; a lone one as '?'); the last index used. */
    private int encode(String s, int i) {
        ascii = false;
        room(4 + s.length() - i);
        char c = s.charAt(i);
        if (c < 0x800) {
            bytes[size++] = (byte) (0xC0 | c >> 6);
            bytes[size++] = (byte) (0x80 | c & 0x3F);
            return i;
        }
        if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
            int cp = Character.toCodePoint(c, s.charAt(i + 1));
            bytes[size++] = (byte) (0xF0 | cp >> 18);
            bytes[size++] = (byte) (0x80 | cp >> 12 & 0x3F);
            bytes[size++] = (byte) (0x80 | cp >> 6 & 0x3F);
            bytes[size++] = (byte) (0x80 | cp & 0x3F);
            return i + 1;
        }
        if (Character.isSurrogate(c)) {
            bytes[size++] = '?';
            return i;
        }
        bytes[size++] = (byte) (0xE0 | c >> 12);
        bytes[size++] = (byte) (0x80 | c >> 6 & 0x3F);
        bytes[size++] = (byte) (0x80 | c & 0x3F);
        return i;
    }

    private static final byte[] HEX = "0123456789ABCDEF".getBytes(StandardCharsets.US_ASCII);
    private static final byte[] NULL = "null".getBytes(StandardCharsets.US_ASCII);
    private static final byte[] TRUE = "true".getBytes(StandardCharsets.US_ASCII);
    private static final byte[] FALSE = "false".getBytes(StandardCharsets.US_ASCII);

    /** A JSON string as Jackson writes it, or {@code null}. */
    OutputText string(String s) {
        if (s == null) {
            return raw(NULL);
        }
        room(s.length() + 2);
        bytes[size++] = '"';
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c >= 0x80) {
                i = encode(s, i);
            } else if (c >= 0x20 && c != '"' && c != '\\') {
                bytes[size++] = (byte) c;
            } else {
                room(6 + s.length() - i);
                bytes[size++] = '\\';
                switch (c) {
                    case '"', '\\' -> bytes[size++] = (byte) c;
                    case '\b' -> bytes[size++] = 'b';
                    case '\t' -> bytes[size++] = 't';
                    case '\f' -> bytes[size++] = 'f';
                    case '\n' -> bytes[size++] = 'n';
                    case '\r' -> bytes[size++] = 'r';
                    default -> {
                        bytes[size++] = 'u';
                        bytes[size++] = '0';
                        bytes[size++] = '0';
                        bytes[size++] = HEX[c >> 4];
                        bytes[size++] = HEX[c & 0xF];
                    }
                }
            }
        }
        room(1);
        bytes[size++] = '"';
        return this;
    }

    /** A JSON number at full precision ({@code Double.toString}), {@code null}, or a non-finite one quoted. */
    OutputText number(Double v) {
        if (v == null) {
            return raw(NULL);
        }
        double d = v;
        if (!Double.isFinite(d)) {
            return string(Double.toString(d));
        }
        room(32);
        size = doubles.appendJava(d, bytes, size);
        return this;
    }

    OutputText number(int v) {
        return text(Integer.toString(v));
    }

    OutputText number(Integer v) {
        return v == null ? raw(NULL) : number(v.intValue());
    }

    OutputText bool(boolean v) {
        return raw(v ? TRUE : FALSE);
    }

    OutputText bool(Boolean v) {
        return v == null ? raw(NULL) : bool(v.booleanValue());
    }

    /** {@link NumberFormats#plain(Double, int)} as it is (empty for no number), for a CSV cell. */
    OutputText plain(Double v, int decimals) {
        if (v != null) {
            room(340 + decimals);
            size = doubles.appendPlain(v, decimals, bytes, size);
        }
        return this;
    }

    /** {@link NumberFormats#plain(Double, int)} as a JSON string. */
    OutputText plainString(Double v, int decimals) {
        raw('"');
        plain(v, decimals);
        return raw('"');
    }

    /** {@link CsvText#cell} of a text from the file. */
    OutputText cell(String s) {
        if (s == null || s.isEmpty()) {
            return this;
        }
        char first = s.charAt(0);
        boolean plainText = first != '=' && first != '+' && first != '-' && first != '@' && first != '\t'
                && first != '\r' && first != '\0';
        for (int i = 0; plainText && i < s.length(); i++) {
            char c = s.charAt(i);
            plainText = c != ',' && c != '"' && c != '\n' && c != '\r';
        }
        return text(plainText ? s : CsvText.cell(s));
    }
}
