package org.roundtable.job;

/** Progress reporting for a running job; each call is committed in its own transaction. */
@FunctionalInterface
public interface JobProgress {
    void report(int done, int total);
}
