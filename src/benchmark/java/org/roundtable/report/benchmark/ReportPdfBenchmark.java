package org.roundtable.report.benchmark;

import java.io.IOException;
import java.io.OutputStream;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.roundtable.report.SampleRoundBuilder;
import org.roundtable.report.model.LaboratoryReport;
import org.roundtable.report.model.ParticipantResult;
import org.roundtable.report.model.RoundReport;
import org.roundtable.report.render.PdfReportRenderer;
import org.roundtable.report.render.RenderProgress;

/**
 * Time of the report PDFs: the round report for 30 participants × 50 measurands and for 1,000
 * participants × 50 measurands (issue 8: &lt; 2 s and &lt; 30 s), and the laboratory reports of the
 * large round, which issuing a round renders once per participant.
 *
 * <p>A plain benchmark rather than JMH: one render of the large report takes seconds, so the
 * figure of interest is the time of a single cold-ish run after a warm-up, as the server's
 * background job would see it. Models are built before timing (seeded, invented data). Every figure
 * is given as wall-clock time and as CPU time of the rendering thread; on a machine shared with
 * other work the CPU time is the better guide to the time on an idle core.
 * <ul>
 *   <li>Round reports: each size is rendered {@value #WARMUPS} times (large: once) to warm up, then
 *       {@value #RUNS} times with a new renderer each (no chart data kept from earlier runs); the
 *       median is reported.</li>
 *   <li>Laboratory reports of the large round: one renderer for all of them, as the issue job uses
 *       (chart data computed once per measurand and kept). The first report (which computes the chart
 *       data) is timed on its own; then {@value #RUNS} reports (median) and {@value #BATCH} further
 *       reports (total). Issuing all {@code n} laboratory reports is estimated as the first report plus
 *       (n − 1) × the mean of the batch.</li>
 * </ul>
 * Results go to {@code target/benchmarks/reports.json}.
 *
 * <p>Run: {@code mvn -Pbenchmark verify} (after the statistics benchmarks), on its own with
 * {@code mvn -Pbenchmark verify -Djmh.skip=true}, or only this timing with
 * {@code mvn -o -Pbenchmark test-compile exec:exec@run-report-benchmark}.
 */
public final class ReportPdfBenchmark {

    static final int WARMUPS = 2;
    static final int RUNS = 3;
    static final int BATCH = 20;
    static final int POOL_BATCH = 40;

    private static final ThreadMXBean THREADS = ManagementFactory.getThreadMXBean();

    private ReportPdfBenchmark() {
    }

    /** Wall-clock and CPU seconds of one measurement. */
    record Timing(double wall, double cpu) {
    }

    public static void main(String[] args) throws IOException {
        Path output = Path.of(args.length > 0 ? args[0] : "target/benchmarks/reports.json");
        RoundReport small = SampleRoundBuilder.synthetic(30, 50).build();
        RoundReport large = SampleRoundBuilder.synthetic(1000, 50).build();
        Timing smallRound = timeRound("30 labs x 50 measurands", small, WARMUPS, RUNS);
        Timing largeRound = timeRound("1000 labs x 50 measurands", large, 1, RUNS);

        // laboratory reports of the large round, one renderer as in the issue job
        List<String> codes = large.measurands().get(0).results().stream().map(ParticipantResult::participantCode)
                .toList();
        PdfReportRenderer renderer = new PdfReportRenderer();
        int next = 0;
        Timing first = time(() -> renderLaboratory(renderer, large, codes.get(0)));
        next++;
        double[] wall = new double[RUNS];
        double[] cpu = new double[RUNS];
        for (int i = 0; i < RUNS; i++) {
            String code = codes.get(next++);
            Timing t = time(() -> renderLaboratory(renderer, large, code));
            wall[i] = t.wall();
            cpu[i] = t.cpu();
        }
        Arrays.sort(wall);
        Arrays.sort(cpu);
        Timing laboratory = new Timing(wall[RUNS / 2], cpu[RUNS / 2]);
        int from = next;
        Timing batch = time(() -> {
            for (int i = 0; i < BATCH; i++) {
                renderLaboratory(renderer, large, codes.get(from + i));
            }
        });
        int participants = codes.size();
        Timing all = new Timing(first.wall() + (participants - 1) * batch.wall() / BATCH,
                first.cpu() + (participants - 1) * batch.cpu() / BATCH);
        System.out.printf(Locale.ROOT, "laboratory reports of the 1000 x 50 round: first (computes the chart data) "
                        + "%.3f s wall, %.3f s CPU; median of %d: %.3f s wall, %.3f s CPU; %d more: %.3f s wall, "
                        + "%.3f s CPU in all; all %d estimated at %.0f s wall, %.0f s CPU%n",
                first.wall(), first.cpu(), RUNS, laboratory.wall(), laboratory.cpu(), BATCH, batch.wall(), batch.cpu(),
                participants, all.wall(), all.cpu());

        // issuing on the render pool (PDF and HTML of each laboratory report, as the issue job does): a batch on
        // one worker and on two, fresh renderers each, the same reports
        List<String> pooled = codes.subList(from + BATCH, from + BATCH + POOL_BATCH);
        Timing oneWorker = timePool(1, large, pooled);
        Timing twoWorkers = timePool(2, large, pooled);
        double speedup = oneWorker.wall() / twoWorkers.wall();
        double issueRoundSeconds = largeRound.wall() + participants * twoWorkers.wall() / POOL_BATCH;
        System.out.printf(Locale.ROOT, "%d laboratory reports (PDF + HTML): one worker %.2f s, two workers %.2f s,"
                + " speed-up %.2f; issuing the 1000 x 50 round estimated at %.0f s%n", POOL_BATCH, oneWorker.wall(),
                twoWorkers.wall(), speedup, issueRoundSeconds);

        Files.createDirectories(output.toAbsolutePath().getParent());
        String json = String.format(Locale.ROOT, "{\"smallPdfSeconds\": %.3f, \"largePdfSeconds\": %.3f, "
                        + "\"smallPdfCpuSeconds\": %.3f, \"largePdfCpuSeconds\": %.3f, "
                        + "\"largeLaboratoryPdfSeconds\": %.3f, \"largeLaboratoryPdfCpuSeconds\": %.3f, "
                        + "\"largeLaboratoryBatch\": %d, \"largeLaboratoryBatchSeconds\": %.3f, "
                        + "\"largeLaboratoryBatchCpuSeconds\": %.3f, \"largeAllLaboratoryReports\": %d, "
                        + "\"largeAllLaboratoryReportsEstimatedSeconds\": %.1f, "
                        + "\"largeAllLaboratoryReportsEstimatedCpuSeconds\": %.1f, "
                        + "\"poolBatch\": %d, \"poolOneWorkerSeconds\": %.2f, \"poolTwoWorkersSeconds\": %.2f, "
                        + "\"issueRoundSpeedup\": %.2f, \"issueRoundSeconds\": %.0f}%n",
                smallRound.wall(), largeRound.wall(), smallRound.cpu(), largeRound.cpu(), laboratory.wall(),
                laboratory.cpu(), BATCH, batch.wall(), batch.cpu(), participants, all.wall(), all.cpu(), POOL_BATCH,
                oneWorker.wall(), twoWorkers.wall(), speedup, issueRoundSeconds);
        Files.writeString(output, json, StandardCharsets.UTF_8);
        System.out.print(json);
    }

    /** Renders the laboratory reports (PDF and HTML) of {@code codes} on a pool of {@code workers}. */
    private static Timing timePool(int workers, RoundReport round, List<String> codes) {
        org.roundtable.report.ReportRenderPool pool = new org.roundtable.report.ReportRenderPool(workers);
        try {
            long start = System.nanoTime();
            long[] bytes = {0};
            pool.renderInOrder(codes, org.roundtable.report.ReportRenderPool.Renderers.fresh(),
                    (code, renderers) -> {
                        LaboratoryReport lab = new LaboratoryReport(round, code);
                        return renderers.pdf().render(lab).length + renderers.html().render(lab).length();
                    }, size -> bytes[0] += size);
            return new Timing((System.nanoTime() - start) / 1e9, Double.NaN);
        } finally {
            pool.stop();
        }
    }

    private static void renderLaboratory(PdfReportRenderer renderer, RoundReport round, String code) {
        renderer.render(new LaboratoryReport(round, code), OutputStream.nullOutputStream(), RenderProgress.NONE);
    }

    private static Timing time(Runnable work) {
        long cpuStart = THREADS.getCurrentThreadCpuTime();
        long start = System.nanoTime();
        work.run();
        return new Timing((System.nanoTime() - start) / 1e9, (THREADS.getCurrentThreadCpuTime() - cpuStart) / 1e9);
    }

    private static Timing timeRound(String label, RoundReport report, int warmups, int runs) {
        for (int i = 0; i < warmups; i++) {
            new PdfReportRenderer().render(report, OutputStream.nullOutputStream(), RenderProgress.NONE);
        }
        double[] seconds = new double[runs];
        double[] cpuSeconds = new double[runs];
        long bytes = 0;
        for (int i = 0; i < runs; i++) {
            CountingStream counter = new CountingStream();
            PdfReportRenderer renderer = new PdfReportRenderer();
            Timing t = time(() -> renderer.render(report, counter, RenderProgress.NONE));
            seconds[i] = t.wall();
            cpuSeconds[i] = t.cpu();
            bytes = counter.count;
        }
        Arrays.sort(seconds);
        Arrays.sort(cpuSeconds);
        Timing median = new Timing(seconds[runs / 2], cpuSeconds[runs / 2]);
        System.out.printf(Locale.ROOT, "%s: median %.3f s wall (min %.3f, max %.3f), median %.3f s CPU of the "
                + "rendering thread (min %.3f), %d bytes%n", label, median.wall(), seconds[0], seconds[runs - 1],
                median.cpu(), cpuSeconds[0], bytes);
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
