package dev.winnow.store;

import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.RejectedExecutionException;
import java.util.concurrent.ThreadPoolExecutor;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * The threads that read the next block of a panel while a reader works on the current one
 * ({@link StorePanelSource}). One pool for the whole service, made where the service is wired and shared by every
 * {@link PanelStore#source source} it opens: daemon threads that end after a minute without work, so an idle service
 * holds none. {@link #close} lets the reads in progress finish (an interrupt during an H2 file read would close H2's
 * file) and refuses new ones; a source then reads its blocks on the caller's thread.
 */
public final class PanelReadAhead implements AutoCloseable {
    private final ThreadPoolExecutor pool;

    /** @param threads at most this many blocks read ahead at once, at least 1 */
    public PanelReadAhead(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("read ahead needs at least 1 thread, got " + threads);
        }
        AtomicInteger count = new AtomicInteger();
        this.pool = new ThreadPoolExecutor(threads, threads, 60, TimeUnit.SECONDS, new LinkedBlockingQueue<>(), r -> {
            Thread t = new Thread(r, "panel-read-ahead-" + count.incrementAndGet());
            t.setDaemon(true);
            return t;
        });
        pool.allowCoreThreadTimeOut(true);
    }

    /** One thread per processor, at least two (a build's reader and a study's may read ahead at once). */
    public static PanelReadAhead perProcessor() {
        return new PanelReadAhead(Math.max(2, Runtime.getRuntime().availableProcessors()));
    }

    /** Starts the task on a pool thread; false when the pool is closed (the caller reads the block itself). */
    boolean start(Runnable task) {
        try {
            pool.execute(task);
            return true;
        } catch (RejectedExecutionException closed) {
            return false;
        }
    }

    /** Refuses new reads and waits up to ten seconds for those in progress. */
    @Override
    public void close() {
        pool.shutdown();
        try {
            pool.awaitTermination(10, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
