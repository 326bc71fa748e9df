package org.roundtable.statistics.robust;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;
import net.jqwik.api.constraints.Scale;
import org.roundtable.statistics.score.Scores;

/**
 * Property tests (jqwik, fixed seeds): equivariance and invariance of the robust estimators,
 * bounded influence of one outlier, unit invariance of z. Data are normal samples of 10 to 60
 * values drawn from a seeded {@link Random}.
 */
class RobustPropertiesTest {

    @Provide
    Arbitrary<double[]> samples() {
        return Arbitraries.longs().flatMap(seed -> Arbitraries.integers().between(10, 60).map(n -> {
            Random r = new Random(seed);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = 18.0 + 0.05 * r.nextGaussian();
            }
            return x;
        }));
    }

    @Property(tries = 200, seed = "4711")
    void shiftingTheDataShiftsLocationAndKeepsScale(@ForAll("samples") double[] x,
            @ForAll @DoubleRange(min = -100, max = 100) double shift) {
        double[] y = Arrays.stream(x).map(v -> v + shift).toArray();
        AlgorithmA.Result a = AlgorithmA.fullConvergence().evaluate(x);
        AlgorithmA.Result b = AlgorithmA.fullConvergence().evaluate(y);
        assertEquals(Median.of(x) + shift, Median.of(y), 1e-9);
        assertEquals(a.robustMean() + shift, b.robustMean(), 1e-8);
        assertEquals(a.robustSd(), b.robustSd(), 1e-8);
        assertEquals(ScaledMad.madE(x), ScaledMad.madE(y), 1e-9);
        assertEquals(NormalizedIqr.of(x), NormalizedIqr.of(y), 1e-9);
    }

    @Property(tries = 200, seed = "4712")
    void scalingTheDataScalesLocationAndScale(@ForAll("samples") double[] x,
            @ForAll @DoubleRange(min = 1e-3, max = 1e3) @Scale(6) double factor) {
        double[] y = Arrays.stream(x).map(v -> v * factor).toArray();
        AlgorithmA.Result a = AlgorithmA.fullConvergence().evaluate(x);
        AlgorithmA.Result b = AlgorithmA.fullConvergence().evaluate(y);
        assertEquals(a.robustMean() * factor, b.robustMean(), 1e-9 * Math.abs(b.robustMean()));
        assertEquals(a.robustSd() * factor, b.robustSd(), 1e-7 * b.robustSd());
        assertEquals(ScaledMad.madE(x) * factor, ScaledMad.madE(y), 1e-7 * ScaledMad.madE(y));
        assertEquals(NormalizedIqr.of(x) * factor, NormalizedIqr.of(y), 1e-7 * NormalizedIqr.of(y));
    }

    @Property(tries = 200, seed = "4713")
    void permutingTheDataChangesNothing(@ForAll("samples") double[] x, @ForAll long seed) {
        double[] y = x.clone();
        Random r = new Random(seed);
        for (int i = y.length - 1; i > 0; i--) {
            int j = r.nextInt(i + 1);
            double t = y[i];
            y[i] = y[j];
            y[j] = t;
        }
        AlgorithmA.Result a = AlgorithmA.fullConvergence().evaluate(x);
        AlgorithmA.Result b = AlgorithmA.fullConvergence().evaluate(y);
        assertEquals(a.robustMean(), b.robustMean(), 0.0);
        assertEquals(a.robustSd(), b.robustSd(), 0.0);
        assertEquals(Median.of(x), Median.of(y), 0.0);
        assertEquals(ScaledMad.madE(x), ScaledMad.madE(y), 0.0);
    }

    @Property(tries = 200, seed = "4714")
    void oneWildOutlierMovesTheRobustMeanOnlyBoundedly(@ForAll("samples") double[] x,
            @ForAll @DoubleRange(min = 1e3, max = 1e9) double wild) {
        AlgorithmA.Result clean = AlgorithmA.fullConvergence().evaluate(x);
        double[] y = x.clone();
        y[0] = wild;
        AlgorithmA.Result dirty = AlgorithmA.fullConvergence().evaluate(y);
        int p = x.length;
        // Winsorising at x* + 1.5 s* bounds the influence of one value on the mean to about
        // 1.5 s*/p plus the removed value's own share; allow a generous 3 s* (p >= 10).
        assertTrue(Math.abs(dirty.robustMean() - clean.robustMean()) <= 3 * clean.robustSd(),
                () -> "x* moved from " + clean.robustMean() + " to " + dirty.robustMean());
        assertTrue(dirty.robustSd() <= 2 * clean.robustSd(),
                () -> "s* grew from " + clean.robustSd() + " to " + dirty.robustSd());
        assertTrue(Math.abs(Median.of(y) - Median.of(x)) <= (Arrays.stream(x).max().getAsDouble()
                - Arrays.stream(x).min().getAsDouble()) / 2);
        assertTrue(p >= 10);
    }

    @Property(tries = 200, seed = "4718")
    void aHugeLowOutlierDoesNotSpoilTheSums(@ForAll("samples") double[] x,
            @ForAll @DoubleRange(min = 1e6, max = 1e12) double wild) {
        AlgorithmA.Result clean = AlgorithmA.fullConvergence().evaluate(Arrays.copyOfRange(x, 1, x.length));
        double[] y = x.clone();
        y[0] = -wild;
        double[] z = x.clone();
        z[0] = -1000;
        // the result must not depend on how far away the clipped value is
        AlgorithmA.Result far = AlgorithmA.fullConvergence().evaluate(y);
        AlgorithmA.Result near = AlgorithmA.fullConvergence().evaluate(z);
        assertEquals(near.robustMean(), far.robustMean(), 1e-9 * clean.robustSd());
        assertEquals(near.robustSd(), far.robustSd(), 1e-9 * clean.robustSd());
    }

    @Property(tries = 500, seed = "4719")
    void madEqualsTheMedianOfAbsoluteDeviationsComputedNaively(@ForAll("lumpy") double[] x) {
        double m = Median.of(x);
        double[] dev = Arrays.stream(x).map(v -> Math.abs(v - m)).toArray();
        assertEquals(Median.of(dev), ScaledMad.mad(x), 0.0);
    }

    /** Small integer-valued samples with many ties, 1 to 30 values. */
    @Provide
    Arbitrary<double[]> lumpy() {
        return Arbitraries.integers().between(-5, 5).map(i -> (double) i).array(double[].class).ofMinSize(1).ofMaxSize(30);
    }

    @Property(tries = 200, seed = "4715")
    void zScoresDoNotDependOnTheUnit(@ForAll @DoubleRange(min = 0.001, max = 100) @Scale(6) double result,
            @ForAll @DoubleRange(min = 0.001, max = 100) @Scale(6) double assigned,
            @ForAll @DoubleRange(min = 1e-4, max = 10) @Scale(6) double sigma,
            @ForAll @IntRange(min = 0, max = 3) int unit) {
        // % m/m -> g/kg (x10), mg/kg (x1e4), ug/kg (x1e7), itself (x1)
        double factor = new double[] {1, 10, 1e4, 1e7}[unit];
        double z = Scores.z(result, assigned, sigma).getAsDouble();
        double zConverted = Scores.z(result * factor, assigned * factor, sigma * factor).getAsDouble();
        assertEquals(z, zConverted, 1e-9 * Math.max(1, Math.abs(z)));
    }

    @Property(tries = 50, seed = "4716")
    void allEqualValuesNeverGiveAScale(@ForAll @DoubleRange(min = -1e6, max = 1e6) double value,
            @ForAll @IntRange(min = 2, max = 40) int n) {
        double[] x = new double[n];
        Arrays.fill(x, value);
        AlgorithmA.Result r = AlgorithmA.fullConvergence().evaluate(x);
        assertTrue(!r.scaleEstimable());
        assertEquals(value, r.robustMean(), 0.0);
        assertEquals(0.0, ScaledMad.madE(x), 0.0);
        assertEquals(0.0, NormalizedIqr.of(x), 0.0);
    }

    @Property(tries = 100, seed = "4717")
    void algorithmAConvergesAndStaysBetweenTheExtremes(@ForAll("samples") double[] x) {
        AlgorithmA.Result r = AlgorithmA.fullConvergence().evaluate(x);
        assertTrue(r.converged());
        assertTrue(r.robustMean() >= Arrays.stream(x).min().getAsDouble());
        assertTrue(r.robustMean() <= Arrays.stream(x).max().getAsDouble());
        assertTrue(r.robustSd() > 0);
    }
}
