package org.roundtable.scheme;

import io.quarkus.test.TestTransaction;
import io.quarkus.test.junit.QuarkusTest;
import jakarta.enterprise.context.control.ActivateRequestContext;
import jakarta.inject.Inject;
import jakarta.persistence.EntityManager;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;

/** The demo scheme and rounds load through the services (in a transaction that is rolled back afterwards). */
@QuarkusTest
class DemoSchemesTest {

    @Inject
    DemoSchemes demo;

    @Inject
    World world;

    @Inject
    EntityManager entityManager;

    @Test
    @TestTransaction
    @ActivateRequestContext
    void theDemoSchemeLoadsWithTwoOpenRoundsAndADraftAndClosesTheEarlierOneBackdated() {
        for (int i = 0; i < 5; i++) {
            world.laboratory();
        }
        demo.load();
        @SuppressWarnings("unchecked")
        List<Object[]> rounds = entityManager.createNativeQuery(
                "SELECT code, state, (SELECT count(*) FROM round_participant p WHERE p.round_id = r.id) FROM round r "
                        + "WHERE code LIKE 'NLS-%' ORDER BY code").getResultList();
        assertThat(rounds).hasSize(3);
        assertThat(rounds.get(0)[0]).isEqualTo("NLS-2026-1");
        assertThat(rounds.get(0)[1]).isEqualTo("OPEN_FOR_RESULTS");
        assertThat(((Number) rounds.get(0)[2]).intValue()).isEqualTo(5);
        assertThat(rounds.get(1)[1]).isEqualTo("OPEN_FOR_RESULTS");
        assertThat(rounds.get(2)[1]).isEqualTo("DRAFT");

        // once its laboratories have reported, the earlier round is closed and placed about four months back
        long past = demo.closePastRound();
        Object[] closed = (Object[]) entityManager.createNativeQuery(
                "SELECT state, current_date - dispatch_date FROM round WHERE id = :r").setParameter("r", past).getSingleResult();
        assertThat(closed[0]).isEqualTo("CLOSED");
        assertThat(((Number) closed[1]).intValue()).isEqualTo(130);
    }
}
