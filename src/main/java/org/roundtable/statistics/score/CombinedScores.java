package org.roundtable.statistics.score;

import java.util.List;
import org.hipparchus.distribution.continuous.ChiSquaredDistribution;

/**
 * Combined scores over rounds or measurands: rescaled sum (RSZ) and sum of squares (SSZ).
 *
 * <p>Definition: for m scores z_j of one kind, {@code RSZ = Σz_j/sqrt(m)} and
 * {@code SSZ = Σz_j²}. Under the null hypothesis (independent standard normal scores) RSZ is
 * N(0, 1) and judged like a z-score; SSZ follows χ²_m and is compared with its 0.95 and 0.99
 * quantiles (≤ 0.95 quantile satisfactory; ≤ 0.99 quantile questionable; beyond unsatisfactory).
 *
 * <p>Symbols: m number of scores.
 *
 * <p>Special cases: only scores of one kind (z, z′ or ζ) may be combined; En is not normally
 * distributed and is refused. z and z′ may be mixed in one series: a laboratory's history uses, per
 * result, the score its round used (z, or z′ where u(x_pt) &gt; 0.3·σpt), and both are standardised
 * against the same kind of standard deviation for proficiency assessment (z′ only widens it by
 * u(x_pt)); the mixed series is reported as kind z′ (note added for the history, common practice,
 * no source). ζ is never mixed with either. Caveat (carried in the result): the scores are assumed
 * independent — scores of correlated measurands (e.g. alloy components summing to 100 %) or
 * from the same method bias overstate significance; opposite signs cancel in RSZ; one bad
 * result is diluted; always show the individual scores.
 *
 * @throws IllegalArgumentException fewer than one score, mixed kinds, En, or a non-finite score
 *
 * <p>References: Thompson M., Wood R. (1993) The International Harmonized Protocol for the
 * proficiency testing of (chemical) analytical laboratories. Pure Appl. Chem. 65:2123–2144;
 * Thompson M., Ellison S.L.R., Wood R. (2006) Pure Appl. Chem. 78:145–196 (caution against
 * relying on combined scores, from memory).
 */
public final class CombinedScores {

    /** Caveat printed with every combined score. */
    public static final String CORRELATION_CAVEAT = "Combined scores assume independent scores;"
            + " correlated measurands or a common method bias make them misleading, opposite signs"
            + " cancel in RSZ and one bad result is diluted. Read them with the individual scores.";

    /** A score with its kind. */
    public record Score(ScoreKind kind, double value) {
    }

    /**
     * RSZ and SSZ with their judgement.
     *
     * @param kind               kind of the combined scores
     * @param count              m
     * @param rescaledSum        RSZ
     * @param sumOfSquares       SSZ
     * @param chiSquared95       χ²_{m, 0.95}
     * @param chiSquared99       χ²_{m, 0.99}
     * @param rescaledSumClass   RSZ judged like a z-score
     * @param sumOfSquaresClass  SSZ against the χ² quantiles
     * @param caveat             {@link #CORRELATION_CAVEAT}
     */
    public record Result(ScoreKind kind, int count, double rescaledSum, double sumOfSquares,
            double chiSquared95, double chiSquared99, Classification rescaledSumClass,
            Classification sumOfSquaresClass, String caveat) {
    }

    private CombinedScores() {
    }

    /** Combines scores (see class comment). */
    public static Result combine(List<Score> scores) {
        if (scores == null || scores.isEmpty()) {
            throw new IllegalArgumentException("combined scores need at least one score");
        }
        ScoreKind kind = scores.get(0).kind();
        if (kind == ScoreKind.EN) {
            throw new IllegalArgumentException("En numbers are not combined");
        }
        double[] values = new double[scores.size()];
        for (int i = 0; i < values.length; i++) {
            Score s = scores.get(i);
            if (s.kind() != kind && !(zLike(kind) && zLike(s.kind()))) {
                throw new IllegalArgumentException("only scores of one kind are combined: found "
                        + kind + " and " + s.kind());
            }
            values[i] = s.value();
        }
        boolean mixed = scores.stream().anyMatch(s -> s.kind() != kind);
        return combine(mixed ? ScoreKind.Z_PRIME : kind, values);
    }

    private static boolean zLike(ScoreKind kind) {
        return kind == ScoreKind.Z || kind == ScoreKind.Z_PRIME;
    }

    /** Combines scores of one kind given as bare numbers. */
    public static Result combine(ScoreKind kind, double[] scores) {
        if (kind == ScoreKind.EN) {
            throw new IllegalArgumentException("En numbers are not combined");
        }
        org.roundtable.statistics.Checks.requireFinite(scores, 1, "combined scores");
        int m = scores.length;
        double sum = 0;
        double squares = 0;
        for (double z : scores) {
            sum += z;
            squares += z * z;
        }
        double rsz = sum / Math.sqrt(m);
        ChiSquaredDistribution chi = new ChiSquaredDistribution(m);
        double q95 = chi.inverseCumulativeProbability(0.95);
        double q99 = chi.inverseCumulativeProbability(0.99);
        Classification ssz = squares <= q95 ? Classification.SATISFACTORY
                : squares <= q99 ? Classification.QUESTIONABLE : Classification.UNSATISFACTORY;
        return new Result(kind, m, rsz, squares, q95, q99, Scores.classifyZ(rsz), ssz, CORRELATION_CAVEAT);
    }
}
