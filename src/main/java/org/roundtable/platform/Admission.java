package org.roundtable.platform;

import io.agroal.api.AgroalDataSource;
import io.quarkus.scheduler.Scheduled;
import jakarta.enterprise.context.ApplicationScoped;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.jboss.logging.Logger;

import java.io.IOException;
import java.io.InputStream;
import java.net.ConnectException;
import java.sql.Connection;
import java.sql.SQLException;
import java.sql.SQLNonTransientConnectionException;
import java.sql.SQLRecoverableException;
import java.sql.SQLTransientConnectionException;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.Collections;
import java.util.Deque;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicReference;

/**
 * The one place that decides whether work is admitted now, and answers 503 with {@code Retry-After} when it is not:
 * <ul>
 *   <li><b>database outage</b>: a failure to reach PostgreSQL marks the database unavailable (logged once); while it
 *       is, requests are refused at once instead of each waiting for the pool; a probe every two seconds marks it
 *       available again (logged once, with the outage's length). Readiness ({@code /q/health/ready}) stays DOWN
 *       meanwhile through the datasource's own check.</li>
 *   <li><b>upload slots</b>: at most {@code roundtable.admission.upload-slots} uploads (default 2) are read and
 *       parsed at once; another waits up to {@code roundtable.admission.upload-wait} (default 2 s), then is refused.
 *       A waiting upload's body is not read yet, so waiting costs no memory.</li>
 *   <li><b>submission queue</b>: at most {@code roundtable.submissions.queue-bound} submissions (default 64) are
 *       admitted at once, being read or waiting for the database; another waits up to
 *       {@code roundtable.submissions.queue-wait} (default 500 ms) for a place, then is refused with
 *       {@code Retry-After: 1}, instead of queueing for seconds behind the others. For the JSON API it is taken on
 *       the event loop, before the request waits for a worker thread (web.EdgeLimits), so nothing queues unbounded
 *       ahead of it; the results pages take it in the endpoint. Taken before the upload slot.</li>
 *   <li><b>queue bounds</b>: {@link #gate} gives any bounded section the same behaviour.</li>
 * </ul>
 */
@ApplicationScoped
public class Admission {

    private static final Logger LOG = Logger.getLogger(Admission.class);

    /** Refused for now: 503 with a {@code Retry-After} of {@link #retryAfterSeconds()}. */
    public static class Unavailable extends DomainException {
        private final int retryAfterSeconds;

        public Unavailable(String detail, int retryAfterSeconds) {
            super(503, "Unavailable for a moment", detail);
            this.retryAfterSeconds = retryAfterSeconds;
        }

        public int retryAfterSeconds() {
            return retryAfterSeconds;
        }
    }

    /** A bounded section: at most {@code permits} inside at once; a caller waits up to {@code wait}, then is refused. */
    public static final class Gate {
        private final String what;
        private final Semaphore permits;
        private final Duration wait;

        Gate(String what, int permits, Duration wait) {
            this.what = what;
            this.permits = new Semaphore(Math.max(1, permits), true);
            this.wait = wait;
        }

        /** Enters the section (close the slot to leave) or throws {@link Unavailable}. */
        public Slot enter() {
            try {
                if (permits.tryAcquire(wait.toMillis(), TimeUnit.MILLISECONDS)) {
                    return permits::release;
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            throw refusal();
        }

        /** Enters the section if a place is free now, without waiting; else null. */
        public Slot tryEnter() {
            return permits.tryAcquire() ? permits::release : null;
        }

        /** The answer to a caller that found no place within the wait. */
        public Unavailable refusal() {
            return new Unavailable("Too many " + what + " are being handled at once. Try again in a few seconds.",
                    (int) Math.max(1, wait.toSeconds()));
        }

        public Duration waitFor() {
            return wait;
        }

        public int available() {
            return permits.availablePermits();
        }
    }

    /** A place in a {@link Gate}; closing it lets the next one in. */
    public interface Slot extends AutoCloseable {
        @Override
        void close();
    }

    private record Outage(Instant since, String reason) {
    }

    private final AgroalDataSource dataSource;
    private final Clock clock;
    private final Gate uploads;
    private final Gate submissions;
    private final ConcurrentHashMap<String, Gate> gates = new ConcurrentHashMap<>();
    private final AtomicReference<Outage> outage = new AtomicReference<>();

    public Admission(AgroalDataSource dataSource, Clock clock,
                     @ConfigProperty(name = "roundtable.admission.upload-slots", defaultValue = "2") int uploadSlots,
                     @ConfigProperty(name = "roundtable.admission.upload-wait", defaultValue = "2s") Duration uploadWait,
                     @ConfigProperty(name = "roundtable.submissions.queue-bound", defaultValue = "64") int submissionQueueBound,
                     @ConfigProperty(name = "roundtable.submissions.queue-wait", defaultValue = "500ms") Duration submissionQueueWait) {
        this.dataSource = dataSource;
        this.clock = clock;
        this.uploads = new Gate("uploads", uploadSlots, uploadWait);
        this.submissions = new Gate("submissions", submissionQueueBound, submissionQueueWait);
    }

    /**
     * A place in the submission queue: every submission of results (API, form, file) holds one from before its body
     * is read until its receipt; past the bound a submission is refused after a short wait (503, Retry-After).
     */
    public Slot submissionPlace() {
        return submissions.enter();
    }

    /** The submission queue itself, for admission before a worker thread is taken (see web.EdgeLimits). */
    public Gate submissionQueue() {
        return submissions;
    }

    /** Places left in the submission queue. */
    public int submissionPlacesLeft() {
        return submissions.available();
    }

    /** The upload slots: every upload is read and parsed inside one. */
    public Slot uploadSlot() {
        return uploads.enter();
    }

    /**
     * Reads an upload's body inside an upload slot, at most {@code maxBytes + 1} bytes (so that the intake can
     * still say "too large"), and hands it to {@code work} while the slot is held.
     */
    public <T> T withUpload(InputStream body, long maxBytes, java.util.function.Function<byte[], T> work) {
        try (Slot ignored = uploadSlot()) {
            byte[] content = body == null ? new byte[0] : body.readNBytes((int) Math.min(Integer.MAX_VALUE - 8, maxBytes + 1));
            return work.apply(content);
        } catch (IOException e) {
            throw new DomainException.BadRequest("The upload could not be read to its end. Please send it again.");
        }
    }

    /** A named bounded section, created on first use with these bounds. */
    public Gate gate(String what, int permits, Duration wait) {
        return gates.computeIfAbsent(what, w -> new Gate(w, permits, wait));
    }

    /** Refuses at once while the database is known to be unavailable. */
    public void requireDatabase() {
        if (outage.get() != null) {
            throw databaseUnavailable();
        }
    }

    public boolean databaseAvailable() {
        return outage.get() == null;
    }

    /** The answer to a request that found the database unavailable. */
    public Unavailable databaseUnavailable() {
        return new Unavailable("The database is not reachable at the moment. Nothing was changed; try again shortly.", 5);
    }

    /**
     * Whether {@code failure} says the database cannot be reached (as opposed to a refused statement): a connection
     * failure (SQLState class 08, or a closed connection without a state), the server shutting down or not yet
     * accepting (57P01–57P03), or the pool giving up. When it is, the outage is recorded (and logged if it is new).
     * See {@link #outageCause(Throwable)} for where the cause is looked for.
     */
    public boolean isDatabaseOutage(Throwable failure) {
        Throwable cause = outageCause(failure);
        return cause != null && recordOutage(cause);
    }

    /** SQLStates that say the server is going away or not there yet: admin/crash shutdown, cannot connect now. */
    private static final Set<String> SHUTDOWN_STATES = Set.of("57P01", "57P02", "57P03");

    /** Messages of a closed connection where the driver or the pool gives no SQLState. */
    private static final List<String> CLOSED_CONNECTION = List.of("This connection has been closed",
            "Connection is closed", "An I/O error occurred while sending to the backend", "Acquisition timeout");

    /**
     * The exception among {@code failure}, its causes, its suppressed exceptions (a failed commit carries the
     * driver's exception there: {@code RollbackException} → suppressed {@code XAException} → {@code PSQLException})
     * and the next exceptions of an {@link SQLException}, to any depth and whatever wraps them (CDI's
     * {@code ArcUndeclaredThrowableException}, Hibernate, the transaction manager), that says the database cannot be
     * reached; null when none does.
     */
    static Throwable outageCause(Throwable failure) {
        Deque<Throwable> pending = new ArrayDeque<>();
        Set<Throwable> seen = Collections.newSetFromMap(new IdentityHashMap<>());
        if (failure != null) {
            pending.add(failure);
        }
        while (!pending.isEmpty() && seen.size() < 100) {
            Throwable t = pending.poll();
            if (!seen.add(t)) {
                continue;
            }
            if (saysDatabaseUnreachable(t)) {
                return t;
            }
            if (t.getCause() != null) {
                pending.add(t.getCause());
            }
            pending.addAll(Arrays.asList(t.getSuppressed()));
            if (t instanceof SQLException sql && sql.getNextException() != null) {
                pending.add(sql.getNextException());
            }
        }
        return null;
    }

    private static boolean saysDatabaseUnreachable(Throwable t) {
        if (t instanceof ConnectException || t instanceof SQLTransientConnectionException
                || t instanceof SQLNonTransientConnectionException || t instanceof SQLRecoverableException) {
            return true;
        }
        if (t instanceof SQLException sql) {
            String state = sql.getSQLState();
            if (state != null && (state.startsWith("08") || SHUTDOWN_STATES.contains(state))) {
                return true;
            }
            String message = sql.getMessage();
            if (message != null && (state == null || message.startsWith("Acquisition timeout"))
                    && CLOSED_CONNECTION.stream().anyMatch(message::startsWith)) {
                return true;
            }
        }
        return t.getClass().getName().equals("org.hibernate.exception.JDBCConnectionException");
    }

    private boolean recordOutage(Throwable t) {
        Outage next = new Outage(clock.instant(), t.getClass().getSimpleName() + ": " + t.getMessage());
        if (outage.compareAndSet(null, next)) {
            LOG.errorf("database unavailable (%s); requests are answered 503 until it answers again", next.reason());
        }
        return true;
    }

    /** While an outage lasts, asks the database every two seconds whether it answers again. */
    @Scheduled(every = "2s", delayed = "2s", concurrentExecution = Scheduled.ConcurrentExecution.SKIP)
    void probe() {
        Outage current = outage.get();
        if (current == null) {
            return;
        }
        try (Connection c = dataSource.getConnection()) {
            if (c.isValid(2) && outage.compareAndSet(current, null)) {
                LOG.infof("database available again after %d s", Duration.between(current.since(), clock.instant()).toSeconds());
            }
        } catch (SQLException | RuntimeException e) {
            // still unavailable: already logged when the outage began
        }
    }
}
