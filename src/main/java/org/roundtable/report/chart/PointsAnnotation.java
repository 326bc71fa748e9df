package org.roundtable.report.chart;

import java.awt.Graphics2D;
import java.awt.Paint;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import org.jfree.chart.annotations.AbstractXYAnnotation;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.Plot;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.PlotRenderingInfo;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.RectangleEdge;

/**
 * Many points of one colour drawn as one filled path: the same dots as one shape per point, but a
 * single fill in the PDF instead of one per point. Points outside the data area are skipped (the
 * plot clips them anyway). Dots smaller than {@value #ROUND_FROM} px are small squares (four path
 * segments instead of four curves: a third of the numbers in the PDF, indistinguishable at that size).
 */
final class PointsAnnotation extends AbstractXYAnnotation {

    private static final long serialVersionUID = 1L;

    /** Dots at least this wide are round. */
    static final double ROUND_FROM = 4;

    private final double[] xs;
    private final double[] ys;
    private final double diameter;
    private final transient Paint paint;

    PointsAnnotation(double[] xs, double[] ys, double diameter, Paint paint) {
        this.xs = xs.clone();
        this.ys = ys.clone();
        this.diameter = diameter;
        this.paint = paint;
    }

    @Override
    public void draw(Graphics2D g2, XYPlot plot, Rectangle2D dataArea, ValueAxis domainAxis, ValueAxis rangeAxis,
            int rendererIndex, PlotRenderingInfo info) {
        PlotOrientation orientation = plot.getOrientation();
        RectangleEdge domainEdge = Plot.resolveDomainAxisLocation(plot.getDomainAxisLocation(), orientation);
        RectangleEdge rangeEdge = Plot.resolveRangeAxisLocation(plot.getRangeAxisLocation(), orientation);
        Path2D.Double path = new Path2D.Double(Path2D.WIND_NON_ZERO, xs.length * 5);
        Ellipse2D.Double dot = new Ellipse2D.Double();
        double r = diameter / 2;
        for (int i = 0; i < xs.length; i++) {
            double px = domainAxis.valueToJava2D(xs[i], dataArea, domainEdge);
            double py = rangeAxis.valueToJava2D(ys[i], dataArea, rangeEdge);
            if (orientation == PlotOrientation.HORIZONTAL) {
                double t = px;
                px = py;
                py = t;
            }
            if (px < dataArea.getMinX() - r || px > dataArea.getMaxX() + r
                    || py < dataArea.getMinY() - r || py > dataArea.getMaxY() + r) {
                continue;
            }
            if (diameter < ROUND_FROM) {
                path.moveTo(px - r, py - r);
                path.lineTo(px + r, py - r);
                path.lineTo(px + r, py + r);
                path.lineTo(px - r, py + r);
                path.closePath();
            } else {
                dot.setFrame(px - r, py - r, diameter, diameter);
                path.append(dot, false);
            }
        }
        g2.setPaint(paint);
        g2.fill(path);
    }
}
