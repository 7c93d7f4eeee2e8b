package dev.winnow.ingest;

import java.io.IOException;
import java.io.InputStream;
import java.io.InterruptedIOException;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Opens the scans over the spooled file and turns bytes read into a never-decreasing fraction of the planned work.
 * Each scan owns a share of [0, 1]; within a scan the fraction grows with the bytes read from disk. An interrupted
 * thread stops the parse at the next report with an {@link InterruptedIOException}.
 */
final class ProgressMeter {

    /** Rows between two reports. */
    static final int REPORT_EVERY = 1 << 16;

    private final ProgressListener listener;
    private final long fileSize;
    private CountingInputStream scan;
    private double scanStart;
    private double scanShare;
    private double last;

    ProgressMeter(ProgressListener listener, Path file) throws IOException {
        this.listener = listener;
        this.fileSize = Math.max(1, Files.size(file));
    }

    private ProgressMeter() {
        this.listener = ProgressListener.NONE;
        this.fileSize = 1;
    }

    /** A meter that reports nothing but still stops an interrupted parse (for chunks scanned by worker threads). */
    static ProgressMeter silent() {
        return new ProgressMeter();
    }

    /** Opens the file for a scan that covers the fractions [start, start + share). */
    InputStream open(Path file, boolean gzip, double start, double share) throws IOException {
        scan = new CountingInputStream(DirectFile.open(file));
        scanStart = start;
        scanShare = share;
        return Gzip.decompressedIf(gzip, scan);
    }

    void report(long rowsRead, long rowsRejected, long rowsEmitted) throws InterruptedIOException {
        if (Thread.currentThread().isInterrupted()) {
            throw new InterruptedIOException("the upload parse was interrupted");
        }
        if (scan == null) {
            return;
        }
        double withinScan = Math.min(1.0, (double) scan.count() / fileSize);
        emit(scanStart + scanShare * withinScan, rowsRead, rowsRejected, rowsEmitted);
    }

    void finish(long rowsRead, long rowsRejected, long rowsEmitted) {
        emit(1.0, rowsRead, rowsRejected, rowsEmitted);
    }

    private void emit(double fraction, long rowsRead, long rowsRejected, long rowsEmitted) {
        last = Math.max(last, fraction);
        listener.onProgress(new IngestProgress(last, rowsRead, rowsRead - rowsRejected, rowsRejected, rowsEmitted));
    }
}
