package org.roundtable.report.style;

import java.awt.Color;
import org.roundtable.statistics.score.Classification;

/** Roundtable's colours, the same as the web pages' style sheet, for charts and PDF. */
public final class ReportColours {

    /** Slate, the main ink of headings and reference lines. */
    public static final Color SLATE = new Color(0x2d4a57);
    /** Copper, the highlight of the reader's own laboratory. */
    public static final Color COPPER = new Color(0xb5651d);
    /** Paper background. */
    public static final Color PAPER = new Color(0xfbf8f3);
    /** Ink for text. */
    public static final Color INK = new Color(0x1f2a30);
    /** Muted text. */
    public static final Color MUTED = new Color(0x5b6770);
    /** Rules and grid lines. */
    public static final Color LINE = new Color(0xd9d2c5);
    /** Satisfactory. */
    public static final Color GOOD = new Color(0x2e7d4f);
    /** Questionable, and the ±2 lines. */
    public static final Color WARN = new Color(0xb8860b);
    /** Unsatisfactory, and the ±3 lines. */
    public static final Color BAD = new Color(0xa4302a);
    /** Results that were not scored. */
    public static final Color UNSCORED = new Color(0x9aa5ab);

    private ReportColours() {
    }

    /** The colour of a classification; {@link #UNSCORED} for {@code null}. */
    public static Color of(Classification classification) {
        if (classification == null) {
            return UNSCORED;
        }
        return switch (classification) {
            case SATISFACTORY -> GOOD;
            case QUESTIONABLE -> WARN;
            case UNSATISFACTORY -> BAD;
        };
    }

    /** A paler version of a colour (mixed with white), for other laboratories in a laboratory report. */
    public static Color pale(Color colour) {
        return mix(colour, Color.WHITE, 0.55);
    }

    /** {@code a·(1 − share) + b·share}, channel by channel. */
    public static Color mix(Color a, Color b, double share) {
        return new Color(
                (int) Math.round(a.getRed() * (1 - share) + b.getRed() * share),
                (int) Math.round(a.getGreen() * (1 - share) + b.getGreen() * share),
                (int) Math.round(a.getBlue() * (1 - share) + b.getBlue() * share));
    }

    /** {@code #rrggbb}. */
    public static String hex(Color colour) {
        return String.format("#%02x%02x%02x", colour.getRed(), colour.getGreen(), colour.getBlue());
    }
}
