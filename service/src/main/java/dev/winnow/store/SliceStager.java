package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.statement.PreparedBatch;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;

/**
 * Stages an upload's slices from a thread of its own, so that encoding and writing overlap the parse: the parser
 * hands over cross-sections ({@link #accept}, which waits while {@value #QUEUED} are queued), the stager encodes
 * them ({@link CrossSectionCodec}) and inserts them in batches of about {@value #BATCH_BYTES} bytes, one transaction
 * per batch. Staged rows stay invisible until the upload commits, so batching changes nothing readers can see.
 *
 * <p>Each writer thread has a queue of its own: {@link #discardStaged} stops the writer, deletes what it wrote and
 * starts a new writer on a new queue, so nothing queued for (or left over by) the old writer can reach the new one.
 * A writer that stops for any reason other than being told to is noticed at the parser's next call: a failure is
 * thrown there, and a writer gone without a failure is reported as such, never waited on. {@link #finish} checks
 * that every accepted slice was written, so an upload can never commit with a slice missing.
 */
public final class SliceStager implements AutoCloseable {
    private static final int QUEUED = 32;
    private static final int BATCH_BYTES = 8 << 20;
    private static final int BATCH_SLICES = 512;
    private static final long WAIT_MILLIS = 100;
    private static final Item END = new Item(new CrossSection(LocalDate.MIN, new int[0], new double[0], new double[0],
            java.util.Map.of(), java.util.Map.of()), null);

    private final Jdbi jdbi;
    private final long panelId;
    private final long uploadId;
    private Writer writer;
    private int generation;
    /** Cross-sections handed to the current writer (since the last discard). */
    private long accepted;

    /** What the stager did: slices and payload bytes written, and its busy time encoding and writing. */
    public record Stats(long slices, long bytes, long encodeNanos, long writeNanos) {
    }

    SliceStager(Jdbi jdbi, long panelId, long uploadId) {
        this.jdbi = jdbi;
        this.panelId = panelId;
        this.uploadId = uploadId;
        this.writer = new Writer();
    }

    /** Queues a cross-section for staging; waits while the queue is full. */
    public void accept(CrossSection cs) throws InterruptedException {
        accept(cs, null);
    }

    /**
     * Queues a cross-section for staging with the decimal forms its numbers were read in (may be null), which spare
     * the encoder finding them again; waits while the queue is full.
     */
    public void accept(CrossSection cs, SliceDecimals decimals) throws InterruptedException {
        writer.put(new Item(cs, decimals));
        accepted++;
    }

    /** A queued cross-section and its decimal forms. */
    private record Item(CrossSection cs, SliceDecimals decimals) {
    }

    /** Waits until everything accepted is staged; fails unless every accepted slice was written. */
    public Stats finish() throws InterruptedException {
        Writer w = writer;
        w.put(END);
        w.thread.join();
        w.rethrowFailure();
        if (w.slices != accepted) {
            throw new IllegalStateException("the staging writer wrote " + w.slices + " of " + accepted + " slices");
        }
        return new Stats(w.slices, w.bytes, w.encodeNanos, w.writeNanos);
    }

    /**
     * Forgets what was accepted so far: stops the writer, deletes the slices it staged (the upload's new security
     * codes stay) and starts a new writer on an empty queue of its own.
     */
    public void discardStaged() {
        writer.stop();
        jdbi.useTransaction(h -> {
            h.createUpdate("DELETE FROM slice_payloads WHERE upload_id = :u").bind("u", uploadId).execute();
            h.createUpdate("DELETE FROM panel_slices WHERE upload_id = :u").bind("u", uploadId).execute();
        });
        accepted = 0;
        writer = new Writer();
    }

    /**
     * Stops the writer without staging what is still queued (the caller discards the upload's staged rows). The
     * writer is never interrupted: a batch being written finishes, so the store's files are never cut mid-write.
     */
    @Override
    public void close() {
        writer.stop();
    }

    private record Encoded(LocalDate date, int rows, byte[] payload) {
    }

    /**
     * One writer thread and its queue. Its counters are written by the thread only and read after it ended
     * ({@link Thread#join} orders the two).
     */
    private final class Writer implements Runnable {
        final BlockingQueue<Item> queue = new ArrayBlockingQueue<>(QUEUED);
        final Thread thread;
        volatile boolean stopped;
        volatile Throwable failure;
        long slices;
        long bytes;
        long encodeNanos;
        long writeNanos;

        Writer() {
            thread = new Thread(this, "slice-stager-" + uploadId + "-" + (++generation));
            thread.setDaemon(true);
            thread.start();
        }

        /** Queues an item, waiting while the queue is full; fails as soon as the writer is gone. */
        void put(Item cs) throws InterruptedException {
            while (!queue.offer(cs, WAIT_MILLIS, TimeUnit.MILLISECONDS)) {
                checkRunning();
            }
            if (cs != END) {
                checkRunning();
            }
        }

        private void checkRunning() {
            rethrowFailure();
            if (!thread.isAlive()) {
                rethrowFailure();
                throw new IllegalStateException("the staging writer stopped before the upload's slices were staged");
            }
        }

        void rethrowFailure() {
            Throwable t = failure;
            if (t instanceof RuntimeException e) {
                throw e;
            }
            if (t instanceof Error e) {
                throw e;
            }
            if (t != null) {
                throw new IllegalStateException("staging the upload failed", t);
            }
        }

        /** Tells the thread to stop after the item in hand and waits for it (uninterruptibly; the flag is kept). */
        void stop() {
            stopped = true;
            queue.clear();
            queue.offer(END);
            boolean interrupted = false;
            while (thread.isAlive()) {
                try {
                    thread.join();
                } catch (InterruptedException e) {
                    interrupted = true;
                }
            }
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }

        @Override
        public void run() {
            List<Encoded> batch = new ArrayList<>();
            long batchBytes = 0;
            try {
                while (!stopped) {
                    Item item = queue.take();
                    if (item == END) {
                        break;
                    }
                    CrossSection cs = item.cs();
                    long t0 = System.nanoTime();
                    byte[] payload = CrossSectionCodec.encode(cs, item.decimals());
                    encodeNanos += System.nanoTime() - t0;
                    batch.add(new Encoded(cs.date(), cs.size(), payload));
                    batchBytes += payload.length;
                    if (batchBytes >= BATCH_BYTES || batch.size() >= BATCH_SLICES) {
                        insert(batch);
                        batch.clear();
                        batchBytes = 0;
                    }
                }
                if (!stopped && !batch.isEmpty()) {
                    insert(batch);
                }
            } catch (Throwable t) {
                failure = t;
            }
        }

        private void insert(List<Encoded> batch) {
            long t0 = System.nanoTime();
            try {
                insertBatch(batch);
            } finally {
                writeNanos += System.nanoTime() - t0;
            }
            slices += batch.size();
            for (Encoded e : batch) {
                bytes += e.payload().length;
            }
        }
    }

    private void insertBatch(List<Encoded> batch) {
        jdbi.useTransaction(h -> {
            PreparedBatch slices = h.prepareBatch("INSERT INTO panel_slices (panel_id, slice_date, upload_id, row_count) VALUES (:p, :d, :u, :n)");
            for (Encoded e : batch) {
                slices.bind("p", panelId).bind("d", e.date()).bind("u", uploadId).bind("n", e.rows()).add();
            }
            slices.execute();
            PreparedBatch payloads = h.prepareBatch("INSERT INTO slice_payloads (panel_id, slice_date, upload_id, payload) VALUES (:p, :d, :u, :b)");
            for (Encoded e : batch) {
                payloads.bind("p", panelId).bind("d", e.date()).bind("u", uploadId).bind("b", e.payload()).add();
            }
            payloads.execute();
        });
    }
}
