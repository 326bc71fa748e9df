package org.roundtable.scheme;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.assertj.core.api.Assertions.assertThat;

/** Two coordinators taking the same step at the same moment: the row lock serves them one after the other. */
@QuarkusTest
class RoundRaceTest {

    @Inject
    World world;

    @Test
    void twoCoordinatorsDispatchingAtOnceDispatchOnceAndTheSecondIsToldTheRoundMovedOn() throws Exception {
        World.Browser first = world.signIn(world.user("coordinator", null));
        World.Browser second = world.signIn(world.user("coordinator", null));
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            for (int attempt = 0; attempt < 5; attempt++) {
                long lab = world.laboratory();
                long round = world.round(RoundState.ITEMS_QUALIFIED, lab, world.laboratory());
                CountDownLatch start = new CountDownLatch(1);
                List<Future<Integer>> answers = new ArrayList<>();
                for (World.Browser coordinator : List.of(first, second)) {
                    answers.add(pool.submit(() -> {
                        start.await();
                        return coordinator.json().body(Map.of("action", "DISPATCH_ITEMS"))
                                .post("/api/v1/rounds/" + round + "/transitions").statusCode();
                    }));
                }
                start.countDown();
                List<Integer> statuses = new ArrayList<>();
                for (Future<Integer> answer : answers) {
                    statuses.add(answer.get());
                }
                assertThat(statuses).containsExactlyInAnyOrder(200, 409);
                assertThat(world.insert("SELECT count(*) FROM item_dispatch WHERE round_id = ?", round)).isEqualTo(2);
                assertThat(world.insert("SELECT count(*) FROM audit_event WHERE action = 'round.dispatch-items' AND object_id = ?",
                        Long.toString(round))).isEqualTo(1);
            }
        } finally {
            pool.shutdownNow();
        }
    }
}
