package org.roundtable.submission.intake.corpus;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.roundtable.submission.intake.CorpusRules;
import org.roundtable.submission.intake.IntakeResult;
import org.roundtable.submission.intake.ResultIntake;
import org.roundtable.submission.intake.UploadFormat;

/**
 * Seeded random mutations of the XML parts inside a valid workbook (re-zipped, so the zip itself stays sound): the
 * sheet and shared-strings readers always end in a named outcome, never in {@code file.unreadable}.
 */
class MutatedWorkbookPartsTest {

    private final ResultIntake intake = new ResultIntake();

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"xl/worksheets/sheet1.xml", "xl/sharedStrings.xml", "xl/workbook.xml", "xl/styles.xml",
        "[Content_Types].xml"})
    void everyWorkbookWithAMutatedPartGetsANamedOutcome(String part) throws IOException {
        byte[] workbook = MalformedCorpusGenerator.acceptedWorkbook();
        byte[] original = MalformedCorpusGenerator.entry(workbook, part);
        Random random = new Random(part.hashCode());
        byte[] interesting = "<>\"'=/&;:0123456789-AZrcvtsn ".getBytes(java.nio.charset.StandardCharsets.US_ASCII);
        List<String> unnamed = new ArrayList<>();
        for (int attempt = 0; attempt < 100; attempt++) {
            byte[] mutated = original.clone();
            for (int change = 0; change < 1 + random.nextInt(3); change++) {
                mutated[random.nextInt(mutated.length)] = interesting[random.nextInt(interesting.length)];
            }
            byte[] upload = MalformedCorpusGenerator.rezip(workbook, Map.of(part, mutated), Map.of());
            IntakeResult result = intake.read(upload, UploadFormat.XLSX, CorpusRules.lowAlloySteel());
            if (result instanceof IntakeResult.Rejected rejected && rejected.problems().stream()
                    .anyMatch(problem -> problem.key().equals("file.unreadable"))) {
                unnamed.add("attempt " + attempt);
            }
        }
        assertThat(unnamed).as("mutations of %s that ended in file.unreadable", part).isEmpty();
    }
}
