package org.roundtable.precision;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.roundtable.testing.World;

/**
 * The worked example {@code precision/sirstv-precision-study.csv} (NIST StRD SiRstv as 5 laboratories × 1 level ×
 * 5 replicates; see the README beside it) through the server path on PostgreSQL: created, enrolled, submitted by
 * each laboratory as CSV, closed and evaluated through the API; the stored run's s_r, s_R, r, R, h, k, Cochran C
 * and Grubbs statistics are compared with the project's statistics reference. There is no ISO 5725-2 worked
 * example with printed results in that reference; the source of each check value is named beside it.
 */
@QuarkusTest
class PrecisionWorkedExampleTest {

    @Inject
    World world;

    private static final ObjectMapper JSON = new ObjectMapper();

    /** laboratory (I1 … I5) → CSV of its replicates for the submission. */
    private static Map<String, String> submissions() throws IOException {
        try (InputStream in = PrecisionWorkedExampleTest.class.getResourceAsStream("/precision/sirstv-precision-study.csv")) {
            Map<String, StringBuilder> csv = new LinkedHashMap<>();
            String[] lines = new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n");
            for (int i = 1; i < lines.length; i++) {
                String[] f = lines[i].strip().split(",");
                csv.computeIfAbsent(f[0], k -> new StringBuilder("level,measurand,replicate,value,unit\n"))
                        .append(f[1]).append(',').append(f[2]).append(',').append(f[3]).append(',').append(f[4])
                        .append(",mg/kg\n");
            }
            Map<String, String> out = new LinkedHashMap<>();
            csv.forEach((k, v) -> out.put(k, v.toString()));
            return out;
        }
    }

    @Test
    void theSirstvStudyEvaluatedThroughTheServerGivesTheReferenceValues() throws Exception {
        PrecisionStudies studies = new PrecisionStudies(world);
        long scheme = world.insert("INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'LOW_ALLOY_STEEL', now()) RETURNING id",
                World.unique("Worked example"));
        // the measurand and unit are nominal: the SiRstv values are resistances; 4 digits as printed by NIST
        world.insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, method_groups) "
                + "VALUES (?, 'Si', 'mg/kg', 4, 150, 250, 'SPARK_OES') RETURNING id", scheme);
        String code = World.unique("SI").toUpperCase();
        Map<String, Object> round = new LinkedHashMap<>();
        round.put("schemeId", scheme);
        round.put("code", code);
        round.put("itemDescription", "One bottle per laboratory");
        round.put("dispatchDate", LocalDate.now().toString());
        round.put("resultDeadline", LocalDate.now().plusDays(30) + "T17:00");
        round.put("timeZone", "Europe/Berlin");
        round.put("instructions", "Measure five times under repeatability conditions.");
        Map<String, Object> plan = new LinkedHashMap<>();
        plan.put("levels", List.of(Map.of("label", "1", "material", "SiRstv wafer")));
        plan.put("measurands", List.of("Si"));
        plan.put("replicates", 5);
        PrecisionStudies.Study study = studies.openForResults(code, Map.of("round", round, "plan", plan), 5);

        Map<String, String> csv = submissions();
        Map<String, Integer> indexOfCode = new HashMap<>();
        int i = 0;
        for (Map.Entry<String, String> lab : csv.entrySet()) {
            String name = String.format("L%02d", i + 1);
            Response r = studies.submitCsv(study.roundId(), study.labs().get(name), lab.getValue());
            assertThat(r.statusCode()).as(r.asString()).isEqualTo(201);
            indexOfCode.put(study.codes().get(name), i++);
        }
        PrecisionStudies.close(study);
        JsonNode run = JSON.readTree(study.coordinator().json()
                .post("/api/v1/precision-experiments/" + study.roundId() + "/evaluations")
                .then().statusCode(201).extract().asString());
        JsonNode level = run.path("study").path("measurands").get(0).path("levels").get(0);

        // statistics reference 14.11, SiRstv row: s_r PUB (NIST certified residual SD), s_L, s_R, r, R DER (rel 1e-10;
        // r and R printed to 10 significant digits, rel 2e-10)
        assertThat(level.path("retainedLaboratories").asInt()).isEqualTo(5);
        assertThat(level.path("repeatabilitySd").asDouble()).isCloseTo(0.104076068334656, within(0.104076068334656 * 1e-10));
        assertThat(level.path("betweenLaboratorySd").asDouble()).isCloseTo(0.0197723918634, within(0.0197723918634 * 1e-10));
        assertThat(level.path("reproducibilitySd").asDouble()).isCloseTo(0.105937601823, within(0.105937601823 * 1e-10));
        assertThat(level.path("repeatabilityLimit").asDouble()).isCloseTo(0.2914129913, within(0.2914129913 * 2e-10));
        assertThat(level.path("reproducibilityLimit").asDouble()).isCloseTo(0.2966252851, within(0.2966252851 * 2e-10));

        // 14.11, paragraph "Also from SiRstv" (CALC from the PUB inputs): cell means, h and k per instrument (abs 1e-4)
        double[] means = {196.24308, 196.24430, 196.16702, 196.14814, 196.14324};
        double[] h = {1.0663, 1.0905, -0.4377, -0.8111, -0.9080};
        double[] k = {0.8405, 1.3257, 0.9005, 1.0014, 0.8498};
        assertThat(level.path("cells")).hasSize(5);
        for (JsonNode cell : level.path("cells")) {
            int lab = indexOfCode.get(cell.path("laboratory").asText());
            assertThat(cell.path("mean").asDouble()).as("mean of I%d", lab + 1).isCloseTo(means[lab], within(1e-9));
            assertThat(cell.path("h").asDouble()).as("h of I%d", lab + 1).isCloseTo(h[lab], within(1e-4));
            assertThat(cell.path("k").asDouble()).as("k of I%d", lab + 1).isCloseTo(k[lab], within(1e-4));
            assertThat(cell.path("verdict").asText()).isEqualTo("accepted");
        }
        // 14.10 (CALC): h lines p = 5 1.5712 / 1.7150; k lines p = 5, n = 5 1.464813 / 1.649293
        assertThat(level.path("hStragglerLine").asDouble()).isCloseTo(1.5712, within(1e-4));
        assertThat(level.path("hOutlierLine").asDouble()).isCloseTo(1.7150, within(1e-4));
        assertThat(level.path("kStragglerLine").asDouble()).isCloseTo(1.464813, within(1e-6));
        assertThat(level.path("kOutlierLine").asDouble()).isCloseTo(1.649293, within(1e-6));

        // 14.11 paragraph: Cochran C = 0.351503 (CALC, abs 1e-6), instrument 2; 14.10: p = 5, n = 5 0.544034 / 0.632894
        JsonNode cochran = test(level, "Cochran C (largest variance)");
        assertThat(cochran.path("statistic").asDouble()).isCloseTo(0.351503, within(1e-6));
        assertThat(cochran.path("stragglerCritical").asDouble()).isCloseTo(0.544034, within(1e-6));
        assertThat(cochran.path("outlierCritical").asDouble()).isCloseTo(0.632894, within(1e-6));
        assertThat(cochran.path("verdict").asText()).isEqualTo("accepted");
        assertThat(indexOfCode.get(cochran.path("laboratories").get(0).asText())).isEqualTo(1);
        // 14.11 paragraph: Grubbs G_max = 1.090451 (instrument 2), G_min = 0.907971 (instrument 5) (CALC, abs 1e-6);
        // 14.10: Grubbs p = 5 1.7150 (5 %) / 1.7637 (1 %) (CALC, abs 1e-4)
        JsonNode high = test(level, "Grubbs single, highest mean");
        assertThat(high.path("statistic").asDouble()).isCloseTo(1.090451, within(1e-6));
        assertThat(high.path("stragglerCritical").asDouble()).isCloseTo(1.7150, within(1e-4));
        assertThat(high.path("outlierCritical").asDouble()).isCloseTo(1.7637, within(1e-4));
        assertThat(indexOfCode.get(high.path("laboratories").get(0).asText())).isEqualTo(1);
        JsonNode low = test(level, "Grubbs single, lowest mean");
        assertThat(low.path("statistic").asDouble()).isCloseTo(0.907971, within(1e-6));
        assertThat(indexOfCode.get(low.path("laboratories").get(0).asText())).isEqualTo(4);
        assertThat(high.path("verdict").asText()).isEqualTo("accepted");
        assertThat(low.path("verdict").asText()).isEqualTo("accepted");
    }

    private static JsonNode test(JsonNode level, String name) {
        for (JsonNode t : level.path("tests")) {
            if (t.path("test").asText().equals(name)) {
                return t;
            }
        }
        throw new AssertionError("no test " + name + " in " + level.path("tests"));
    }
}
