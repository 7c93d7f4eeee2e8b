package dev.winnow.construct;

import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.TimeUnit;

/**
 * The threads on which long builds make their formations ahead of the thread that holds the book
 * ({@link FactorEngine#build(FactorDefinition, PanelSource, dev.winnow.stats.ReturnSeries, java.util.Map, EngineState,
 * FormingThreads)}): one thread per build in progress, created when needed and kept a minute for the next build;
 * daemon threads, so they never keep the process alive. One set for the whole service, made where the service is
 * wired. {@link #NONE}, a set on a single processor, and a closed set run every build on the caller's thread alone,
 * which gives the same bits.
 */
public final class FormingThreads implements AutoCloseable {
    /** No forming threads: every build runs on its caller's thread. */
    public static final FormingThreads NONE = new FormingThreads(null);

    private final ExecutorService pool;

    private FormingThreads(ExecutorService pool) {
        this.pool = pool;
    }

    /** A thread per build in progress on two or more processors; {@link #NONE} on one, where a second thread only waits. */
    public static FormingThreads perProcessor() {
        if (Runtime.getRuntime().availableProcessors() < 2) {
            return NONE;
        }
        return new FormingThreads(Executors.newCachedThreadPool(r -> {
            Thread t = new Thread(r, "factor-forming");
            t.setDaemon(true);
            return t;
        }));
    }

    /** The task started on a forming thread, or null when there is none (the caller then builds on its own thread). */
    Future<?> start(Runnable task) {
        if (pool == null) {
            return null;
        }
        try {
            return pool.submit(task);
        } catch (RejectedExecutionException closed) {
            return null;
        }
    }

    /**
     * Refuses new builds' forming and waits up to ten seconds for those in progress (never interrupted: an interrupt
     * inside a store's file read closes the store's file).
     */
    @Override
    public void close() {
        if (pool == null) {
            return;
        }
        pool.shutdown();
        try {
            pool.awaitTermination(10, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
