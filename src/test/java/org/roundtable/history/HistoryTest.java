package org.roundtable.history;

import io.quarkus.test.junit.QuarkusTest;
import io.restassured.path.json.JsonPath;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.testing.World;

import java.sql.Date;
import java.time.Instant;
import java.time.LocalDate;
import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

/**
 * The history of a laboratory on PostgreSQL, from rounds published through the report feature's issue event.
 * Scores are set by hand: x_pt = 18.00 %, σpt = 0.10 % (see {@link HistoryRounds}), so z = (x − 18.00)/0.10.
 */
@QuarkusTest
class HistoryTest {

    @Inject
    World world;

    @Inject
    HistoryRounds rounds;

    @Inject
    org.roundtable.testing.Publications publications;

    private World.Browser member(long lab) {
        return world.signIn(world.user("lab-member", lab));
    }

    private JsonPath history(World.Browser who, String path, int status) {
        return who.request().get(path).then().statusCode(status).extract().jsonPath();
    }

    @Test
    void showsPublishedScoresOverThreeRoundsWithCombinedScoresComputableByHand() {
        long lab = world.laboratory();
        long other = world.laboratory();
        long scheme = rounds.scheme();
        rounds.published(scheme, lab, "18.10", ReportStatus.FINAL);       // z = +1.0
        rounds.published(scheme, lab, "18.25", ReportStatus.FINAL);       // z = +2.5 (questionable)
        rounds.published(scheme, lab, "17.80", ReportStatus.PRELIMINARY); // z = −2.0 (satisfactory, |z| ≤ 2)
        rounds.evaluatedRound(scheme, new long[]{lab}, new String[]{"19.00"}); // evaluated, never issued: not shown
        rounds.published(scheme, other, "18.90", ReportStatus.FINAL);     // another laboratory's round

        JsonPath h = history(member(lab), "/api/v1/my-laboratory/history", 200);

        assertThat(h.getList("entries")).hasSize(3);
        List<Float> z = h.getList("entries.z", Float.class);
        assertThat(z).containsExactly(1.0f, 2.5f, -2.0f);
        assertThat(h.getList("entries.verdict")).containsExactly("SATISFACTORY", "QUESTIONABLE", "SATISFACTORY");
        // Hand computation (common practice, no source): RSZ = (1.0 + 2.5 − 2.0)/√3 = 0.8660254;
        // SSZ = 1 + 6.25 + 4 = 11.25 against χ²₃: 7.8147 (95 %) and 11.3449 (99 %) (R: qchisq(c(.95,.99), 3))
        assertThat(h.getDouble("series[0].combined.rescaledSum")).isCloseTo(0.8660254, within(1e-6));
        assertThat(h.getDouble("series[0].combined.sumOfSquares")).isCloseTo(11.25, within(1e-9));
        assertThat(h.getDouble("series[0].combined.chiSquared95")).isCloseTo(7.8147, within(1e-4));
        assertThat(h.getString("series[0].combined.sumOfSquaresVerdict")).isEqualTo("QUESTIONABLE");
        assertThat(h.getString("series[0].combined.rescaledSumVerdict")).isEqualTo("SATISFACTORY");
        assertThat(h.getInt("series[0].combined.count")).isEqualTo(3);
        assertThat(h.getList("warnings")).isEmpty();
    }

    @Test
    void combinedScoresCoverOnlyTheChosenWindowOfRounds() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        for (String v : new String[]{"18.30", "18.10", "17.90"}) { // z = +3.0, +1.0, −1.0
            rounds.published(scheme, lab, v, ReportStatus.FINAL);
        }
        JsonPath h = history(member(lab), "/api/v1/my-laboratory/history?rounds=2", 200);
        // last two rounds: RSZ = (1 − 1)/√2 = 0; SSZ = 2 (hand computation)
        assertThat(h.getInt("series[0].combined.count")).isEqualTo(2);
        assertThat(h.getDouble("series[0].combined.rescaledSum")).isCloseTo(0.0, within(1e-9));
        assertThat(h.getDouble("series[0].combined.sumOfSquares")).isCloseTo(2.0, within(1e-9));
        // the unsatisfactory first round still warns, outside the window of the combined scores
        assertThat(h.getList("warnings.kind")).containsExactly("UNSATISFACTORY");
    }

    @Test
    void twoQuestionableResultsInARowWarnAtTheSecondAndNotBefore() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        rounds.published(scheme, lab, "18.25", ReportStatus.FINAL); // z = +2.5
        World.Browser member = member(lab);
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings")).isEmpty();
        rounds.published(scheme, lab, "17.75", ReportStatus.FINAL); // z = −2.5
        JsonPath h = history(member, "/api/v1/my-laboratory/history", 200);
        assertThat(h.getList("warnings.kind")).containsExactly("QUESTIONABLE_IN_A_ROW");
        assertThat(h.getMap("")).doesNotContainKey("visibleRounds"); // the page's bookkeeping stays out of the JSON
    }

    @Test
    void aWarningFiredByAPublishedRoundReachesTheLaboratoryAsANoticeOnce() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        World.Browser member = member(lab);
        rounds.published(scheme, lab, "18.25", ReportStatus.FINAL); // z = +2.5: questionable, no warning yet
        assertThat(history(member, "/api/v1/notices", 200).getList("notices.kind")).doesNotContain("performance-warning");
        rounds.published(scheme, lab, "17.75", ReportStatus.FINAL); // z = −2.5: the second questionable in a row
        JsonPath notices = history(member, "/api/v1/notices", 200);
        assertThat(notices.getList("notices.kind")).containsOnlyOnce("performance-warning");
        assertThat(notices.getString("notices.find { it.kind == 'performance-warning' }.link"))
                .isEqualTo("/my-laboratory/history");
    }

    @Test
    void filtersByMeasurandMethodAndPeriod() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        rounds.publishedAt(scheme, lab, "18.10", ReportStatus.FINAL, Instant.parse("2024-03-01T10:00:00Z"));
        rounds.publishedAt(scheme, lab, "18.20", ReportStatus.FINAL, Instant.parse("2025-06-01T10:00:00Z"));
        World.Browser member = member(lab);
        assertThat(history(member, "/api/v1/my-laboratory/history?from=2025-01-01", 200).getList("entries.reportedOn"))
                .containsExactly("2025-06-01");
        assertThat(history(member, "/api/v1/my-laboratory/history?until=2024-12-31", 200).getList("entries.reportedOn"))
                .containsExactly("2024-03-01");
        assertThat(history(member, "/api/v1/my-laboratory/history?measurand=Mn", 200).getList("entries")).isEmpty();
        assertThat(history(member, "/api/v1/my-laboratory/history?method=xrf", 200).getList("entries")).isEmpty();
        assertThat(history(member, "/api/v1/my-laboratory/history?measurand=Cr&method=spark-oes&scheme=" + scheme, 200)
                .getList("entries")).hasSize(2);
        assertThat(history(member, "/api/v1/my-laboratory/history?from=yesterday", 400).getString("detail"))
                .contains("date");
    }

    @Test
    void anAuditorWithoutAGrantGetsNotFound() {
        long lab = world.laboratory();
        rounds.published(rounds.scheme(), lab, "18.10", ReportStatus.FINAL);
        World.Browser auditor = world.signIn(world.user("auditor", null));
        history(auditor, "/api/v1/laboratories/" + lab + "/history", 404);
        history(auditor, "/api/v1/laboratories/999999999/history", 404);
        assertThat(auditor.request().get("/laboratories/" + lab + "/history").statusCode()).isEqualTo(404);
    }

    @Test
    void anAuditorWithAGrantSeesOnlyThatLaboratoryFinalReportsAndTheGrantedPeriod() {
        long lab = world.laboratory();
        long other = world.laboratory();
        long scheme = rounds.scheme();
        rounds.publishedAt(scheme, lab, "18.10", ReportStatus.FINAL, Instant.parse("2024-03-01T10:00:00Z"));
        rounds.publishedAt(scheme, lab, "18.20", ReportStatus.FINAL, Instant.parse("2025-06-01T10:00:00Z"));
        rounds.published(scheme, lab, "18.00", ReportStatus.PRELIMINARY); // not for auditors
        rounds.published(scheme, other, "18.00", ReportStatus.FINAL);
        String username = world.user("auditor", null);
        long grant = world.grant(lab, username);
        world.sql("UPDATE auditor_grant SET data_from = ?, data_until = ? WHERE id = ?",
                Date.valueOf(LocalDate.parse("2025-01-01")), Date.valueOf(LocalDate.parse("2025-12-31")), grant);
        World.Browser auditor = world.signIn(username);

        JsonPath h = history(auditor, "/api/v1/laboratories/" + lab + "/history", 200);
        assertThat(h.getList("entries.reportedOn")).containsExactly("2025-06-01");
        assertThat(h.getList("entries.reportStatus")).containsExactly("FINAL");
        history(auditor, "/api/v1/laboratories/" + other + "/history", 404);

        // the window does not outlive the grant's validity
        world.sql("UPDATE auditor_grant SET granted_at = now() - interval '2 days', valid_until = now() - interval '1 day' WHERE id = ?", grant);
        history(auditor, "/api/v1/laboratories/" + lab + "/history", 404);
    }

    @Test
    void aCoordinatorSeesAnyLaboratoryAndTheLaboratoryPageRendersItsCharts() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        rounds.published(scheme, lab, "18.10", ReportStatus.FINAL);
        rounds.published(scheme, lab, "18.35", ReportStatus.FINAL);
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        assertThat(history(coordinator, "/api/v1/laboratories/" + lab + "/history", 200).getList("entries")).hasSize(2);
        String page = member(lab).request().get("/my-laboratory/history").then().statusCode(200).extract().asString();
        assertThat(page).contains("<svg", "Unsatisfactory result", "Combined scores", "/api/v1/my-rounds/");
        assertThat(page).doesNotContain("UNSATISFACTORY", "SPARK_OES");
    }

    @Test
    void theFieldViewCountsTheVerdictsOfEachRoundFromTheSummaryFilledAtIssue() {
        long scheme = rounds.scheme();
        long[] labs = {world.laboratory(), world.laboratory(), world.laboratory()};
        // z = +0.5 (satisfactory), +2.5 (questionable), +4.0 (unsatisfactory)
        long round = rounds.evaluatedRound(scheme, labs, new String[]{"18.05", "18.25", "18.40"});
        World.Browser coordinator = world.signIn(world.user("coordinator", null));
        assertThat(history(coordinator, "/api/v1/field-view/" + scheme, 200).getList("measurands")).isEmpty();
        publications.issueRoundReport(round, 1, ReportStatus.FINAL);
        JsonPath field = history(coordinator, "/api/v1/field-view/" + scheme, 200);
        assertThat(field.getInt("measurands[0].total.satisfactory")).isEqualTo(1);
        assertThat(field.getInt("measurands[0].total.questionable")).isEqualTo(1);
        assertThat(field.getInt("measurands[0].total.unsatisfactory")).isEqualTo(1);
        assertThat(field.getList("measurands[0].rounds")).hasSize(1);
        assertThat(field.getList("measurands[0].methodGroups")).hasSize(1);
        assertThat(coordinator.request().get("/schemes/" + scheme + "/field").then().statusCode(200).extract().asString())
                .contains("Spark OES", "33.3 %");
        history(coordinator, "/api/v1/field-view/999999999", 404);
    }

    private static org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan warnings(String unsatisfactory,
            String questionable, String questionableInARow, String bias, String drift, String driftRounds,
            String driftLimit) {
        return new org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan(unsatisfactory, questionable,
                questionableInARow, bias, "6", drift, driftRounds, driftLimit);
    }

    private List<Object> performanceNotices(World.Browser who) {
        return history(who, "/api/v1/notices", 200).getList("notices.findAll { it.kind == 'performance-warning' }");
    }

    @Test
    void withThreeQuestionableInARowInThePlanTheWarningAndItsNoticeComeAtTheThirdAndNotAtTheSecond() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        World.Browser member = member(lab);
        org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan three = warnings("true", "true", "3", "true", "true", "3", "2");
        rounds.published(scheme, lab, "18.25", ReportStatus.FINAL, three); // z = +2.5
        rounds.published(scheme, lab, "17.75", ReportStatus.FINAL, three); // z = −2.5: two in a row, no warning yet
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings")).isEmpty();
        assertThat(performanceNotices(member)).isEmpty();
        long third = rounds.published(scheme, lab, "18.22", ReportStatus.FINAL, three); // z = +2.2: the third
        JsonPath h = history(member, "/api/v1/my-laboratory/history", 200);
        assertThat(h.getList("warnings.kind")).containsExactly("QUESTIONABLE_IN_A_ROW");
        assertThat(h.getString("warnings[0].message")).contains("3 questionable results in a row");
        assertThat(performanceNotices(member)).hasSize(1);
        assertThat(world.text("SELECT code FROM round WHERE id = ?", third)).isEqualTo(h.getString("warnings[0].roundCode"));
    }

    @Test
    void withADriftOfTwoRoundsToOnePointTwoInThePlanItWarnsAtTheSecondResultAndNotAtTheFirst() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        World.Browser member = member(lab);
        org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan drift = warnings("true", "true", "2", "true", "true", "2", "1.2");
        rounds.published(scheme, lab, "18.10", ReportStatus.FINAL, drift); // z = 1.0
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings")).isEmpty();
        rounds.published(scheme, lab, "18.13", ReportStatus.FINAL, drift); // z = 1.3 ≥ 1.2, rising over 2 rounds
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings.kind")).containsExactly("DRIFT");
        assertThat(performanceNotices(member)).hasSize(1);
        // the page shows it too
        assertThat(member.request().accept("text/html").get("/my-laboratory/history").then().statusCode(200).extract()
                .asString()).contains("|z| increased over 2 rounds in a row");
    }

    @Test
    void rulesSwitchedOffInThePlanGiveNoWarningAndNoNoticeAndTheLatestRoundsPlanJudgesTheWholeHistory() {
        long lab = world.laboratory();
        long scheme = rounds.scheme();
        World.Browser member = member(lab);
        org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan off = warnings("false", "false", "2", "false", "false", "3", "2");
        rounds.published(scheme, lab, "18.25", ReportStatus.FINAL, off); // z = +2.5
        rounds.published(scheme, lab, "17.75", ReportStatus.FINAL, off); // z = −2.5: two questionable in a row
        rounds.published(scheme, lab, "18.40", ReportStatus.FINAL, off); // z = +4.0: unsatisfactory
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings")).isEmpty();
        assertThat(performanceNotices(member)).isEmpty();
        // a later round with the usual plan: its rules now judge the whole series (see docs/methods.md)
        rounds.published(scheme, lab, "18.05", ReportStatus.FINAL); // z = +0.5
        assertThat(history(member, "/api/v1/my-laboratory/history", 200).getList("warnings.kind"))
                .containsExactly("QUESTIONABLE_IN_A_ROW", "UNSATISFACTORY");
        assertThat(performanceNotices(member)).isEmpty(); // the new round fired nothing itself
    }
}
