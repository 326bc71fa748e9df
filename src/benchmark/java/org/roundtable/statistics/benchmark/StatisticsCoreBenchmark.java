package org.roundtable.statistics.benchmark;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;
import org.roundtable.statistics.MeasurandEvaluation;
import org.roundtable.statistics.density.CriticalBandwidth;
import org.roundtable.statistics.density.KernelDensity;
import org.roundtable.statistics.robust.AlgorithmA;
import org.roundtable.statistics.robust.Median;
import org.roundtable.statistics.robust.NormalizedIqr;
import org.roundtable.statistics.robust.QuartileRule;
import org.roundtable.statistics.robust.ScaledMad;
import org.roundtable.statistics.robust.SortedCopy;
import org.roundtable.statistics.score.Scores;

/**
 * Evaluating 100 measurands × 10,000 participants. Scores are reported per value
 * (ns/value): each invocation handles 1,000,000 values.
 *
 * <p>Data: seeded normal results (mean 18, SD 0.05) with 2 % gross outliers (±0.5 to ±5),
 * demo data.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 3, time = 2)
@Fork(1)
public class StatisticsCoreBenchmark {

    static final int MEASURANDS = 100;
    static final int PARTICIPANTS = 10_000;
    static final int VALUES = MEASURANDS * PARTICIPANTS;
    static final double SIGMA_PT = 0.05;

    double[][] data;

    @Setup
    public void setUp() {
        data = demoData();
    }

    static double[][] demoData() {
        Random random = new Random(20261201L);
        double[][] values = new double[MEASURANDS][PARTICIPANTS];
        for (int m = 0; m < MEASURANDS; m++) {
            for (int i = 0; i < PARTICIPANTS; i++) {
                double v = 18 + 0.05 * random.nextGaussian();
                if (random.nextDouble() < 0.02) {
                    v += (random.nextBoolean() ? 1 : -1) * (0.5 + 4.5 * random.nextDouble());
                }
                values[m][i] = v;
            }
        }
        return values;
    }

    /**
     * The same data as {@link MeasurandEvaluation} inputs, in a state of its own so that the
     * million result records do not sit in the heap of the other benchmarks.
     */
    @State(Scope.Benchmark)
    public static class Rounds {
        List<MeasurandEvaluation.Input> inputs;

        @Setup
        public void setUp() {
            double[][] values = demoData();
            inputs = new ArrayList<>();
            for (int m = 0; m < MEASURANDS; m++) {
                List<MeasurandEvaluation.ParticipantResult> results = new ArrayList<>(PARTICIPANTS);
                for (int i = 0; i < PARTICIPANTS; i++) {
                    double v = values[m][i];
                    results.add(new MeasurandEvaluation.ParticipantResult("P" + i, Double.toString(v), v,
                            false, 0.1, 2.0, null));
                }
                inputs.add(new MeasurandEvaluation.Input("M" + m, "% m/m", results, null, null, SIGMA_PT));
            }
        }
    }

    /** Median + MAD + Algorithm A to 1e-10 + z of every value: the core of an evaluation. */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public void medianMadAlgorithmAAndZ(Blackhole bh) {
        AlgorithmA algorithm = AlgorithmA.fullConvergence();
        for (double[] x : data) {
            double[] sorted = SortedCopy.of(x);
            double median = Median.ofSorted(sorted);
            double mad = ScaledMad.madOfSorted(sorted, median);
            AlgorithmA.Result a = algorithm.evaluateSorted(sorted);
            double xpt = a.robustMean();
            double sum = 0;
            for (double v : x) {
                sum += Scores.z(v, xpt, SIGMA_PT).getAsDouble();
            }
            bh.consume(mad);
            bh.consume(sum);
            bh.consume(a.iterations());
        }
    }

    /** nIQR (sort + Hyndman–Fan type 7 quartiles) alone. */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public void normalizedIqr(Blackhole bh) {
        for (double[] x : data) {
            double[] sorted = SortedCopy.of(x);
            bh.consume(NormalizedIqr.ofSorted(sorted, QuartileRule.HYNDMAN_FAN_7));
        }
    }

    /** Radix-sorted copy alone (the floor of every median-based estimator). */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public void sortedCopyOnly(Blackhole bh) {
        for (double[] x : data) {
            bh.consume(SortedCopy.of(x)[PARTICIPANTS / 2]);
        }
    }

    /** {@code Arrays.sort} on a copy, for comparison. */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public void arraysSortOnly(Blackhole bh) {
        for (double[] x : data) {
            double[] sorted = x.clone();
            Arrays.sort(sorted);
            bh.consume(sorted[PARTICIPANTS / 2]);
        }
    }

    /**
     * The full {@link MeasurandEvaluation} (robust statistics, scores of every participant with
     * z, z′, ζ, En, plus the kernel-density mode check on a 512-point grid).
     */
    @Benchmark
    @OperationsPerInvocation(VALUES)
    public void fullMeasurandEvaluation(Rounds rounds, Blackhole bh) {
        for (MeasurandEvaluation.Input input : rounds.inputs) {
            bh.consume(MeasurandEvaluation.evaluate(input));
        }
    }

    /**
     * One measurand of 10,000 results from two populations (an equal mixture of two normal populations 4 SD apart,
     * seeded): the multimodality check as {@link MeasurandEvaluation} runs it — the plain kernel density's modes and,
     * since it shows two, Silverman's critical-bandwidth test with all 500 bootstrap samples. Reported in ms per
     * measurand (target ≤ 25 ms on one core).
     */
    @State(Scope.Benchmark)
    public static class TwoPopulations {
        double[] values;

        @Setup
        public void setUp() {
            Random random = new Random(20261202L);
            values = new double[PARTICIPANTS];
            for (int i = 0; i < PARTICIPANTS; i++) {
                values[i] = 18 + (i % 2 == 1 ? 4 * SIGMA_PT : 0) + SIGMA_PT * random.nextGaussian();
            }
        }
    }

    /** Plain density modes, then (two modes) the critical-bandwidth test: ms per measurand of 10,000 values. */
    @Benchmark
    @OutputTimeUnit(TimeUnit.MILLISECONDS)
    public void criticalBandwidthTwoPopulations(TwoPopulations round, Blackhole bh) {
        int modes = KernelDensity.of(round.values).modes().size();
        bh.consume(modes);
        if (modes > 1) {
            bh.consume(CriticalBandwidth.test(round.values));
        }
    }
}
