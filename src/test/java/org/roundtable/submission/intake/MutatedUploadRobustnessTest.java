package org.roundtable.submission.intake;

import static org.assertj.core.api.Assertions.assertThat;
import static org.roundtable.submission.intake.IntakeTestSupport.resource;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Seeded random byte mutations of accepted uploads: the intake always gives an outcome, never throws, and never falls
 * back to {@code file.unreadable} (which would mean a parser failed in a way no rule names). A cheap stand-in for
 * coverage-guided fuzzing, which is not part of this build.
 */
class MutatedUploadRobustnessTest {

    private final ResultIntake intake = new ResultIntake();

    @ParameterizedTest(name = "{0} with seed {2}")
    @CsvSource({
        "accepted/comma.csv, CSV, 1",
        "accepted/semicolon-decimal-comma.csv, CSV, 2",
        "accepted/quoted-fields.csv, CSV, 3",
        "accepted/results.json, JSON, 4",
        "accepted/results.xlsx, XLSX, 5"})
    void everyMutatedUploadGetsANamedOutcome(String file, UploadFormat format, long seed) {
        byte[] original = resource(file);
        Random random = new Random(seed);
        List<String> unnamed = new ArrayList<>();
        for (int attempt = 0; attempt < 400; attempt++) {
            byte[] mutated = mutate(original, random);
            IntakeResult result = intake.read(mutated, format, LowAlloySteelRound.singleItem());
            assertThat(result).isNotNull();
            if (result instanceof IntakeResult.Rejected rejected && rejected.problems().stream()
                    .anyMatch(problem -> problem.key().equals(IntakeKey.FILE_UNREADABLE.key()))) {
                unnamed.add("attempt " + attempt);
            }
        }
        assertThat(unnamed).as("mutations that ended in file.unreadable").isEmpty();
    }

    /** One to four changes: flip a byte, insert a byte that matters to the format, delete a byte, or truncate. */
    private static byte[] mutate(byte[] original, Random random) {
        byte[] bytes = original.clone();
        byte[] interesting = {0, '"', ',', ';', '\n', '\r', '<', '=', '-', '|', '.', (byte) 0xC3, (byte) 0xFF, '{',
            '}', '[', ']', 'P', 'K'};
        int changes = 1 + random.nextInt(4);
        for (int change = 0; change < changes && bytes.length > 1; change++) {
            int position = random.nextInt(bytes.length);
            switch (random.nextInt(4)) {
                case 0 -> bytes[position] = (byte) random.nextInt(256);
                case 1 -> bytes[position] = interesting[random.nextInt(interesting.length)];
                case 2 -> {
                    byte[] shorter = new byte[bytes.length - 1];
                    System.arraycopy(bytes, 0, shorter, 0, position);
                    System.arraycopy(bytes, position + 1, shorter, position, bytes.length - position - 1);
                    bytes = shorter;
                }
                default -> bytes = java.util.Arrays.copyOf(bytes, Math.max(1, position));
            }
        }
        return bytes;
    }
}
