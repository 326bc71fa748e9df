package org.roundtable.scheme;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.EnumSource;

import java.time.Instant;

import static org.assertj.core.api.Assertions.assertThat;

/** The late-result policy as the round states it (design rule of the round workflow; no published source). */
class ResultTimingTest {

    static final Instant DEADLINE = Instant.parse("2027-03-29T15:00:00Z");

    @ParameterizedTest(name = "{0} at {1}: {2}")
    @CsvSource({
            "REFUSE, 2027-03-29T14:59:59Z, ON_TIME",
            "REFUSE, 2027-03-29T15:00:00Z, ON_TIME",
            "REFUSE, 2027-03-29T15:00:01Z, REFUSED",
            "ACCEPT_FLAGGED_SCORED, 2027-03-29T15:00:01Z, LATE_SCORED",
            "ACCEPT_FLAGGED_UNSCORED, 2027-04-02T09:00:00Z, LATE_UNSCORED"})
    void aResultWhileOpenIsOnTimeUntilTheDeadlineThenTreatedAsThePolicySays(Round.LatePolicy policy, String at,
                                                                            ResultTiming expected) {
        assertThat(ResultTiming.of(RoundState.OPEN_FOR_RESULTS, DEADLINE, policy, Instant.parse(at))).isEqualTo(expected);
    }

    @ParameterizedTest
    @EnumSource(value = RoundState.class, names = "OPEN_FOR_RESULTS", mode = EnumSource.Mode.EXCLUDE)
    void noResultIsTakenUnlessTheRoundIsOpenForResultsWhateverThePolicy(RoundState state) {
        for (Round.LatePolicy policy : Round.LatePolicy.values()) {
            assertThat(ResultTiming.of(state, DEADLINE, policy, DEADLINE.minusSeconds(3600))).isEqualTo(ResultTiming.REFUSED);
        }
    }
}
