package org.roundtable.platform;

import org.junit.jupiter.api.Test;
import org.roundtable.testing.PageChecks;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;


import static org.assertj.core.api.Assertions.assertThat;

/** One place for the trade's words: every domain constant is worded, and the glossary lists every label. */
class LabelsTest {

    /** Enums that never reach a reader as such: upload problems carry their own messages; rendering switches. */
    private static final Set<String> NOT_SHOWN = Set.of("IntakeKey", "ChartEmbedding");

    @Test
    void everyConstantOfADomainEnumHasALabel() {
        List<String> missing = new ArrayList<>();
        for (Class<?> c : PageChecks.domainEnums()) {
            if (!NOT_SHOWN.contains(c.getSimpleName())) {
                for (Object constant : c.getEnumConstants()) {
                    if (!Labels.has(c.getSimpleName(), ((Enum<?>) constant).name())) {
                        missing.add(c.getSimpleName() + "." + ((Enum<?>) constant).name());
                    }
                }
            }
        }
        assertThat(missing).as("constants without a label in platform/labels.properties").isEmpty();
    }

    @Test
    void theGlossaryListsEveryLabel() throws IOException {
        String glossary = Files.readString(Path.of("docs", "glossary.md"), StandardCharsets.UTF_8);
        List<String> missing = new ArrayList<>();
        for (Map.Entry<String, String> label : Labels.all().entrySet()) {
            String name = label.getKey().substring(label.getKey().indexOf('.') + 1);
            String row = "| " + label.getValue().replace("|", "\\|") + " | `" + name + "` |";
            if (!glossary.contains(row)) {
                missing.add(label.getKey() + " = " + label.getValue());
            }
        }
        assertThat(missing).as("labels missing from docs/glossary.md").isEmpty();
    }

    @Test
    void labelsAreWordsNotConstantNames() {
        assertThat(Labels.of("RoundState", "OPEN_FOR_RESULTS")).isEqualTo("Open for results");
        assertThat(Labels.of("SigmaPtMethod", "HORWITZ_THOMPSON")).isEqualTo("Horwitz–Thompson");
        assertThat(Labels.of("JobKind", "report-issue")).isEqualTo("Issue of reports");
        assertThat(Labels.of("RoundState", "SOME_NEW_STATE")).isEqualTo("Some new state");
        assertThat(Labels.of("RoundState", null)).isEmpty();
        for (String label : Labels.all().values()) {
            assertThat(PageChecks.constantNamesIn(label)).as(label).isEmpty();
        }
    }
}
