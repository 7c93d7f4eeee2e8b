package dev.winnow.research;

import java.util.ArrayDeque;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.Consumer;
import java.util.function.Supplier;

/**
 * The threads the cross-sectional studies hand their per-period math to, so that reading the panel in grid order
 * (on the request's thread: the panel and a recipe's evaluator are read strictly in order) overlaps with the sorting
 * and regressions of the periods already read. One bounded pool for the whole process (one thread per processor),
 * shared by every request, so concurrent studies queue for the processors instead of multiplying threads; and each
 * study keeps at most {@link #IN_FLIGHT} periods queued, so a fast reader cannot pile up cross-sections in memory.
 */
public final class StudyThreads implements AutoCloseable {
    /** Periods a study may have submitted and not yet consumed. */
    static final int IN_FLIGHT = 64;

    private final ExecutorService pool;

    public StudyThreads(int threads) {
        AtomicInteger count = new AtomicInteger();
        this.pool = Executors.newFixedThreadPool(Math.max(1, threads), r -> {
            Thread t = new Thread(r, "winnow-study-" + count.incrementAndGet());
            t.setDaemon(true);
            return t;
        });
    }

    /** One thread per available processor. */
    public static StudyThreads perProcessor() {
        return new StudyThreads(Runtime.getRuntime().availableProcessors());
    }

    /**
     * A sequence of tasks whose results are consumed in submission order, on the submitting thread, with at most
     * {@link #IN_FLIGHT} outstanding; so results (and sums over them) come out exactly as a sequential loop would give
     * them. A task may wait for a value that a task submitted before it produces (the pool takes tasks first in,
     * first out, so that task has started), never for a later one. When a task fails, the others already submitted
     * still run to their end, and then the first failure is thrown.
     */
    <T> Pipeline<T> pipeline(Consumer<T> inOrder) {
        return new Pipeline<>(inOrder);
    }

    final class Pipeline<T> {
        private final ArrayDeque<CompletableFuture<T>> pending = new ArrayDeque<>();
        private final Consumer<T> inOrder;

        private Pipeline(Consumer<T> inOrder) {
            this.inOrder = inOrder;
        }

        void submit(Supplier<T> task) {
            while (pending.size() >= IN_FLIGHT) {
                consumeOldest();
            }
            pending.add(CompletableFuture.supplyAsync(task, pool));
        }

        /** Waits for every task and consumes the rest of the results. */
        void finish() {
            while (!pending.isEmpty()) {
                consumeOldest();
            }
        }

        private void consumeOldest() {
            T result;
            try {
                result = pending.removeFirst().join();
            } catch (CompletionException e) {
                // the tasks already submitted run to their end before the failure propagates: none is cancelled,
                // since a task may wait for the result of one submitted before it, and a skipped task would leave
                // it waiting for ever on a thread of the shared pool
                for (CompletableFuture<T> later : pending) {
                    try {
                        later.join();
                    } catch (RuntimeException ignored) {
                        // its own failure, or that of a task it waited for: the first failure is the one reported
                    }
                }
                pending.clear();
                if (e.getCause() instanceof RuntimeException r) {
                    throw r;
                }
                if (e.getCause() instanceof Error err) {
                    throw err;
                }
                throw e;
            }
            inOrder.accept(result);
        }
    }

    @Override
    public void close() {
        pool.shutdownNow();
    }
}
