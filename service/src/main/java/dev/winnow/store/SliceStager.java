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
 * A failure of the writer surfaces at the next call from the parser's side.
 */
public final class SliceStager implements AutoCloseable {
    private static final int QUEUED = 32;
    private static final int BATCH_BYTES = 8 << 20;
    private static final int BATCH_SLICES = 512;
    private static final CrossSection END = new CrossSection(LocalDate.MIN, new int[0], new double[0], new double[0],
            java.util.Map.of(), java.util.Map.of());

    private final Jdbi jdbi;
    private final long panelId;
    private final long uploadId;
    private final BlockingQueue<CrossSection> queue = new ArrayBlockingQueue<>(QUEUED);
    private Thread writer;
    private volatile Throwable failure;
    private volatile boolean stopped;
    private long stagedSlices;
    private long stagedBytes;
    private long encodeNanos;
    private long writeNanos;

    /** What the stager did: slices and payload bytes written, and its busy time encoding and writing. */
    public record Stats(long slices, long bytes, long encodeNanos, long writeNanos) {
    }

    SliceStager(Jdbi jdbi, long panelId, long uploadId) {
        this.jdbi = jdbi;
        this.panelId = panelId;
        this.uploadId = uploadId;
        startWriter();
    }

    private void startWriter() {
        stopped = false;
        failure = null;
        writer = new Thread(this::write, "slice-stager-" + uploadId);
        writer.setDaemon(true);
        writer.start();
    }

    /** Queues a cross-section for staging; waits while the queue is full. */
    public void accept(CrossSection cs) throws InterruptedException {
        while (!queue.offer(cs, 100, TimeUnit.MILLISECONDS)) {
            rethrowFailure();
        }
        rethrowFailure();
    }

    /** Waits until everything accepted is staged. */
    public Stats finish() throws InterruptedException {
        accept(END);
        writer.join();
        rethrowFailure();
        return new Stats(stagedSlices, stagedBytes, encodeNanos, writeNanos);
    }

    /**
     * Forgets what was accepted so far: stops the writer, deletes the slices it staged (the upload's new security
     * codes stay) and starts writing afresh.
     */
    public void discardStaged() {
        stopWriter();
        jdbi.useTransaction(h -> {
            h.createUpdate("DELETE FROM slice_payloads WHERE upload_id = :u").bind("u", uploadId).execute();
            h.createUpdate("DELETE FROM panel_slices WHERE upload_id = :u").bind("u", uploadId).execute();
        });
        stagedSlices = 0;
        stagedBytes = 0;
        startWriter();
    }

    /**
     * Stops the writer without staging what is still queued (the caller discards the upload's staged rows). The
     * writer is never interrupted: a batch being written finishes, so the store's files are never cut mid-write.
     */
    @Override
    public void close() {
        stopWriter();
    }

    private void stopWriter() {
        stopped = true;
        queue.clear();
        boolean interrupted = false;
        while (writer.isAlive()) {
            queue.offer(END);
            try {
                writer.join(1000);
            } catch (InterruptedException e) {
                interrupted = true;
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
    }

    private void rethrowFailure() {
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

    private record Encoded(LocalDate date, int rows, byte[] payload) {
    }

    private void write() {
        List<Encoded> batch = new ArrayList<>();
        long bytes = 0;
        try {
            while (!stopped) {
                CrossSection cs = queue.take();
                if (cs == END) {
                    break;
                }
                long t0 = System.nanoTime();
                byte[] payload = CrossSectionCodec.encode(cs);
                encodeNanos += System.nanoTime() - t0;
                batch.add(new Encoded(cs.date(), cs.size(), payload));
                bytes += payload.length;
                if (bytes >= BATCH_BYTES || batch.size() >= BATCH_SLICES) {
                    insert(batch);
                    batch.clear();
                    bytes = 0;
                }
            }
            if (!stopped && !batch.isEmpty()) {
                insert(batch);
            }
        } catch (InterruptedException e) {
            failure = e;
        } catch (RuntimeException | Error e) {
            failure = e;
        }
    }

    private void insert(List<Encoded> batch) {
        long t0 = System.nanoTime();
        try {
            insertBatch(batch);
        } finally {
            writeNanos += System.nanoTime() - t0;
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
        stagedSlices += batch.size();
        for (Encoded e : batch) {
            stagedBytes += e.payload().length;
        }
    }
}
