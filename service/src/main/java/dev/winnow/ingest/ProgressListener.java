package dev.winnow.ingest;

/** Receives progress snapshots of a parse, a few per second at most for large files. */
@FunctionalInterface
public interface ProgressListener {

    ProgressListener NONE = progress -> { };

    void onProgress(IngestProgress progress);
}
