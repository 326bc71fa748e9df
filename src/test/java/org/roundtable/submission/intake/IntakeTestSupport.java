package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;

/** Loading test uploads from the classpath and unwrapping outcomes. */
final class IntakeTestSupport {

    private IntakeTestSupport() {
    }

    static byte[] resource(String path) {
        try (InputStream in = IntakeTestSupport.class.getResourceAsStream("/uploads/" + path)) {
            if (in == null) {
                throw new IllegalArgumentException("no test upload " + path);
            }
            return in.readAllBytes();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static byte[] utf8(String text) {
        return text.getBytes(StandardCharsets.UTF_8);
    }

    static IntakeResult.Accepted accepted(IntakeResult result) {
        assertThat(result).as("outcome %s", result).isInstanceOf(IntakeResult.Accepted.class);
        return (IntakeResult.Accepted) result;
    }

    static IntakeResult.Rejected rejected(IntakeResult result) {
        assertThat(result).as("outcome %s", result).isInstanceOf(IntakeResult.Rejected.class);
        return (IntakeResult.Rejected) result;
    }
}
