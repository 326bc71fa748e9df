package org.roundtable.report;

import jakarta.annotation.PreDestroy;
import jakarta.enterprise.context.ApplicationScoped;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Consumer;
import org.eclipse.microprofile.config.inject.ConfigProperty;
import org.roundtable.report.render.HtmlReportRenderer;
import org.roundtable.report.render.PdfReportRenderer;

/**
 * Renders a round's laboratory reports on a bounded pool, so that issuing uses every core: each worker thread keeps
 * its own PDF and HTML renderer (they cache chart data per measurand and are not shared between threads); the
 * caller receives the rendered documents in the order given, one at a time, and writes them itself. At most two
 * documents per worker wait rendered, so memory stays bounded whatever the number of laboratories.
 *
 * <p>{@code roundtable.reports.issue-workers}: the number of workers; 0 (the default) means one per available
 * processor, 1 renders on the caller's thread.
 */
@ApplicationScoped
public class ReportRenderPool {

    /** The two renderers a thread uses for one issue (their chart cache belongs to that run). */
    public record Renderers(PdfReportRenderer pdf, HtmlReportRenderer html) {
        public static Renderers fresh() {
            return new Renderers(new PdfReportRenderer(), new HtmlReportRenderer());
        }
    }

    private final int workers;
    private final ExecutorService pool;

    public ReportRenderPool(@ConfigProperty(name = "roundtable.reports.issue-workers", defaultValue = "0") int configured) {
        this.workers = configured > 0 ? configured : Math.max(1, Runtime.getRuntime().availableProcessors());
        AtomicInteger counter = new AtomicInteger();
        this.pool = workers == 1 ? null : Executors.newFixedThreadPool(workers, task -> {
            Thread t = new Thread(task, "report-render-" + counter.incrementAndGet());
            t.setDaemon(true);
            return t;
        });
    }

    /** The number of workers. */
    public int workers() {
        return workers;
    }

    /**
     * Renders {@code render(task, renderers)} for every task and hands each result to {@code written}, in the tasks'
     * order, on the caller's thread. Each worker gets fresh renderers for this call; with one worker the caller's
     * {@code own} renderers are used.
     *
     * @throws RuntimeException the first rendering failure (the remaining renderings are cancelled)
     */
    public <T, R> void renderInOrder(List<T> tasks, Renderers own, RenderStep<T, R> render, Consumer<R> written) {
        if (pool == null) {
            for (T task : tasks) {
                written.accept(render.render(task, own));
            }
            return;
        }
        Map<Thread, Renderers> perWorker = new ConcurrentHashMap<>();
        Deque<Future<R>> ahead = new ArrayDeque<>();
        int next = 0;
        try {
            while (next < tasks.size() || !ahead.isEmpty()) {
                while (next < tasks.size() && ahead.size() < 2 * workers) {
                    T task = tasks.get(next++);
                    ahead.add(pool.submit(() -> render.render(task,
                            perWorker.computeIfAbsent(Thread.currentThread(), t -> Renderers.fresh()))));
                }
                written.accept(ahead.removeFirst().get());
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while rendering reports", e);
        } catch (ExecutionException e) {
            Throwable cause = e.getCause();
            throw cause instanceof RuntimeException runtime ? runtime
                    : new IllegalStateException("rendering a report failed", cause);
        } finally {
            ahead.forEach(f -> f.cancel(true));
        }
    }

    /** One rendering with the thread's renderers. */
    @FunctionalInterface
    public interface RenderStep<T, R> {
        R render(T task, Renderers renderers);
    }

    /** Stops the workers (at shutdown). */
    @PreDestroy
    public void stop() {
        if (pool != null) {
            pool.shutdownNow();
        }
    }
}
