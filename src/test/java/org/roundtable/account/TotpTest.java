package org.roundtable.account;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;
import java.time.Instant;

import static org.assertj.core.api.Assertions.assertThat;

class TotpTest {

    private static final byte[] RFC_SHA1_KEY = "12345678901234567890".getBytes(StandardCharsets.US_ASCII);

    // RFC 6238 Appendix B, SHA1 column: time (s), expected 8-digit TOTP — published test vectors
    @ParameterizedTest
    @CsvSource({
            "59, 94287082",
            "1111111109, 07081804",
            "1111111111, 14050471",
            "1234567890, 89005924",
            "2000000000, 69279037",
            "20000000000, 65353130"})
    void reproducesTheRfc6238TestVectors(long seconds, String expected) {
        assertThat(Totp.code(RFC_SHA1_KEY, Totp.step(Instant.ofEpochSecond(seconds)), 8)).isEqualTo(expected);
    }

    @Test
    void acceptsOneStepOfClockDriftAndNeverTheSameStepTwice() {
        Instant now = Instant.ofEpochSecond(1_234_567_890L);
        long step = Totp.step(now);
        String previous = Totp.code(RFC_SHA1_KEY, step - 1, 6);
        String current = Totp.code(RFC_SHA1_KEY, step, 6);
        String tooOld = Totp.code(RFC_SHA1_KEY, step - 2, 6);
        assertThat(Totp.matchingStep(RFC_SHA1_KEY, previous, now, 0)).isEqualTo(step - 1);
        assertThat(Totp.matchingStep(RFC_SHA1_KEY, current, now, 0)).isEqualTo(step);
        assertThat(Totp.matchingStep(RFC_SHA1_KEY, tooOld, now, 0)).isEqualTo(-1);
        assertThat(Totp.matchingStep(RFC_SHA1_KEY, current, now, step)).as("replay").isEqualTo(-1);
        assertThat(Totp.matchingStep(RFC_SHA1_KEY, "12ab56", now, 0)).isEqualTo(-1);
    }

    // RFC 4648 section 10 test vectors (padding removed)
    @ParameterizedTest
    @CsvSource({"f, MY", "fo, MZXQ", "foo, MZXW6", "foob, MZXW6YQ", "fooba, MZXW6YTB", "foobar, MZXW6YTBOI"})
    void encodesBase32AsRfc4648(String input, String expected) {
        assertThat(Totp.base32(input.getBytes(StandardCharsets.US_ASCII))).isEqualTo(expected);
    }
}
