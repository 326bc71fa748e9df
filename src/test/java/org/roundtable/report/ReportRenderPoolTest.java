package org.roundtable.report;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.ArrayList;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Set;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;

/** The render pool of report issuing, without a server: order, failures, renderers per worker. */
class ReportRenderPoolTest {

    @Test
    void documentsRenderedOnTwoWorkersAreWrittenInTheOrderGivenOnTheCallersThread() {
        ReportRenderPool pool = new ReportRenderPool(2);
        try {
            List<Integer> tasks = IntStream.range(0, 200).boxed().toList();
            List<Integer> written = new ArrayList<>();
            Thread caller = Thread.currentThread();
            Set<String> workerThreads = Collections.synchronizedSet(new java.util.HashSet<>());
            pool.renderInOrder(tasks, ReportRenderPool.Renderers.fresh(), (task, renderers) -> {
                workerThreads.add(Thread.currentThread().getName());
                sleepBriefly(task);
                return task * 10;
            }, result -> {
                assertThat(Thread.currentThread()).isSameAs(caller);
                written.add(result);
            });
            assertThat(written).containsExactlyElementsOf(tasks.stream().map(t -> t * 10).toList());
            assertThat(workerThreads).allMatch(name -> name.startsWith("report-render-"));
        } finally {
            pool.stop();
        }
    }

    @Test
    void eachWorkerHasRenderersOfItsOwnForTheIssue() {
        ReportRenderPool pool = new ReportRenderPool(2);
        try {
            ReportRenderPool.Renderers own = ReportRenderPool.Renderers.fresh();
            Set<ReportRenderPool.Renderers> seen = Collections.synchronizedSet(
                    Collections.newSetFromMap(new IdentityHashMap<>()));
            pool.renderInOrder(IntStream.range(0, 50).boxed().toList(), own, (task, renderers) -> {
                seen.add(renderers);
                sleepBriefly(task);
                return task;
            }, result -> { });
            assertThat(seen).hasSizeBetween(1, 2).doesNotContain(own);
        } finally {
            pool.stop();
        }
    }

    @Test
    void oneWorkerRendersOnTheCallersThreadWithItsOwnRenderers() {
        ReportRenderPool pool = new ReportRenderPool(1);
        ReportRenderPool.Renderers own = ReportRenderPool.Renderers.fresh();
        Thread caller = Thread.currentThread();
        pool.renderInOrder(List.of(1, 2, 3), own, (task, renderers) -> {
            assertThat(Thread.currentThread()).isSameAs(caller);
            assertThat(renderers).isSameAs(own);
            return task;
        }, result -> { });
        assertThat(pool.workers()).isEqualTo(1);
    }

    @Test
    void aFailedRenderingStopsTheIssueWithItsCause() {
        ReportRenderPool pool = new ReportRenderPool(2);
        try {
            List<Integer> written = new ArrayList<>();
            assertThatThrownBy(() -> pool.renderInOrder(IntStream.range(0, 20).boxed().toList(),
                    ReportRenderPool.Renderers.fresh(), (task, renderers) -> {
                        if (task == 7) {
                            throw new IllegalArgumentException("chart of task 7");
                        }
                        return task;
                    }, written::add)).isInstanceOf(IllegalArgumentException.class).hasMessage("chart of task 7");
            assertThat(written).containsExactly(0, 1, 2, 3, 4, 5, 6);
        } finally {
            pool.stop();
        }
    }

    private static void sleepBriefly(int task) {
        try {
            Thread.sleep(task % 3);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
