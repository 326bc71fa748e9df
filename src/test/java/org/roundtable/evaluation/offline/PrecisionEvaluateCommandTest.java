package org.roundtable.evaluation.offline;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class PrecisionEvaluateCommandTest {

    @TempDir
    Path dir;

    private Path study() throws Exception {
        Path file = dir.resolve("study.csv");
        try (var in = getClass().getResourceAsStream("/statistics/precision/carbon-in-steel-study.csv")) {
            Files.write(file, in.readAllBytes());
        }
        return file;
    }

    private record Run(int code, String out, String err) {
    }

    private static Run run(String... args) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = EvaluateCommand.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        return new Run(code, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    @Test
    void evaluatesTheStudyWithTheIndependentlyComputedPrecision() throws Exception {
        Run r = run("--precision", study().toString());
        assertEquals(0, r.code(), r.err());
        JsonNode level3 = new ObjectMapper().readTree(r.out()).path("measurands").get(0).path("levels").get(2);
        // CALC: check_values.py beside the data (NumPy), level 3, all laboratories
        assertEquals(0.00784402639, level3.path("repeatabilitySd").asDouble(), 1e-12);
        assertEquals(0.02020013595, level3.path("reproducibilitySd").asDouble(), 1e-11);
        assertEquals("outlier", level3.path("cells").get(9).path("verdict").asText());
        assertEquals("L10", level3.path("cells").get(9).path("laboratory").asText());
    }

    @Test
    void excludesACellOnlyWhenTold() throws Exception {
        Run r = run("--precision", "--exclude", "L10:3:C", study().toString());
        assertEquals(0, r.code(), r.err());
        JsonNode level3 = new ObjectMapper().readTree(r.out()).path("measurands").get(0).path("levels").get(2);
        // CALC: check_values.py, level 3 without L10
        assertEquals(11, level3.path("retainedLaboratories").asInt());
        assertEquals(0.01237928622, level3.path("reproducibilitySd").asDouble(), 1e-11);
    }

    @Test
    void refusesACellWithTheWrongNumberOfReplicatesNamingItsRow() throws Exception {
        Path file = dir.resolve("short.csv");
        Files.writeString(file, "laboratory,level,measurand,replicate,value\nA,1,C,1,0.05\nA,1,C,2,0.051\n"
                + "B,1,C,1,0.052\nC,1,C,1,0.049\nC,1,C,2,0.050\n");
        Run r = run("--precision", file.toString());
        assertEquals(2, r.code());
        assertTrue(r.err().contains("row 4") && r.err().contains("laboratory B"), r.err());
    }
}
