package org.roundtable.submission;

import io.quarkus.scheduler.Scheduled;
import jakarta.enterprise.context.ApplicationScoped;
import jakarta.enterprise.context.control.ActivateRequestContext;
import org.jboss.logging.Logger;
import org.roundtable.platform.DomainException;
import org.roundtable.scheme.RoundAccess;
import org.roundtable.scheme.RoundService;

import java.time.Clock;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;

/**
 * Closes rounds that refuse late results once their deadline has passed. Safe with several instances: each close
 * goes through the round's row lock and state check, so the second instance finds the round closed and moves on.
 * Rounds that accept late results stay open until the coordinator closes them.
 */
@ApplicationScoped
public class DeadlineClosing {

    private static final Logger LOG = Logger.getLogger(DeadlineClosing.class);

    private final RoundAccess rounds;
    private final RoundService roundService;
    private final Clock clock;
    private final org.roundtable.platform.Admission admission;

    public DeadlineClosing(RoundAccess rounds, RoundService roundService, Clock clock,
                           org.roundtable.platform.Admission admission) {
        this.admission = admission;
        this.rounds = rounds;
        this.roundService = roundService;
        this.clock = clock;
    }

    @Scheduled(every = "${roundtable.jobs.poll-interval}", concurrentExecution = Scheduled.ConcurrentExecution.SKIP)
    @ActivateRequestContext
    void closeDueRounds() {
        if (!admission.databaseAvailable()) {
            return; // logged once by Admission; due rounds are closed when the database answers again
        }
        try {
            closeDue();
        } catch (RuntimeException e) {
            if (!admission.isDatabaseOutage(e)) {
                throw e;
            }
        }
    }

    /** Closes every due round; returns how many this call closed. */
    @ActivateRequestContext
    public int closeDue() {
        int closed = 0;
        for (long roundId : rounds.dueForClosing(OffsetDateTime.now(clock).withOffsetSameInstant(ZoneOffset.UTC))) {
            try {
                roundService.transition(roundId, "CLOSE");
                closed++;
                LOG.infof("round %d closed at its deadline", roundId);
            } catch (DomainException e) {
                // another instance closed it first, or the coordinator acted: nothing to do
            }
        }
        return closed;
    }
}
