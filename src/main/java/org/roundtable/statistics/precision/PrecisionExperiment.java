package org.roundtable.statistics.precision;

import java.util.ArrayList;
import java.util.List;
import org.roundtable.statistics.StatisticsWarning;

/**
 * Repeatability and reproducibility of a measurement method from one level of an
 * interlaboratory precision experiment (ISO 5725-2).
 *
 * <p>Definition: laboratory i has n_i results with cell mean ȳ_i and cell SD s_i.
 * {@code s_r² = Σ(n_i − 1)s_i²/Σ(n_i − 1)} (= MS_within);
 * {@code s_d² = Σn_i(ȳ_i − ȳ)²/(p − 1)} (= MS_between), ȳ weighted by n_i;
 * {@code n̄ = [Σn_i − Σn_i²/Σn_i]/(p − 1)};
 * {@code s_L² = (s_d² − s_r²)/n̄}, set to 0 when negative; {@code s_R² = s_L² + s_r²};
 * limits {@code r = 2.8·s_r}, {@code R = 2.8·s_R}.
 *
 * <p>Symbols: p laboratories; 2.8 ≈ 1.96·√2 (ISO 5725-6).
 *
 * <p>Special cases: a negative s_L² is clamped to 0 and a {@code negative-between-variance}
 * warning is attached.
 *
 * @throws IllegalArgumentException fewer than 2 laboratories, an empty cell, no replication,
 *                                  or a non-finite value
 *
 * <p>References: ISO 5725-2:1994, Accuracy (trueness and precision) of measurement methods and
 * results — Part 2, clause 7.4 (formulas 7.4.4 to 7.4.5, from memory); ISO 5725-6:1994, 4.1.4
 * (factor 2.8).
 */
public final class PrecisionExperiment {

    /** Factor of the repeatability and reproducibility limits (≈ 1.96·√2). */
    public static final double LIMIT_FACTOR = 2.8;

    /**
     * Precision statistics of one level.
     *
     * @param repeatabilitySd         s_r
     * @param betweenLaboratoryVariance s_L² (after clamping)
     * @param betweenLaboratorySd     s_L
     * @param reproducibilitySd       s_R
     * @param repeatabilityLimit      r = 2.8·s_r
     * @param reproducibilityLimit    R = 2.8·s_R
     * @param meanCellSize            n̄
     * @param anova                   the underlying ANOVA table
     */
    public record Result(double repeatabilitySd, double betweenLaboratoryVariance,
            double betweenLaboratorySd, double reproducibilitySd, double repeatabilityLimit,
            double reproducibilityLimit, double meanCellSize, OneWayAnova.Result anova,
            List<StatisticsWarning> warnings) {

        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    private PrecisionExperiment() {
    }

    /** Evaluates cells (one array of results per laboratory). */
    public static Result of(double[][] cells) {
        OneWayAnova.Result a = OneWayAnova.of(cells);
        int p = cells.length;
        double sum = 0;
        double sumSquares = 0;
        for (int n : a.groupSizes()) {
            sum += n;
            sumSquares += (double) n * n;
        }
        double nBar = (sum - sumSquares / sum) / (p - 1);
        double sr2 = a.msWithin();
        double sL2 = (a.msBetween() - sr2) / nBar;
        List<StatisticsWarning> warnings = new ArrayList<>();
        if (sL2 < 0) {
            warnings.add(new StatisticsWarning("negative-between-variance", "s_d^2 < s_r^2:"
                    + " the between-laboratory variance estimate was negative and is set to 0"));
            sL2 = 0;
        }
        double sr = Math.sqrt(sr2);
        double sR = Math.sqrt(sL2 + sr2);
        return new Result(sr, sL2, Math.sqrt(sL2), sR, LIMIT_FACTOR * sr, LIMIT_FACTOR * sR, nBar, a, warnings);
    }
}
