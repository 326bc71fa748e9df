package org.roundtable.statistics.score;

import java.util.OptionalDouble;

/**
 * Performance scores of one result against an assigned value, and their classification.
 *
 * <p>Definitions (x result, x_pt assigned value):
 * <ul>
 * <li>{@code D = x − x_pt}; {@code D% = 100·(x − x_pt)/x_pt};</li>
 * <li>{@code z = (x − x_pt)/σ_pt};</li>
 * <li>{@code z′ = (x − x_pt)/sqrt(σ_pt² + u²(x_pt))};</li>
 * <li>{@code ζ = (x − x_pt)/sqrt(u²(x) + u²(x_pt))};</li>
 * <li>{@code En = (x − x_pt)/sqrt(U²(x) + U²(x_pt))}.</li>
 * </ul>
 *
 * <p>Symbols: σ_pt standard deviation for proficiency assessment; u standard uncertainty; U
 * expanded uncertainty (normally k = 2). A reported U with its k gives u = U/k.
 *
 * <p>Special cases: a score whose inputs are missing (NaN) or not finite, or whose denominator is
 * zero, is "not scored": {@link OptionalDouble#empty()}, never NaN or ±∞. Negative uncertainties
 * or σ_pt are not scored either. Positive scores mean the result is high.
 *
 * <p>Classification (our rule, stated in every plan and report): scores are classified <b>as
 * printed</b> — rounded half away from zero to the plan's score decimals (default 2,
 * {@link #DEFAULT_SCORE_DECIMALS}), then compared exactly: z, z′, ζ {@code |s| ≤ 2} satisfactory,
 * {@code 2 < |s| < 3} questionable, {@code |s| ≥ 3} unsatisfactory (or the other
 * {@link BoundaryRule}); En {@code |En| ≤ 1} satisfactory, otherwise unsatisfactory. A printed
 * score and its verdict therefore never disagree, and binary noise (2.0000000000000018 from
 * (0.160 − 0.150)/0.005) cannot move a verdict. The bare {@link #classifyZ(double)} and
 * {@link #classifyEn(double)} compare the unrounded double and remain for callers that have
 * already rounded.
 *
 * <p>ζ and En are biased towards zero when x_pt is a consensus that includes the participant's
 * own result (the correlation is ignored); the caller warns (see
 * {@code MeasurandEvaluation}).
 *
 * <p>References: ISO 13528:2015, clause 9 (9.2 to 9.7: D, z, z′, ζ, En); ISO/IEC 17043:2010,
 * Annex B (B.4.1.1, classification bands).
 */
public final class Scores {

    /** |z| at or below this is satisfactory. */
    public static final double Z_SATISFACTORY_LIMIT = 2.0;
    /** |z| at or above this is unsatisfactory. */
    public static final double Z_UNSATISFACTORY_LIMIT = 3.0;
    /** |En| at or below this is satisfactory. */
    public static final double EN_SATISFACTORY_LIMIT = 1.0;
    /** Score decimals when a plan sets none (the printed form scores are classified by). */
    public static final int DEFAULT_SCORE_DECIMALS = 2;

    private Scores() {
    }

    /** Difference {@code D = x − x_pt}; empty when an input is not finite. */
    public static OptionalDouble difference(double result, double assigned) {
        return finite(result - assigned);
    }

    /** Percentage difference {@code D% = 100·(x − x_pt)/x_pt}; empty when x_pt = 0. */
    public static OptionalDouble percentDifference(double result, double assigned) {
        if (assigned == 0) {
            return OptionalDouble.empty();
        }
        return finite(100 * (result - assigned) / assigned);
    }

    /** z-score; empty when σ_pt is not &gt; 0 or an input is not finite. */
    public static OptionalDouble z(double result, double assigned, double sigmaPt) {
        if (!(sigmaPt > 0)) {
            return OptionalDouble.empty();
        }
        return finite((result - assigned) / sigmaPt);
    }

    /** z′-score; empty when σ_pt or u(x_pt) is negative, the denominator 0, or an input not finite. */
    public static OptionalDouble zPrime(double result, double assigned, double sigmaPt,
            double assignedUncertainty) {
        if (!(sigmaPt >= 0 && assignedUncertainty >= 0)) {
            return OptionalDouble.empty();
        }
        return ratio(result - assigned, rootSumOfSquares(sigmaPt, assignedUncertainty));
    }

    /** ζ-score from standard uncertainties; empty when one is missing/negative or both are zero. */
    public static OptionalDouble zeta(double result, double assigned, double resultUncertainty,
            double assignedUncertainty) {
        if (!(resultUncertainty >= 0 && assignedUncertainty >= 0)) {
            return OptionalDouble.empty();
        }
        return ratio(result - assigned, rootSumOfSquares(resultUncertainty, assignedUncertainty));
    }

    /** En number from expanded uncertainties; empty when one is missing/negative or both are zero. */
    public static OptionalDouble en(double result, double assigned, double resultExpanded,
            double assignedExpanded) {
        return zeta(result, assigned, resultExpanded, assignedExpanded);
    }

    /**
     * Classification of a z, z′ or ζ score (unrounded): ≤ 2 satisfactory, &lt; 3 questionable,
     * otherwise unsatisfactory.
     *
     * @throws IllegalArgumentException if the score is not finite
     */
    public static Classification classifyZ(double score) {
        if (!Double.isFinite(score)) {
            throw new IllegalArgumentException("score must be finite, got " + score);
        }
        double a = Math.abs(score);
        if (a <= Z_SATISFACTORY_LIMIT) {
            return Classification.SATISFACTORY;
        }
        return a < Z_UNSATISFACTORY_LIMIT ? Classification.QUESTIONABLE : Classification.UNSATISFACTORY;
    }

    /**
     * Classification of an En number (unrounded): ≤ 1 satisfactory, otherwise unsatisfactory.
     *
     * @throws IllegalArgumentException if the score is not finite
     */
    public static Classification classifyEn(double en) {
        if (!Double.isFinite(en)) {
            throw new IllegalArgumentException("En must be finite, got " + en);
        }
        return Math.abs(en) <= EN_SATISFACTORY_LIMIT ? Classification.SATISFACTORY : Classification.UNSATISFACTORY;
    }

    /**
     * A score as printed: the shortest decimal form of the double ({@link java.math.BigDecimal#valueOf(double)})
     * rounded half away from zero to {@code decimals} decimals — the same rule as the product's number formats.
     *
     * @throws IllegalArgumentException if the score is not finite or decimals is negative
     */
    public static java.math.BigDecimal asPrinted(double score, int decimals) {
        if (!Double.isFinite(score)) {
            throw new IllegalArgumentException("score must be finite, got " + score);
        }
        if (decimals < 0) {
            throw new IllegalArgumentException("decimals must be >= 0, got " + decimals);
        }
        return java.math.BigDecimal.valueOf(score).setScale(decimals, java.math.RoundingMode.HALF_UP);
    }

    /**
     * Classification of an En number as printed: rounded to {@code decimals} decimals, then |En| ≤ 1.
     *
     * @throws IllegalArgumentException if the score is not finite or decimals is negative
     */
    public static Classification classifyEnAsPrinted(double en, int decimals) {
        return classifyEn(asPrinted(en, decimals).doubleValue());
    }

    /** Classification of a score of the given kind. */
    public static Classification classify(ScoreKind kind, double score) {
        return kind == ScoreKind.EN ? classifyEn(score) : classifyZ(score);
    }

    /**
     * sqrt(a² + b²). Plain squares instead of {@code Math.hypot} (several times slower): for
     * uncertainties of measured values neither overflow (&gt; 1e154) nor underflow (&lt; 1e-154)
     * is a practical concern, and an overflow would give +∞ and so "not scored", not a wrong
     * score.
     */
    private static double rootSumOfSquares(double a, double b) {
        return Math.sqrt(a * a + b * b);
    }

    private static OptionalDouble ratio(double numerator, double denominator) {
        if (!(denominator > 0)) {
            return OptionalDouble.empty();
        }
        return finite(numerator / denominator);
    }

    private static OptionalDouble finite(double value) {
        return Double.isFinite(value) ? OptionalDouble.of(value) : OptionalDouble.empty();
    }
}
