package org.roundtable.report.style;

import java.awt.Font;
import java.awt.FontFormatException;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;

/**
 * The bundled DejaVu Sans fonts (see {@code report/fonts/README.md}).
 *
 * <p>The family name {@value #FAMILY} is used in the report's CSS and as the AWT font family of
 * chart text; the PDF renderer maps chart text to the same embedded font.
 */
public final class ReportFonts {

    /** Font family name used in CSS and charts. */
    public static final String FAMILY = "DejaVu Sans";
    /** Class-path location of the regular face. */
    public static final String REGULAR_RESOURCE = "/report/fonts/DejaVuSans.ttf";
    /** Class-path location of the bold face. */
    public static final String BOLD_RESOURCE = "/report/fonts/DejaVuSans-Bold.ttf";

    private static final Font REGULAR = load(REGULAR_RESOURCE);
    private static final Font BOLD = load(BOLD_RESOURCE);

    private ReportFonts() {
    }

    /** The regular face at {@code size} (chart units, 1/96 inch). */
    public static Font regular(float size) {
        return REGULAR.deriveFont(Font.PLAIN, size);
    }

    /** The bold face at {@code size} (chart units, 1/96 inch). */
    public static Font bold(float size) {
        return BOLD.deriveFont(Font.BOLD, size);
    }

    /**
     * The bundled font file without its glyph-substitution table (GSUB), for the PDF renderer.
     *
     * <p>PDFBox 3 runs every string through the font's GSUB rules before showing it; for our Latin
     * and Greek text that only costs time (a quarter of the rendering time of a large report) and can
     * turn "fi" into a ligature that text extraction then misreads. The PDF embeds a subset of the
     * glyphs either way, and subsets never carry GSUB, so the embedded font is the same.
     */
    public static byte[] withoutGlyphSubstitution(String resource) {
        try (InputStream in = open(resource)) {
            return dropTable(in.readAllBytes(), "GSUB");
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A TrueType file with one table removed: rewrites the table directory and packs the other tables. */
    static byte[] dropTable(byte[] font, String tag) {
        java.nio.ByteBuffer in = java.nio.ByteBuffer.wrap(font);
        int numTables = Short.toUnsignedInt(in.getShort(4));
        java.util.List<int[]> kept = new java.util.ArrayList<>();
        for (int i = 0; i < numTables; i++) {
            int record = 12 + 16 * i;
            String name = new String(font, record, 4, java.nio.charset.StandardCharsets.ISO_8859_1);
            if (!name.equals(tag)) {
                kept.add(new int[] {record, in.getInt(record + 8), in.getInt(record + 12)});
            }
        }
        if (kept.size() == numTables) {
            return font;
        }
        int n = kept.size();
        int headerLength = 12 + 16 * n;
        int total = headerLength;
        for (int[] table : kept) {
            total += (table[2] + 3) & ~3;
        }
        java.nio.ByteBuffer out = java.nio.ByteBuffer.allocate(total);
        int entrySelector = 31 - Integer.numberOfLeadingZeros(n);
        int searchRange = (1 << entrySelector) * 16;
        out.putInt(in.getInt(0)).putShort((short) n).putShort((short) searchRange).putShort((short) entrySelector)
                .putShort((short) (n * 16 - searchRange));
        int offset = headerLength;
        for (int[] table : kept) {
            out.put(font, table[0], 8).putInt(offset).putInt(table[2]);
            offset += (table[2] + 3) & ~3;
        }
        for (int[] table : kept) {
            out.put(font, table[1], table[2]);
            out.position((out.position() + 3) & ~3);
        }
        return out.array();
    }

    /** Opens a bundled font file; the caller closes the stream. */
    public static InputStream open(String resource) {
        InputStream in = ReportFonts.class.getResourceAsStream(resource);
        if (in == null) {
            throw new IllegalStateException("bundled font missing: " + resource);
        }
        return in;
    }

    private static Font load(String resource) {
        try (InputStream in = open(resource)) {
            return Font.createFont(Font.TRUETYPE_FONT, in);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (FontFormatException e) {
            throw new IllegalStateException("bundled font unreadable: " + resource, e);
        }
    }
}
