package org.roundtable.scheme;

import jakarta.enterprise.context.ApplicationScoped;
import jakarta.persistence.EntityManager;
import jakarta.persistence.LockModeType;
import jakarta.transaction.Transactional;
import org.roundtable.platform.DomainException;

/**
 * The entrance every round action passes: the round is read with a row lock ({@code SELECT ... FOR
 * UPDATE}), then {@link RoundStateMachine#require} checks the action against its state. Holding the lock
 * until the transaction ends means two coordinators acting at once are served one after the other, and the
 * second sees the state the first left.
 */
@ApplicationScoped
public class RoundGate {

    private final EntityManager entityManager;

    public RoundGate(EntityManager entityManager) {
        this.entityManager = entityManager;
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public Round enter(long roundId, RoundAction action) {
        Round round = entityManager.find(Round.class, roundId, LockModeType.PESSIMISTIC_WRITE);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        RoundStateMachine.require(round.state, action);
        return round;
    }

    /**
     * Like {@link #enter}, with a shared lock ({@code SELECT ... FOR SHARE}): for work many laboratories do at
     * once (receipts). They do not wait for each other, but a state change waits for them and they for it.
     */
    @Transactional(Transactional.TxType.MANDATORY)
    public Round enterShared(long roundId, RoundAction action) {
        Round round = entityManager.find(Round.class, roundId, LockModeType.PESSIMISTIC_READ);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        RoundStateMachine.require(round.state, action);
        return round;
    }

    @Transactional(Transactional.TxType.MANDATORY)
    public Round find(long roundId) {
        Round round = entityManager.find(Round.class, roundId);
        if (round == null) {
            throw new DomainException.NotFound("The round");
        }
        return round;
    }
}
