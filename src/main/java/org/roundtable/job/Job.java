package org.roundtable.job;

import jakarta.persistence.Column;
import jakarta.persistence.Entity;
import jakarta.persistence.GeneratedValue;
import jakarta.persistence.GenerationType;
import jakarta.persistence.Id;
import jakarta.persistence.Table;
import jakarta.persistence.Version;

import java.time.OffsetDateTime;

/** One piece of background work, kept in the database so that any instance can run it. */
@Entity
@Table(name = "job")
public class Job {

    @Id
    @GeneratedValue(strategy = GenerationType.IDENTITY)
    public Long id;

    @Column(nullable = false)
    public String kind;

    @Column(nullable = false)
    public String payload = "{}";

    @Column(nullable = false)
    public String status = JobStatus.QUEUED.name();

    @Column(name = "progress_done", nullable = false)
    public int progressDone;

    @Column(name = "progress_total", nullable = false)
    public int progressTotal;

    @Column(nullable = false)
    public int attempts;

    @Column(name = "max_attempts", nullable = false)
    public int maxAttempts = 3;

    @Column(name = "claimed_by")
    public String claimedBy;

    @Column(name = "claimed_at")
    public OffsetDateTime claimedAt;

    @Column(name = "heartbeat_at")
    public OffsetDateTime heartbeatAt;

    @Column(name = "not_before", nullable = false)
    public OffsetDateTime notBefore;

    public String result;

    public String error;

    /** Makes a job unique: a second enqueue with the same key adds nothing ({@link JobService#enqueueOnce}). */
    @Column(name = "dedup_key")
    public String dedupKey;

    @Column(name = "created_by")
    public String createdBy;

    @Column(name = "created_at", nullable = false)
    public OffsetDateTime createdAt;

    @Column(name = "finished_at")
    public OffsetDateTime finishedAt;

    @Version
    public int version;

    public JobStatus jobStatus() {
        return JobStatus.valueOf(status);
    }
}
