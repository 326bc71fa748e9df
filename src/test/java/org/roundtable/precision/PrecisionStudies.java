package org.roundtable.precision;

import static io.restassured.RestAssured.given;

import io.restassured.response.Response;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.roundtable.testing.World;

/**
 * Builds precision experiments for tests through the API as a coordinator and laboratories use it: a scheme with
 * carbon (%, 4 digits), a study of 3 levels with 2 replicates, 12 laboratories enrolled, and their results from the
 * invented data set {@code statistics/precision/carbon-in-steel-study.csv} (L01 … L12 in file order).
 */
final class PrecisionStudies {

    /** The data file, lines without header. */
    static List<String[]> rows() {
        try (InputStream in = PrecisionStudies.class.getResourceAsStream("/statistics/precision/carbon-in-steel-study.csv")) {
            List<String[]> rows = new ArrayList<>();
            String[] lines = new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n");
            for (int i = 1; i < lines.length; i++) {
                if (!lines[i].isBlank()) {
                    rows.add(lines[i].strip().split(","));
                }
            }
            return rows;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A built study. */
    record Study(long roundId, String code, World.Browser coordinator, Map<String, Long> labs, Map<String, String> codes) {
    }

    private final World world;

    PrecisionStudies(World world) {
        this.world = world;
    }

    /** A scheme whose catalogue has C in % with 4 reporting digits. */
    long scheme() {
        long scheme = world.insert("INSERT INTO scheme (name, material_family, created_at) VALUES (?, 'LOW_ALLOY_STEEL', now()) RETURNING id",
                World.unique("Carbon method study"));
        world.insert("INSERT INTO measurand (scheme_id, element, unit, reporting_digits, expected_min, expected_max, method_groups) "
                + "VALUES (?, 'C', '%', 4, 0.01, 1.5, 'COMBUSTION,SPARK_OES') RETURNING id", scheme);
        return scheme;
    }

    static Map<String, Object> createBody(long scheme, String code) {
        Map<String, Object> round = new LinkedHashMap<>();
        round.put("schemeId", scheme);
        round.put("code", code);
        round.put("itemDescription", "Steel chips, 20 g per level, in labelled glass bottles");
        round.put("dispatchDate", LocalDate.now().toString());
        round.put("resultDeadline", LocalDate.now().plusDays(30) + "T17:00");
        round.put("timeZone", "Europe/Berlin");
        round.put("instructions", "Analyse each level twice under repeatability conditions.");
        Map<String, Object> plan = new LinkedHashMap<>();
        plan.put("levels", List.of(Map.of("label", "1", "material", "Low-carbon steel chips"),
                Map.of("label", "2", "material", "Medium-carbon steel chips"),
                Map.of("label", "3", "material", "High-carbon steel chips")));
        plan.put("measurands", List.of("C"));
        plan.put("replicates", 2);
        return Map.of("round", round, "plan", plan);
    }

    /** A study created and frozen, 12 laboratories enrolled, items dispatched and open for results. */
    Study openForResults() {
        String code = World.unique("PE").toUpperCase();
        return openForResults(code, createBody(scheme(), code), 12);
    }

    /** A study of the given create body, frozen, {@code laboratories} enrolled (L01 …), dispatched and open for results. */
    Study openForResults(String code, Map<String, Object> body, int laboratories) {
        return openForResults(code, body, laboratories, (coordinator, roundId) -> { });
    }

    /** As above, with {@code whileEnrolling} run once the laboratories are enrolled, before the materials are dispatched. */
    Study openForResults(String code, Map<String, Object> body, int laboratories,
                         java.util.function.BiConsumer<World.Browser, Long> whileEnrolling) {
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        Response created = coordinator.json().body(body).post("/api/v1/precision-experiments");
        if (created.statusCode() != 201) {
            throw new AssertionError(created.asString());
        }
        long roundId = created.jsonPath().getLong("id");
        transition(coordinator, roundId, "FREEZE_PLAN");
        transition(coordinator, roundId, "OPEN_ENROLMENT");
        Map<String, Long> labs = new LinkedHashMap<>();
        for (int i = 1; i <= laboratories; i++) {
            long lab = world.laboratory();
            labs.put(String.format("L%02d", i), lab);
            Response r = coordinator.json().body(Map.of("laboratoryId", lab)).post("/api/v1/rounds/" + roundId + "/enrolments");
            if (r.statusCode() != 200) {
                throw new AssertionError(r.asString());
            }
        }
        whileEnrolling.accept(coordinator, roundId);
        transition(coordinator, roundId, "CONFIRM_QUALIFICATION");
        transition(coordinator, roundId, "DISPATCH_ITEMS");
        transition(coordinator, roundId, "OPEN_FOR_RESULTS");
        Map<String, String> codes = new LinkedHashMap<>();
        labs.forEach((name, id) -> codes.put(name, world.text(
                "SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?", roundId, id)));
        return new Study(roundId, code, coordinator, labs, codes);
    }

    /** Every laboratory uploads its rows of the data set as CSV through the API. */
    void submitAll(Study study) {
        for (Map.Entry<String, Long> lab : study.labs().entrySet()) {
            Response r = submitCsv(study.roundId(), lab.getValue(), csvOf(lab.getKey()));
            if (r.statusCode() != 201) {
                throw new AssertionError(lab.getKey() + ": " + r.asString());
            }
        }
    }

    static String csvOf(String lab) {
        StringBuilder csv = new StringBuilder("level,measurand,replicate,value,unit\n");
        for (String[] r : rows()) {
            if (r[0].equals(lab)) {
                csv.append(r[1]).append(',').append(r[2]).append(',').append(r[3]).append(',').append(r[4]).append(",%\n");
            }
        }
        return csv.toString();
    }

    Response submitCsv(long roundId, long laboratoryId, String csv) {
        return given().header("Authorization", "Bearer " + world.apiToken(laboratoryId)).contentType("text/csv")
                .body(csv.getBytes(StandardCharsets.UTF_8)).post("/api/v1/my-rounds/" + roundId + "/submission/file");
    }

    /** Closes the study for results. */
    static void close(Study study) {
        transition(study.coordinator(), study.roundId(), "CLOSE");
    }

    static void transition(World.Browser coordinator, long roundId, String action) {
        Response r = coordinator.json().body(Map.of("action", action)).post("/api/v1/rounds/" + roundId + "/transitions");
        if (r.statusCode() != 200) {
            throw new AssertionError(action + ": " + r.asString());
        }
    }

    /** The data set with participant codes in place of L01 … L12, for the offline command. */
    static String csvWithCodes(Map<String, String> codes) {
        StringBuilder csv = new StringBuilder("laboratory,level,measurand,replicate,value,unit\n");
        for (String[] r : rows()) {
            csv.append(codes.get(r[0])).append(',').append(r[1]).append(',').append(r[2]).append(',').append(r[3])
                    .append(',').append(r[4]).append(",%\n");
        }
        return csv.toString();
    }
}
