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
