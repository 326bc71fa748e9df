package org.roundtable.report.chart;

import java.util.Objects;
import java.util.function.Supplier;
import org.jfree.chart.JFreeChart;

/**
 * One chart of a report, built on demand.
 *
 * <p>The chart is described here and built only when it is drawn, so that a large report does not
 * keep hundreds of charts in memory: the HTML renderer draws it to SVG, the PDF renderer draws the
 * same chart as vector graphics straight into the page.
 *
 * @param key unique key within one report, safe as an XML id (letters, digits, {@code -})
 * @param caption text printed under the chart
 * @param width width in CSS pixels (1/96 inch)
 * @param height height in CSS pixels (1/96 inch)
 * @param markCount number of bars or points drawn for participants (for tests and accessibility text)
 * @param factory builds the chart
 */
public record ReportChart(String key, String caption, int width, int height, int markCount,
        Supplier<JFreeChart> factory) {

    public ReportChart {
        Objects.requireNonNull(key, "key");
        Objects.requireNonNull(caption, "caption");
        Objects.requireNonNull(factory, "factory");
        if (!key.matches("[A-Za-z][A-Za-z0-9-]*")) {
            throw new IllegalArgumentException("chart key must be an XML name: " + key);
        }
    }

    /** Builds the chart. */
    public JFreeChart build() {
        return factory.get();
    }
}
