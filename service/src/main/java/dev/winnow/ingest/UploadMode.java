package dev.winnow.ingest;

/**
 * How an upload relates to the rows a panel or series already holds.
 * {@link #APPEND}: every date must come after the last stored date. {@link #REVISE}: any dates; the uploaded dates
 * replace the stored rows of those dates.
 */
public enum UploadMode {
    APPEND,
    REVISE
}
