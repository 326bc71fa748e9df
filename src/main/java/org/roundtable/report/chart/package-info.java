/**
 * Report charts drawn with JFreeChart in Roundtable's own style: described by {@link
 * org.roundtable.report.chart.ReportChart}, built by {@link org.roundtable.report.chart.ReportCharts},
 * drawn to SVG by {@link org.roundtable.report.chart.SvgCharts} and to PDF vector graphics by the PDF
 * renderer. {@link org.roundtable.report.chart.MeasurandChartData} holds what the charts of a measurand
 * share across the reports of a round; {@link org.roundtable.report.chart.ChartDataCache} keeps it per
 * renderer.
 */
package org.roundtable.report.chart;
