package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.platform.Admission;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.ArrayList;
import java.util.List;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * Past the submission queue's bound ({@code roundtable.submissions.queue-bound}) a submission is told to come back
 * (503 with Retry-After and the problem body) after a short wait, instead of queueing behind the others; for the
 * JSON API this happens before a worker thread is taken.
 */
@QuarkusTest
class SubmissionBackPressureTest {

    @Inject
    World world;

    @Inject
    Admission admission;

    @Test
    void aSubmissionFindingTheQueueFullIsRefusedWith503AndRetryAfterAndNothingIsStored() throws InterruptedException {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        String json = "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"18.20\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":1}]}";
        List<Admission.Slot> taken = new ArrayList<>();
        try {
            while (admission.submissionPlacesLeft() > 0) {
                taken.add(admission.submissionPlace());
            }
            assertThat(taken).as("the default bound").hasSize(64);
            Response answer = given().header("Authorization", "Bearer " + token).header("X-Request-Id", "queue-full-01")
                    .contentType("application/json").body(json).post("/api/v1/my-rounds/" + round + "/submission");
            assertThat(answer.statusCode()).isEqualTo(503);
            assertThat(answer.header("Retry-After")).isEqualTo("1");
            assertThat(answer.contentType()).contains("json");
            assertThat(answer.jsonPath().getInt("status")).isEqualTo(503);
            assertThat(answer.jsonPath().getString("requestId")).isEqualTo("queue-full-01");
            assertThat(answer.jsonPath().getString("detail")).contains("submissions");
            assertThat(world.insert("SELECT count(*) FROM submission WHERE round_id = ?", round)).isZero();
        } finally {
            taken.forEach(Admission.Slot::close);
        }
        assertThat(admission.submissionPlacesLeft()).isEqualTo(64);
        given().header("Authorization", "Bearer " + token).contentType("application/json").body(json)
                .post("/api/v1/my-rounds/" + round + "/submission").then().statusCode(201);
        assertThat(placesLeftOnceSettled()).as("the place is given back when the response ends").isEqualTo(64);
    }

    @Test
    void anAnonymousSubmissionTakesNoPlaceInTheQueueAndIsRefusedAsUnsignedEvenWhenTheQueueIsFull() {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String json = "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"18.20\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":1}]}";
        List<Admission.Slot> taken = new ArrayList<>();
        try {
            while (admission.submissionPlacesLeft() > 0) {
                taken.add(admission.submissionPlace());
            }
            given().contentType("application/json").body(json).post("/api/v1/my-rounds/" + round + "/submission")
                    .then().statusCode(401);
        } finally {
            taken.forEach(Admission.Slot::close);
        }
        assertThat(admission.submissionPlacesLeft()).isEqualTo(64);
    }

    @Test
    void aSubmissionThatFindsAPlaceFreedWithinTheShortWaitIsAccepted() throws Exception {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        String json = "{\"results\":[{\"measurand\":\"Cr\",\"value\":\"18.30\",\"unit\":\"%\",\"method\":\"spark-oes\",\"replicates\":1}]}";
        List<Admission.Slot> taken = new ArrayList<>();
        while (admission.submissionPlacesLeft() > 0) {
            taken.add(admission.submissionPlace());
        }
        Thread freeing = new Thread(() -> {
            try {
                Thread.sleep(150);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            taken.remove(0).close();
        });
        try {
            freeing.start();
            // the request's body waits (unread) until the place is free, then is read whole
            given().header("Authorization", "Bearer " + token).contentType("application/json").body(json)
                    .post("/api/v1/my-rounds/" + round + "/submission").then().statusCode(201);
        } finally {
            freeing.join();
            taken.forEach(Admission.Slot::close);
        }
        assertThat(placesLeftOnceSettled()).isEqualTo(64);
    }

    /** The places left once the last response has ended (the place is given back on the event loop just after). */
    private int placesLeftOnceSettled() throws InterruptedException {
        for (int i = 0; i < 100 && admission.submissionPlacesLeft() < 64; i++) {
            Thread.sleep(20);
        }
        return admission.submissionPlacesLeft();
    }
}
