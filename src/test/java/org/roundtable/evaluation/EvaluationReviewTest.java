package org.roundtable.evaluation;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.response.Response;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.audit.Actor;
import org.roundtable.scheme.RoundState;
import org.roundtable.testing.World;

import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The coordinator's review of an evaluation run: the version page is a summary per measurand that does not grow
 * with laboratories, each measurand has its own page with paged, searched and filtered scores, the report's charts
 * are SVG images, and laboratories reach none of it.
 */
@QuarkusTest
class EvaluationReviewTest {

    /** Invented Cr results around 18.1 %, one far off (σpt 0.10 % by the simple plan, so it is unsatisfactory). */
    private static final String[] VALUES = {"18.02", "18.05", "18.08", "18.10", "18.11", "18.12", "18.13", "18.15",
            "18.18", "18.21", "18.95"};

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    org.roundtable.platform.DisplaySettings display;

    private long[] labs;

    private long evaluatedRound() {
        labs = new long[VALUES.length];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(RoundState.OPEN_FOR_RESULTS, labs);
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Cr", VALUES[i], "0.08", "spark-oes", false);
        }
        evaluations.run(round, true, new Actor("review-test", "coordinator", null));
        return round;
    }

    @Test
    void theSummaryCountsVerdictsPerMeasurandAndLinksTheMeasurandPage() {
        long round = evaluatedRound();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String html = coordinator.request().get("/rounds/" + round + "/evaluation/1").then().statusCode(200)
                .extract().asString();
        assertThat(html).contains("href=\"/rounds/" + round + "/evaluation/1/measurands/Cr-A\"")
                .contains("Consensus of all participants").contains("Fixed by the scheme");
        String row = row(html, "Cr, item A");
        // 11 results: ten within ±2σpt of the consensus, 18.95 % far above it (z well over 3)
        assertThat(cells(row).subList(0, 4)).containsExactly("11", "10", "0", "1");
        String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, labs[0]);
        assertThat(html).as("no per-laboratory rows on the summary").doesNotContain(code);
    }

    @Test
    void theMeasurandPageShowsStatisticsScoresAndFilters() {
        long round = evaluatedRound();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String path = "/rounds/" + round + "/evaluation/1/measurands/Cr-A";
        String html = coordinator.request().get(path).then().statusCode(200).extract().asString();
        assertThat(html).contains("Robust statistics").contains("Algorithm A x*").contains("Method groups")
                .contains("Spark OES").contains("Rows 1–" + Math.min(11, display.pageSize()) + " of 11.")
                .contains(path + "/charts/score-bars.svg").contains(path + "/charts/density.svg")
                .contains(path + "/charts/uncertainty-bars.svg");
        // σpt 0.10 % at reporting digits 2 + 1 = 3 decimals
        assertThat(html).contains("0.100");
        assertThat(html.split("<tr><td class=\"mono\">", -1).length - 1).isEqualTo(Math.min(11, display.pageSize()));

        String unsatisfactory = coordinator.request().queryParam("verdict", "unsatisfactory").get(path).then()
                .statusCode(200).extract().asString();
        assertThat(unsatisfactory).contains("Rows 1–1 of 1.").contains("18.95").doesNotContain(">18.12<");

        String code = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, labs[5]);
        String found = coordinator.request().queryParam("q", code.substring(0, code.length()).toLowerCase())
                .get(path).then().statusCode(200).extract().asString();
        assertThat(found).contains(code).contains("18.12").contains("Rows 1–1 of 1.");

        coordinator.request().get("/rounds/" + round + "/evaluation/1/measurands/Mn-A").then().statusCode(404);
        coordinator.request().get("/rounds/" + round + "/evaluation/1/measurands/nothing").then().statusCode(404);
        coordinator.request().get("/rounds/" + round + "/evaluation/9/measurands/Cr-A").then().statusCode(404);
    }

    @Test
    void theChartsOfTheReportAreSvgImages() {
        long round = evaluatedRound();
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        String base = "/rounds/" + round + "/evaluation/1/measurands/Cr-A/charts/";
        for (String kind : EvaluationPages.CHART_KINDS) {
            Response svg = coordinator.request().get(base + kind + ".svg");
            assertThat(svg.statusCode()).as(kind).isEqualTo(200);
            assertThat(svg.contentType()).as(kind).startsWith("image/svg+xml");
            assertThat(svg.asString()).as(kind).startsWith("<?xml").contains("<svg").contains("</svg>");
        }
        // the same chart code as the report: the score bars carry one bar per scored participant
        assertThat(coordinator.request().get(base + "score-bars.svg").asString()).contains("participant code");
        coordinator.request().get(base + "pie.svg").then().statusCode(404);
    }

    @Test
    void laboratoriesCannotOpenTheReviewPagesOrCharts() {
        long round = evaluatedRound();
        String base = "/rounds/" + round + "/evaluation/1";
        for (String role : List.of("lab-member", "lab-manager")) {
            World.Browser lab = world.signIn(world.user(role, labs[0]));
            lab.request().get(base).then().statusCode(403);
            lab.request().get(base + "/measurands/Cr-A").then().statusCode(403);
            lab.request().get(base + "/measurands/Cr-A/charts/score-bars.svg").then().statusCode(403);
        }
    }

    /**
     * A run of 10,000 laboratories × 50 measurands written straight into the run tables (the evaluation itself is
     * measured by its benchmark): the summary and a measurand page stay small, and the scores page at the budget.
     */
    @Test
    void pagesStaySmallAtTenThousandLaboratoriesAndFiftyMeasurands() {
        int laboratories = 10_000;
        int measurands = 50;
        long round = world.round(RoundState.CLOSED);
        long firstLab = world.insert("""
                INSERT INTO laboratory (name, organisation, country)
                SELECT 'Size lab ' || g, ?, 'DE' FROM generate_series(1, ?) g RETURNING id
                """, World.unique("Size org"), laboratories);
        long run = world.insert("""
                INSERT INTO evaluation_run (round_id, version, preview, round_state, plan_version, plan_sha256,
                       inputs_sha256, outputs_sha256, code_version, created_by, created_at)
                VALUES (?, 1, false, 'CLOSED', 1, repeat('a', 64), repeat('b', 64), repeat('c', 64), 'test', 'size-test',
                        now()) RETURNING id""", round);
        // element codes: two letters each, distinct; items A
        world.sql("""
                INSERT INTO measurand_evaluation (run_id, element, item_label, position, unit, n, censored, excluded,
                       assigned_value_method, assigned_value, assigned_value_uncertainty, sigma_pt, sigma_pt_method,
                       sigma_pt_source, score_used, median, made, niqr, robust_mean, robust_sd, iterations, converged,
                       warnings_json, method_groups_json)
                SELECT ?, chr(65 + g / 26) || chr(97 + g % 26), 'A', g, '%', ?, 0, 0, 'CONSENSUS_ALL', 18.1, 0.002,
                       0.1, 'FIXED', 'GIVEN', 'z', 18.1, 0.09, 0.09, 18.1, 0.09, 7, true,
                       '[]', '[{"methodGroup":"spark-oes","n":10000,"median":18.1,"robustMean":18.1,"robustSd":0.09}]'
                  FROM generate_series(0, ? - 1) g""", run, laboratories, measurands);
        world.sql("""
                INSERT INTO participant_score (run_id, element, item_label, laboratory_id, position, participant_code,
                       reported, method_group, value, z, z_prime, zeta, en, classification, excluded_reason)
                SELECT ?, chr(65 + m / 26) || chr(97 + m % 26), 'A', ? + l, l, 'P' || lpad(l::text, 5, '0'),
                       (18.1 + (l % 7 - 3) * 0.1)::text, 'spark-oes', 18.1 + (l % 7 - 3) * 0.1, (l % 7 - 3), null,
                       null, null, CASE WHEN abs(l % 7 - 3) >= 3 THEN 'unsatisfactory' WHEN abs(l % 7 - 3) > 2
                       THEN 'questionable' ELSE 'satisfactory' END, null
                  FROM generate_series(0, ? - 1) m CROSS JOIN generate_series(0, ? - 1) l""",
                run, firstLab, measurands, laboratories);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));

        String summary = coordinator.request().get("/rounds/" + round + "/evaluation/1").then().statusCode(200)
                .extract().asString();
        assertThat(summary.split("class=\"measurand-link\"", -1).length - 1).isEqualTo(measurands);
        // l % 7 - 3 in -3..3: |z| = 3 for 2 of 7 residues -> unsatisfactory; 0 questionable; 5 of 7 satisfactory
        assertThat(cells(row(summary, "Aa, item A")).subList(0, 4)).containsExactly("10000", "7143", "0", "2857");
        String key = "Aa-A";
        String path = "/rounds/" + round + "/evaluation/1/measurands/" + key;
        String first = coordinator.request().get(path).then().statusCode(200).extract().asString();
        int size = display.pageSize();
        assertThat(first).contains("Rows 1–" + size + " of 10000.").contains("Page 1 of " + (10_000 / size))
                .contains("P00000").doesNotContain(String.format("P%05d", size))
                .contains("/evaluation/1/measurands/Ab-A\" rel=\"next\"").doesNotContain("rel=\"prev\" id=\"previous-measurand\"");
        String second = coordinator.request().queryParam("page", 2).get(path).then().statusCode(200).extract().asString();
        assertThat(second).contains("Rows " + (size + 1) + "–" + (2 * size) + " of 10000.")
                .contains(String.format("P%05d", size)).doesNotContain(String.format(">P%05d<", size - 1));
        String filtered = coordinator.request().queryParam("verdict", "unsatisfactory").queryParam("page", 2)
                .get(path).then().statusCode(200).extract().asString();
        assertThat(filtered).contains("of 2857.").contains("verdict=unsatisfactory").doesNotContain("verdict-satisfactory");
        // the test profile's page holds few rows; the page at the production budget of 50 rows adds 50 - size rows
        int rowBytes = (first.length() - first.replaceAll("(?s)<tr><td class=\"mono\">.*?</tr>", "").length()) / size;
        System.out.printf("[page sizes] %d laboratories x %d measurands: summary %.1f KiB; measurand page %.1f KiB"
                        + " with %d score rows (%d bytes a row, about %.1f KiB with 50)%n", laboratories, measurands,
                summary.length() / 1024.0, first.length() / 1024.0, size, rowBytes,
                (first.length() + (50 - size) * rowBytes) / 1024.0);
        // for reading only (speed is shown by benchmarks, never asserted): the second answer of each page, warm
        long summaryMillis = coordinator.request().get("/rounds/" + round + "/evaluation/1").time();
        long measurandMillis = coordinator.request().get(path).time();
        System.out.printf("[page times] summary %d ms, measurand page %d ms (test machine, second view: the verdict counts kept from the first)%n", summaryMillis,
                measurandMillis);
        assertThat(summary.length()).as("summary page size").isLessThan(300 * 1024);
        assertThat(first.length()).as("measurand page size").isLessThan(100 * 1024);
    }

    private static String row(String html, String containing) {
        Matcher m = Pattern.compile("<tr>((?:(?!</tr>).)*" + Pattern.quote(containing) + "(?:(?!</tr>).)*)</tr>",
                Pattern.DOTALL).matcher(html);
        assertThat(m.find()).as("a row with " + containing).isTrue();
        return m.group(1);
    }

    private static List<String> cells(String row) {
        Matcher m = Pattern.compile("<td class=\"num\">(\\d+)(?:</td>| <span)").matcher(row);
        List<String> found = new java.util.ArrayList<>();
        while (m.find()) {
            found.add(m.group(1));
        }
        return found;
    }
}
