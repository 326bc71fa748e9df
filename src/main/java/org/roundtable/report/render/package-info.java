/**
 * Rendering of the report model: {@link org.roundtable.report.render.HtmlReportRenderer} (a
 * self-contained HTML page with inline SVG) and {@link org.roundtable.report.render.PdfReportRenderer}
 * (A4 PDF with vector charts, embedded DejaVu Sans, page x of y, reproducible bytes), both from the
 * same XHTML document. No framework: plain Java, usable from a background job.
 */
package org.roundtable.report.render;
