package org.roundtable.statistics.score;

/**
 * Where the classification bands of a z-like score (z, z′, ζ) end: the two conventions differ only at exactly
 * |s| = 2 and |s| = 3.
 *
 * <p>Definition (applied to the score as printed: {@link #classifyAsPrinted} rounds it half away from zero to the
 * plan's score decimals first, so a printed "2.00" is always on the boundary and its verdict never disagrees with
 * the printed number):
 * <ul>
 * <li>{@link #SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3}: {@code |s| ≤ 2} satisfactory, {@code 2 < |s| < 3}
 * questionable, {@code |s| ≥ 3} unsatisfactory — the bands of ISO/IEC 17043:2010 Annex B (B.4.1.1) and
 * ISO 13528:2015 9.3, and {@link Scores#classifyZ}.</li>
 * <li>{@link #SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3}: {@code |s| < 2} satisfactory,
 * {@code 2 ≤ |s| ≤ 3} questionable, {@code |s| > 3} unsatisfactory — a convention some schemes state in
 * their plan (common practice, no source).</li>
 * </ul>
 *
 * <p>Special cases: a score of exactly 2.0 is satisfactory under the first rule and questionable under the
 * second; exactly 3.0 is unsatisfactory under the first and questionable under the second.
 *
 * @throws IllegalArgumentException ({@link #classify}) if the score is not finite
 *
 * <p>References: ISO/IEC 17043:2010, Annex B (B.4.1.1); ISO 13528:2015, 9.3 and 9.4.
 */
public enum BoundaryRule {
    /** |s| ≤ 2 satisfactory, 2 &lt; |s| &lt; 3 questionable, |s| ≥ 3 unsatisfactory (the default). */
    SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3,
    /** |s| &lt; 2 satisfactory, 2 ≤ |s| ≤ 3 questionable, |s| &gt; 3 unsatisfactory. */
    SATISFACTORY_BELOW_2_UNSATISFACTORY_ABOVE_3;

    /** The rule used unless a plan says otherwise. */
    public static final BoundaryRule DEFAULT = SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3;

    /**
     * Classifies a z, z′ or ζ score as printed: the score rounded half away from zero to {@code decimals} decimals
     * (starting from the shortest decimal form of the double, as {@link Scores#asPrinted} does), then compared with
     * the band limits exactly in decimal.
     *
     * @throws IllegalArgumentException if the score is not finite or decimals is negative
     */
    public Classification classifyAsPrinted(double score, int decimals) {
        return classify(Scores.asPrinted(score, decimals).doubleValue());
    }

    /**
     * Classifies an unrounded z, z′ or ζ score under this rule (exact comparison of the double with 2 and 3).
     *
     * @throws IllegalArgumentException if the score is not finite
     */
    public Classification classify(double score) {
        if (this == SATISFACTORY_TO_2_UNSATISFACTORY_FROM_3) {
            return Scores.classifyZ(score);
        }
        if (!Double.isFinite(score)) {
            throw new IllegalArgumentException("score must be finite, got " + score);
        }
        double a = Math.abs(score);
        if (a < Scores.Z_SATISFACTORY_LIMIT) {
            return Classification.SATISFACTORY;
        }
        return a <= Scores.Z_UNSATISFACTORY_LIMIT ? Classification.QUESTIONABLE : Classification.UNSATISFACTORY;
    }
}
