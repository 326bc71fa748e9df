package org.roundtable.report.render;

/** How charts enter the generated XHTML. */
enum ChartEmbedding {
    /** Inline {@code <svg>} elements, for the HTML page. */
    INLINE_SVG,
    /** {@code <object>} placeholders that the PDF renderer draws as vector graphics. */
    PDF_OBJECT
}
