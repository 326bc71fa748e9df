package org.roundtable.report.benchmark;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.roundtable.report.SampleRoundBuilder;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.report.render.RenderProgress;

/**
 * Wall-clock time of the round-report PDF for 30 participants × 50 measurands and for 1,000
 * participants × 50 measurands (issue 8: &lt; 2 s and &lt; 30 s).
 *
 * <p>A plain benchmark rather than JMH: one render of the large report takes seconds, so the
 * figure of interest is the time of a single cold-ish run after a warm-up, as the server's
 * background job would see it. Each size is rendered {@value #WARMUPS} times to warm up, then
 * {@value #RUNS} times; the median of the runs is reported. Models are built before timing
 * (seeded, invented data). Results go to {@code target/benchmarks/reports.json} as
 * {@code {"smallPdfSeconds": ..., "largePdfSeconds": ...}}.
 *
 * <p>Also prints the CPU time of the rendering thread, which is the better figure on a machine
 * shared with other work.
 *
 * <p>Run: {@code mvn -Pbenchmark verify} (after the statistics benchmarks), or on its own with
 * {@code mvn -Pbenchmark verify -Djmh.skip=true}.
 */
public final class ReportPdfBenchmark {

    static final int WARMUPS = 2;
    static final int RUNS = 3;

    private ReportPdfBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        Path output = Path.of(args.length > 0 ? args[0] : "target/benchmarks/reports.json");
        RoundReport small = SampleRoundBuilder.synthetic(30, 50).build();
        RoundReport large = SampleRoundBuilder.synthetic(1000, 50).build();
        double smallSeconds = time("30 labs x 50 measurands", small, WARMUPS, RUNS);
        double largeSeconds = time("1000 labs x 50 measurands", large, 1, RUNS);
        // issuing a round renders one laboratory report per participant besides the round report
        String code = large.measurands().get(0).results().get(0).participantCode();
        long start = System.nanoTime();
        new PdfReportRenderer().render(new LaboratoryReport(large, code), OutputStream.nullOutputStream(), RenderProgress.NONE);
        double laboratorySeconds = (System.nanoTime() - start) / 1e9;
        System.out.printf(Locale.ROOT, "one laboratory report of the 1000 x 50 round: %.3f s wall (one run)%n", laboratorySeconds);
        Files.createDirectories(output.toAbsolutePath().getParent());
        String json = String.format(Locale.ROOT, "{\"smallPdfSeconds\": %.3f, \"largePdfSeconds\": %.3f, "
                        + "\"largeLaboratoryPdfSeconds\": %.3f}%n", smallSeconds, largeSeconds, laboratorySeconds);
        Files.writeString(output, json, StandardCharsets.UTF_8);
        System.out.print(json);
    }

    private static double time(String label, RoundReport report, int warmups, int runs) {
        PdfReportRenderer renderer = new PdfReportRenderer();
        for (int i = 0; i < warmups; i++) {
            renderer.render(report, OutputStream.nullOutputStream(), RenderProgress.NONE);
        }
        double[] seconds = new double[runs];
        double[] cpuSeconds = new double[runs];
        long bytes = 0;
        java.lang.management.ThreadMXBean threads = java.lang.management.ManagementFactory.getThreadMXBean();
        for (int i = 0; i < runs; i++) {
            CountingStream counter = new CountingStream();
            long cpuStart = threads.getCurrentThreadCpuTime();
            long start = System.nanoTime();
            renderer.render(report, counter, RenderProgress.NONE);
            seconds[i] = (System.nanoTime() - start) / 1e9;
            cpuSeconds[i] = (threads.getCurrentThreadCpuTime() - cpuStart) / 1e9;
            bytes = counter.count;
        }
        java.util.Arrays.sort(seconds);
        java.util.Arrays.sort(cpuSeconds);
        double median = seconds[runs / 2];
        System.out.printf(Locale.ROOT, "%s: median %.3f s wall (min %.3f, max %.3f), median %.3f s CPU of the "
                + "rendering thread, %d bytes%n", label, median, seconds[0], seconds[runs - 1], cpuSeconds[runs / 2], bytes);
        return median;
    }

    private static final class CountingStream extends OutputStream {
        long count;

        @Override
        public void write(int b) {
            count++;
        }

        @Override
        public void write(byte[] b, int off, int len) {
            count += len;
        }
    }
}
