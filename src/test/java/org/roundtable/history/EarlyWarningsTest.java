package org.roundtable.history;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;

import static org.assertj.core.api.Assertions.assertThat;

/**
 * The early-warning rules at exactly their thresholds and one result before. The thresholds are common practice,
 * no source (see {@link EarlyWarnings}); the cases are hand-made sequences.
 */
class EarlyWarningsTest {

    private final EarlyWarnings rules = new EarlyWarnings(EarlyWarnings.DEFAULTS);

    /** Points from z-scores, classified by the usual bands (|z| ≤ 2, 2 < |z| < 3, |z| ≥ 3). */
    private static List<EarlyWarnings.Point> z(double... scores) {
        List<EarlyWarnings.Point> out = new ArrayList<>();
        for (int i = 0; i < scores.length; i++) {
            double a = Math.abs(scores[i]);
            Verdict v = a <= 2 ? Verdict.SATISFACTORY : a < 3 ? Verdict.QUESTIONABLE : Verdict.UNSATISFACTORY;
            out.add(new EarlyWarnings.Point("R" + (i + 1), scores[i], v, false));
        }
        return out;
    }

    private List<EarlyWarnings.Warning> warn(double... scores) {
        return rules.evaluate("Cr", z(scores));
    }

    private static List<EarlyWarnings.Kind> kinds(List<EarlyWarnings.Warning> w) {
        return w.stream().map(EarlyWarnings.Warning::kind).toList();
    }

    @Test
    void anUnsatisfactoryResultWarnsAtItsRound() {
        assertThat(warn(0.5, 2.99)).isEmpty();
        List<EarlyWarnings.Warning> w = warn(0.5, -3.0);
        assertThat(kinds(w)).containsExactly(EarlyWarnings.Kind.UNSATISFACTORY);
        assertThat(w.get(0).roundCode()).isEqualTo("R2");
        assertThat(w.get(0).basis()).contains("Common practice");
    }

    @Test
    void twoQuestionableInARowWarnAtTheSecondAndNotAfterOne() {
        assertThat(warn(0.1, 2.5)).isEmpty();
        assertThat(warn(2.5, 0.1, -2.5)).isEmpty();
        List<EarlyWarnings.Warning> w = warn(0.1, 2.5, -2.1);
        assertThat(kinds(w)).containsExactly(EarlyWarnings.Kind.QUESTIONABLE_IN_A_ROW);
        assertThat(w.get(0).roundCode()).isEqualTo("R3");
        assertThat(w.get(0).firstRound()).isEqualTo("R2");
    }

    @Test
    void sixScoresOfOneSignWarnOnceAtTheSixthAndFiveDoNot() {
        assertThat(warn(0.1, 0.2, 0.3, 0.1, 0.2)).isEmpty();
        List<EarlyWarnings.Warning> w = warn(0.1, 0.2, 0.3, 0.1, 0.2, 0.4);
        assertThat(kinds(w)).containsExactly(EarlyWarnings.Kind.BIAS);
        assertThat(w.get(0).roundCode()).isEqualTo("R6");
        assertThat(w.get(0).firstRound()).isEqualTo("R1");
        assertThat(warn(0.1, 0.2, 0.3, 0.1, 0.2, 0.4, 0.5)).hasSize(1);
        // a score of exactly zero has no sign and breaks the run; so does one of the other sign
        assertThat(warn(-0.1, -0.2, -0.3, 0.0, -0.1, -0.2)).isEmpty();
        assertThat(warn(-0.1, -0.2, -0.3, 0.1, -0.1, -0.2)).isEmpty();
    }

    @Test
    void aDriftWarnsWhenAbsoluteZRisesOverThreeRoundsToExactlyTwo() {
        assertThat(warn(1.0, 1.5, 1.99)).isEmpty();           // last below 2
        assertThat(kinds(warn(1.0, -1.5, 2.0))).containsExactly(EarlyWarnings.Kind.DRIFT); // |z| counts, not z
        assertThat(warn(0.1, 1.5, 2.0).get(0).firstRound()).isEqualTo("R1");
        assertThat(warn(1.5, 2.0)).isEmpty();                 // only two rounds
        assertThat(warn(1.0, 1.5, 1.5, 2.0)).isEmpty();       // not strictly increasing
    }

    @Test
    void scoresForInformationOnlyAndUnscoredResultsAreSkipped() {
        List<EarlyWarnings.Point> points = new ArrayList<>(z(2.5));
        points.add(new EarlyWarnings.Point("R2", 3.5, Verdict.UNSATISFACTORY, true));
        points.add(new EarlyWarnings.Point("R3", null, null, false));
        points.addAll(z(2.5));
        List<EarlyWarnings.Warning> w = rules.evaluate("Cr", points);
        assertThat(kinds(w)).containsExactly(EarlyWarnings.Kind.QUESTIONABLE_IN_A_ROW);
    }

    @Test
    void thresholdsComeFromTheRules() {
        EarlyWarnings three = new EarlyWarnings(new EarlyWarnings.Rules(false, 3, 4, 2, 1.0));
        assertThat(three.evaluate("Cr", z(3.5))).isEmpty();
        assertThat(kinds(three.evaluate("Cr", z(0.5, 1.0)))).containsExactly(EarlyWarnings.Kind.DRIFT);
        assertThat(kinds(three.evaluate("Cr", z(-0.1, -0.2, -0.1, -0.05)))).containsExactly(EarlyWarnings.Kind.BIAS);
    }

    @Test
    void aRuleSwitchedOffNeverWarnsWhileTheOthersStillDo() {
        EarlyWarnings noRuns = new EarlyWarnings(new EarlyWarnings.Rules(true, false, 2, false, 6, false, 3, 2.0));
        assertThat(kinds(noRuns.evaluate("Cr", z(2.5, 2.6, 2.7, 3.1, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6))))
                .containsExactly(EarlyWarnings.Kind.UNSATISFACTORY);
        EarlyWarnings nothing = new EarlyWarnings(new EarlyWarnings.Rules(false, false, 2, false, 6, false, 3, 2.0));
        assertThat(nothing.evaluate("Cr", z(2.5, 2.6, 2.7, 3.1, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6))).isEmpty();
    }

    @Test
    void aPlanStatesTheRulesAndWhatItLeavesOutIsTheFallback() {
        EarlyWarnings.Rules r = HistoryService.rules(new org.roundtable.scheme.EvaluationPlan.EarlyWarningPlan(
                "false", "true", "3", "false", null, "true", "4", "2.5"), EarlyWarnings.DEFAULTS);
        assertThat(r).isEqualTo(new EarlyWarnings.Rules(false, true, 3, false, 6, true, 4, 2.5));
        assertThat(HistoryService.rules(null, EarlyWarnings.DEFAULTS)).isEqualTo(EarlyWarnings.DEFAULTS);
        // the plan's defaults are the rules' defaults
        assertThat(HistoryService.rules(org.roundtable.scheme.PlanDocument.DEFAULT_EARLY_WARNINGS,
                new EarlyWarnings.Rules(false, false, 9, false, 9, false, 9, 9.0))).isEqualTo(EarlyWarnings.DEFAULTS);
    }
}
