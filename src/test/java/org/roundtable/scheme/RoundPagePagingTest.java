package org.roundtable.scheme;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

/**
 * The round page stays small however many laboratories take part: participants and items a page at a time (the
 * test profile's page size is 5), the enrolment list from a search, never every laboratory.
 */
@QuarkusTest
class RoundPagePagingTest {

    @Inject
    World world;

    @Test
    void participantsAndItemsArePagedAndTheEnrolmentListComesFromASearch() {
        List<Long> labs = new ArrayList<>();
        for (int i = 0; i < 12; i++) {
            labs.add(world.laboratory());
        }
        long round = world.round(RoundState.DISPATCHED, labs.stream().mapToLong(Long::longValue).toArray());
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        String first = coordinator.request().get("/rounds/" + round).then().statusCode(200).extract().asString();
        assertThat(first).contains("Participants 1–5 of 12.").contains("Items 1–5 of 12.");
        assertThat(count(first, "/replacement\"")).isLessThanOrEqualTo(5);
        String third = coordinator.request().get("/rounds/" + round + "?participants=3&items=2").then().statusCode(200)
                .extract().asString();
        assertThat(third).contains("Participants 11–12 of 12.").contains("Items 6–10 of 12.");
        String past = coordinator.request().get("/rounds/" + round + "?participants=99").then().statusCode(200)
                .extract().asString();
        assertThat(past).as("a page past the end shows the last").contains("Participants 11–12 of 12.");
        String searched = coordinator.request().queryParam("find", "Org Lab").get("/rounds/" + round).then().statusCode(200)
                .extract().asString();
        assertThat(searched).as("the pager keeps the laboratory search")
                .contains("?participants=2&amp;items=1&amp;find=Org+Lab#participants");

        long enrolling = world.round(RoundState.ENROLLING);
        String name = world.text("SELECT name FROM laboratory WHERE id = ?", labs.get(0));
        String found = coordinator.request().get("/rounds/" + enrolling + "?find=" + name).then().statusCode(200)
                .extract().asString();
        assertThat(found).contains("value=\"" + labs.get(0) + "\"");
        assertThat(count(found, "<option value=\"")).isLessThanOrEqualTo(RoundPages.ENROL_CHOICES + 1);
    }

    private static int count(String text, String part) {
        int n = 0;
        for (int i = text.indexOf(part); i >= 0; i = text.indexOf(part, i + 1)) {
            n++;
        }
        return n;
    }
}
