package org.roundtable.report.render;

/**
 * Receives progress while a report renders, for a background job's progress display.
 *
 * <p>Calls come from the rendering thread, with a fraction that never decreases and ends at 1.0.
 * Laying out a large report is one step without intermediate calls; drawing the pages reports
 * once per chart drawn.
 */
@FunctionalInterface
public interface RenderProgress {

    /** Ignores progress. */
    RenderProgress NONE = (fraction, step) -> { };

    /**
     * Progress so far.
     *
     * @param fraction done, from 0.0 to 1.0
     * @param step what is being done, e.g. "laying out pages"
     */
    void progress(double fraction, String step);
}
