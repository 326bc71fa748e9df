package org.roundtable.report.chart;

import java.awt.RenderingHints;
import java.awt.geom.Rectangle2D;
import org.jfree.chart.JFreeChart;
import org.jfree.svg.MeetOrSlice;
import org.jfree.svg.PreserveAspectRatio;
import org.jfree.svg.SVGGraphics2D;
import org.jfree.svg.SVGHints;
import org.jfree.svg.ViewBox;

/**
 * Draws report charts to SVG with JFreeSVG.
 *
 * <p>The output is deterministic: element ids are derived from the chart key (JFreeSVG's default
 * prefix contains the clock). Text stays text ({@code <text>} in DejaVu Sans), so σ, ± and the
 * minus sign display in any browser that has a Unicode sans-serif font.
 */
public final class SvgCharts {

    private SvgCharts() {
    }

    /** The chart as an {@code <svg>} element that scales to its container (viewBox, no fixed size). */
    public static String toSvgElement(ReportChart chart) {
        SVGGraphics2D g2 = new SVGGraphics2D(chart.width(), chart.height());
        g2.setDefsKeyPrefix(chart.key() + "-");
        g2.setRenderingHint(SVGHints.KEY_DRAW_STRING_TYPE, SVGHints.VALUE_DRAW_STRING_TYPE_STANDARD);
        g2.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        JFreeChart built = chart.build();
        built.draw(g2, new Rectangle2D.Double(0, 0, chart.width(), chart.height()));
        return g2.getSVGElement("chart-" + chart.key(), false,
                new ViewBox(0, 0, chart.width(), chart.height()), PreserveAspectRatio.XMID_YMID, MeetOrSlice.MEET);
    }
}
