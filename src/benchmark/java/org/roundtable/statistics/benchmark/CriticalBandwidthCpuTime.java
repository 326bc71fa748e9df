package org.roundtable.statistics.benchmark;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import org.roundtable.statistics.density.CriticalBandwidth;
import org.roundtable.statistics.density.KernelDensity;

/**
 * The multimodality check of one measurand of 10,000 results from two populations (the data of
 * {@code StatisticsCoreBenchmark.criticalBandwidthTwoPopulations}), timed in the CPU time of its thread rather than
 * wall-clock time: on a shared machine whose load is many times its cores, JMH's wall-clock figure mostly measures
 * the waiting. Prints the best and the median of {@code ROUNDS} runs after a warm-up.
 *
 * <pre>java -cp target/test-classes:target/classes:&lt;test classpath&gt; \
 *     org.roundtable.statistics.benchmark.CriticalBandwidthCpuTime</pre>
 */
public final class CriticalBandwidthCpuTime {

    private static final int WARM_UP = 20;
    private static final int ROUNDS = 40;

    private CriticalBandwidthCpuTime() {
    }

    public static void main(String[] args) {
        StatisticsCoreBenchmark.TwoPopulations round = new StatisticsCoreBenchmark.TwoPopulations();
        round.setUp();
        ThreadMXBean threads = ManagementFactory.getThreadMXBean();
        long[] times = new long[ROUNDS];
        CriticalBandwidth.Result result = null;
        for (int i = -WARM_UP; i < ROUNDS; i++) {
            long start = threads.getCurrentThreadCpuTime();
            if (KernelDensity.of(round.values).modes().size() > 1) {
                result = CriticalBandwidth.test(round.values);
            }
            long spent = threads.getCurrentThreadCpuTime() - start;
            if (i >= 0) {
                times[i] = spent;
            }
        }
        java.util.Arrays.sort(times);
        System.out.printf(java.util.Locale.ROOT, "critical-bandwidth check, p = 10,000, two populations: best %.1f ms,"
                + " median %.1f ms CPU time per measurand (%d runs); %s%n", times[0] / 1e6, times[ROUNDS / 2] / 1e6,
                ROUNDS, result);
    }
}
