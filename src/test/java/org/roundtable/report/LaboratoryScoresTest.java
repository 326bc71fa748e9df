package org.roundtable.report;

import io.quarkus.test.junit.QuarkusTest;
import jakarta.inject.Inject;
import org.junit.jupiter.api.Test;
import org.roundtable.evaluation.EvaluationService;
import org.roundtable.report.model.ReportStatus;
import org.roundtable.testing.Publications;
import org.roundtable.testing.World;

import static org.assertj.core.api.Assertions.assertThat;
import static org.hamcrest.Matchers.containsString;
import static org.hamcrest.Matchers.startsWith;

/**
 * A laboratory's scores page: nothing before a report is issued to laboratories, then its own figures and charts;
 * another laboratory's page cannot be reached by editing the address (404 exactly as for a missing round).
 */
@QuarkusTest
class LaboratoryScoresTest {

    @Inject
    World world;

    @Inject
    EvaluationService evaluations;

    @Inject
    Publications publications;

    private static String withoutRequestIds(String body) {
        return body.replaceAll("[0-9a-f]{24,32}", "");
    }

    @Test
    void theScoresPageOpensWithThePreliminaryReportAndShowsOnlyTheLaboratorysOwnFigures() {
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        World.Browser member = world.signIn(world.user("lab-member", ids[1]));
        String page = "/my-rounds/" + round + "/scores";

        // before publication: "not found", exactly like a round that does not exist
        String before = member.request().accept("text/html").get(page).then().statusCode(404).extract().asString();
        String missing = member.request().accept("text/html").get("/my-rounds/987654321/scores").then().statusCode(404)
                .extract().asString();
        assertThat(withoutRequestIds(before)).isEqualTo(withoutRequestIds(missing));

        publications.issueRoundReport(round, 1, ReportStatus.PRELIMINARY);
        String own = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, ids[1]);
        String other = world.text("SELECT participant_code FROM round_participant WHERE round_id = ? AND laboratory_id = ?",
                round, ids[2]);
        String html = member.request().accept("text/html").get(page).then().statusCode(200).extract().asString();
        assertThat(html).contains(own).contains("id=\"my-scores\"").contains("σ<sub>pt</sub>")
                .contains("/my-rounds/" + round + "/scores/Cr/scores.svg")
                .contains("/my-rounds/" + round + "/scores/Cr/density.svg")
                .contains("/my-rounds/" + round + "/scores/Cr/uncertainty.svg")
                .doesNotContain(">" + other + "<");
        member.request().get(page + "/Cr/scores.svg").then().statusCode(200)
                .contentType(startsWith("image/svg+xml")).body(containsString("<svg"));
        member.request().get(page + "/Cr/nothing.svg").then().statusCode(404);
        member.request().get(page + "/Zn/scores.svg").then().statusCode(404);
    }

    @Test
    void aLaboratoryThatEditsTheAddressToAnotherLaboratorysRoundGetsNotFoundAsForAMissingRound() {
        long[] ids = ReportAssemblerTest.evaluatedRound(world, evaluations);
        long round = ids[0];
        publications.issueRoundReport(round, 1, ReportStatus.PRELIMINARY);
        World.Browser outsider = world.signIn(world.user("lab-manager", world.laboratory()));
        String foreign = outsider.request().accept("text/html").get("/my-rounds/" + round + "/scores")
                .then().statusCode(404).extract().asString();
        String missing = outsider.request().accept("text/html").get("/my-rounds/987654321/scores")
                .then().statusCode(404).extract().asString();
        assertThat(withoutRequestIds(foreign)).isEqualTo(withoutRequestIds(missing));
        outsider.request().get("/my-rounds/" + round + "/scores/Cr/scores.svg").then().statusCode(404);
        // the laboratory's own page is there
        world.signIn(world.user("lab-member", ids[2])).request().get("/my-rounds/" + round + "/scores")
                .then().statusCode(200);
    }

    @Test
    void aScoreForInformationOnlyIsShownWithoutAVerdict() {
        long[] labs = new long[4];
        for (int i = 0; i < labs.length; i++) {
            labs[i] = world.laboratory();
        }
        long round = world.round(org.roundtable.scheme.RoundState.CLOSED, new org.roundtable.scheme.EvaluationPlan(
                java.util.List.of(new org.roundtable.scheme.EvaluationPlan.MeasurandPlan("Mn", "CONSENSUS_ALL", null, null,
                        null, null, null, "FIXED", "0.010", null, null, null, null, null, null, null, null, null, null, null,
                        null, null, null, null, "INFORMATION_ONLY"))), org.roundtable.scheme.Round.LatePolicy.REFUSE, labs);
        String[] values = {"0.742", "0.751", "0.748", "0.790"};
        for (int i = 0; i < labs.length; i++) {
            world.reportResult(round, labs[i], "Mn", values[i], null, "spark-oes", false);
        }
        evaluations.run(round, false, new org.roundtable.audit.Actor("scores-test", "coordinator", null));
        publications.issueRoundReport(round, 1, ReportStatus.PRELIMINARY);
        String html = world.signIn(world.user("lab-member", labs[3])).request().accept("text/html")
                .get("/my-rounds/" + round + "/scores").then().statusCode(200).extract().asString();
        String table = html.substring(html.indexOf("id=\"my-scores\""), html.indexOf("</table>", html.indexOf("id=\"my-scores\"")));
        assertThat(table).contains("for information").doesNotContain("class=\"verdict");
    }
}
