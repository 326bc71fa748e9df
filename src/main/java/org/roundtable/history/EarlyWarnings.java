package org.roundtable.history;

import java.util.ArrayList;
import java.util.List;

/**
 * Early warnings over one measurand's results in round order: plain rules a laboratory and its assessor can check
 * by eye. Each rule is common practice in laboratories' PT monitoring (no published source is cited for these
 * thresholds; ISO/IEC 17025:2017 7.7.1 asks only that data be recorded so that trends can be detected).
 *
 * <ul>
 *   <li><b>Unsatisfactory result</b>: a result classified unsatisfactory (|z| ≥ 3, or |En| &gt; 1) — one warning
 *       per such result.</li>
 *   <li><b>Questionable in a row</b>: {@code questionableInARow} (default 2) consecutive results classified
 *       questionable — fires at the result that completes the run.</li>
 *   <li><b>Bias</b>: {@code sameSignRun} (default 6) consecutive z-like scores of the same sign (a score of exactly
 *       0 has no sign and breaks the run) — fires once per run, at the result that completes it.</li>
 *   <li><b>Drift</b>: |z| strictly increasing over {@code driftRounds} (default 3) consecutive results with the last
 *       |z| ≥ {@code driftLimit} (default 2) — fires at that last result.</li>
 * </ul>
 * "Consecutive" means consecutive results of this measurand that carry a score; a result without one (not scored,
 * excluded) and a score for information only are skipped, neither breaking nor extending a run. The z-like score
 * is the one used for the result (z or z′). Immutable and thread-safe.
 */
public final class EarlyWarnings {

    /** Common practice, no source: the note shown with every warning. */
    public static final String BASIS = "Common practice in laboratories' monitoring of PT results; no published source.";

    /** The kinds of warning. */
    public enum Kind {
        UNSATISFACTORY("Unsatisfactory result"),
        QUESTIONABLE_IN_A_ROW("Questionable results in a row"),
        BIAS("Scores of one sign in a row (a bias)"),
        DRIFT("|z| increasing round after round (a drift)");

        private final String label;

        Kind(String label) {
            this.label = label;
        }

        public String label() {
            return label;
        }
    }

    /**
     * The rules in force: each switched on or off, with its numbers; {@link #DEFAULTS} unless the round's
     * evaluation plan says otherwise (see {@code docs/methods.md}, "Early warnings").
     *
     * @param unsatisfactory     warn on every unsatisfactory result
     * @param questionable       warn on questionable results in a row
     * @param questionableInARow how many consecutive questionable results warn (≥ 2)
     * @param bias               warn on scores of one sign in a row
     * @param sameSignRun        how many consecutive scores of one sign warn (≥ 2)
     * @param drift              warn on |z| increasing round after round
     * @param driftRounds        over how many consecutive results |z| must increase (≥ 2)
     * @param driftLimit         the |z| the last of them must reach (&gt; 0)
     */
    public record Rules(boolean unsatisfactory, boolean questionable, int questionableInARow, boolean bias,
                        int sameSignRun, boolean drift, int driftRounds, double driftLimit) {
        public Rules {
            if (questionableInARow < 2 || sameSignRun < 2 || driftRounds < 2 || !(driftLimit > 0)) {
                throw new IllegalArgumentException("warning thresholds: runs of at least 2, a positive drift limit");
            }
        }

        /** Every run rule on, with these numbers. */
        public Rules(boolean unsatisfactory, int questionableInARow, int sameSignRun, int driftRounds, double driftLimit) {
            this(unsatisfactory, true, questionableInARow, true, sameSignRun, true, driftRounds, driftLimit);
        }
    }

    /** Everything on: unsatisfactory; 2 questionable; 6 of one sign; 3 rounds of increasing |z| ending at ≥ 2. */
    public static final Rules DEFAULTS = new Rules(true, 2, 6, 3, 2.0);

    /**
     * One result of the measurand, in round order.
     *
     * @param roundCode       the round
     * @param zLike           the z-like score used (z or z′), null when none
     * @param verdict         the result's classification, null when not scored
     * @param informationOnly a score for information only (skipped)
     */
    public record Point(String roundCode, Double zLike, Verdict verdict, boolean informationOnly) {
    }

    /**
     * A warning.
     *
     * @param kind       which rule
     * @param measurand  the measurand's label (as given)
     * @param roundCode  the round whose result fired it
     * @param firstRound the first round of the run the rule saw
     * @param message    in words
     */
    public record Warning(Kind kind, String measurand, String roundCode, String firstRound, String message) {
        public String basis() {
            return BASIS;
        }

        /** A CSS class for the kind. */
        public String cssClass() {
            return "warning-" + kind.name().toLowerCase(java.util.Locale.ROOT).replace('_', '-');
        }
    }

    private final Rules rules;

    public EarlyWarnings(Rules rules) {
        this.rules = rules;
    }

    /** The warnings of one measurand's results {@code points} (oldest first). */
    public List<Warning> evaluate(String measurand, List<Point> points) {
        List<Warning> out = new ArrayList<>();
        List<Point> scored = points.stream().filter(p -> !p.informationOnly() && (p.verdict() != null || p.zLike() != null))
                .toList();
        int questionable = 0;
        int sign = 0;
        int signRun = 0;
        int rising = 1;
        for (int i = 0; i < scored.size(); i++) {
            Point p = scored.get(i);
            if (rules.unsatisfactory() && p.verdict() == Verdict.UNSATISFACTORY) {
                out.add(new Warning(Kind.UNSATISFACTORY, measurand, p.roundCode(), p.roundCode(),
                        measurand + ": unsatisfactory in round " + p.roundCode() + "."));
            }
            questionable = p.verdict() == Verdict.QUESTIONABLE ? questionable + 1 : 0;
            if (rules.questionable() && questionable == rules.questionableInARow()) {
                out.add(new Warning(Kind.QUESTIONABLE_IN_A_ROW, measurand, p.roundCode(),
                        scored.get(i - questionable + 1).roundCode(), measurand + ": " + questionable
                        + " questionable results in a row, the last in round " + p.roundCode() + "."));
                questionable = 0; // the next run starts afresh
            }
            int s = p.zLike() == null ? 0 : (int) Math.signum(p.zLike());
            if (p.zLike() == null) {
                continue; // a classified result without a z-like score (En only) neither extends nor breaks a run
            }
            signRun = s != 0 && s == sign ? signRun + 1 : (s == 0 ? 0 : 1);
            sign = s;
            if (rules.bias() && signRun == rules.sameSignRun()) {
                out.add(new Warning(Kind.BIAS, measurand, p.roundCode(), zRound(scored, i, signRun),
                        measurand + ": " + signRun + " scores in a row " + (s > 0 ? "above" : "below")
                        + " the assigned value, the last in round " + p.roundCode() + "."));
            }
            Double previous = previousZ(scored, i);
            rising = previous != null && Math.abs(p.zLike()) > Math.abs(previous) ? rising + 1 : 1;
            if (rules.drift() && rising >= rules.driftRounds() && Math.abs(p.zLike()) >= rules.driftLimit()) {
                out.add(new Warning(Kind.DRIFT, measurand, p.roundCode(), zRound(scored, i, rules.driftRounds()),
                        measurand + ": |z| increased over " + rules.driftRounds() + " rounds in a row to "
                        + String.format(java.util.Locale.ROOT, "%.2f", Math.abs(p.zLike())) + " in round "
                        + p.roundCode() + "."));
            }
        }
        return out;
    }

    /** The z-like score of the scored result before {@code i} that has one, or null. */
    private static Double previousZ(List<Point> scored, int i) {
        for (int j = i - 1; j >= 0; j--) {
            if (scored.get(j).zLike() != null) {
                return scored.get(j).zLike();
            }
        }
        return null;
    }

    /** The round of the {@code length}-th z-like score counting back from {@code i} (inclusive). */
    private static String zRound(List<Point> scored, int i, int length) {
        int seen = 0;
        for (int j = i; j >= 0; j--) {
            if (scored.get(j).zLike() != null && ++seen == length) {
                return scored.get(j).roundCode();
            }
        }
        return scored.get(i).roundCode();
    }
}
