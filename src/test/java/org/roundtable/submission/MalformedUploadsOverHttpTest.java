package org.roundtable.submission;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

import static io.restassured.RestAssured.given;
import static org.assertj.core.api.Assertions.assertThat;

/**
 * Every file of the malformed-upload corpus ({@code uploads/malformed/MANIFEST.csv}) sent to the server: each is
 * refused with a 4xx naming the expected key, and the database holds no more revisions, results or files than
 * before. The corpus itself and its expected keys are pinned by the intake's own tests; here the round's
 * catalogue is the server's (Cr only), so only the status and "nothing saved" are asserted for every file, and the
 * key for the file-level cases that do not depend on the catalogue.
 */
@QuarkusTest
class MalformedUploadsOverHttpTest {

    @Inject
    World world;

    record Case(String file, String key) {
    }

    @Test
    void everyMalformedUploadIsRefusedAndLeavesTheDatabaseUnchanged() throws IOException {
        long lab = world.laboratory();
        long round = world.round(RoundState.OPEN_FOR_RESULTS, lab);
        String token = world.apiToken(lab);
        long before = counts();
        List<String> failures = new ArrayList<>();
        List<Case> cases = manifest();
        for (Case c : cases) {
            byte[] content = resource("/uploads/malformed/" + c.file());
            String type = c.file().endsWith(".xlsx") ? SubmissionResource.XLSX_TYPE
                    : c.file().endsWith(".json") ? "application/json" : "text/csv";
            String path = c.file().endsWith(".json") ? "/api/v1/my-rounds/" + round + "/submission"
                    : "/api/v1/my-rounds/" + round + "/submission/file";
            Response response = given().header("Authorization", "Bearer " + token).contentType(type).body(content).post(path);
            int status = response.statusCode();
            if (status < 400 || status >= 500) {
                failures.add(c.file() + " answered " + status);
            } else if (c.key().startsWith("file.") || c.key().startsWith("csv.") || c.key().startsWith("xlsx.")
                    || c.key().startsWith("json.")) {
                List<String> keys = response.path("errors.key");
                if (keys == null || !keys.contains(c.key())) {
                    failures.add(c.file() + " expected " + c.key() + " but got " + keys);
                }
            }
        }
        assertThat(failures).as("%d corpus files sent", cases.size()).isEmpty();
        assertThat(counts()).as("nothing was saved").isEqualTo(before);
        assertThat(cases.size()).isGreaterThanOrEqualTo(150);
    }

    private long counts() {
        return world.insert("SELECT (SELECT count(*) FROM submission_revision) + (SELECT count(*) FROM reported_result) "
                + "+ (SELECT count(*) FROM submission_upload)");
    }

    private static List<Case> manifest() throws IOException {
        List<Case> cases = new ArrayList<>();
        try (InputStream in = Objects.requireNonNull(MalformedUploadsOverHttpTest.class.getResourceAsStream("/uploads/malformed/MANIFEST.csv"));
             BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
            String line;
            boolean header = true;
            while ((line = reader.readLine()) != null) {
                if (line.isBlank() || line.startsWith("#")) {
                    continue;
                }
                if (header) {
                    header = false;
                    continue;
                }
                String[] cells = line.split(",", -1);
                cases.add(new Case(cells[0].strip(), cells[1].strip()));
            }
        }
        return cases;
    }

    private static byte[] resource(String path) throws IOException {
        try (InputStream in = Objects.requireNonNull(MalformedUploadsOverHttpTest.class.getResourceAsStream(path), path)) {
            return in.readAllBytes();
        }
    }
}
