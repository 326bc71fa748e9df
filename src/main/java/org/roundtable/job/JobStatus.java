package org.roundtable.job;

/** Life of a job: queued, claimed by one instance, then finished one way or the other. */
public enum JobStatus {
    QUEUED, RUNNING, SUCCEEDED, FAILED
}
