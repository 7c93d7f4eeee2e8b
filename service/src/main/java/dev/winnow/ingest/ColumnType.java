package dev.winnow.ingest;

/** Type of an extra panel column: numeric characteristic or text label. */
public enum ColumnType {
    NUMBER,
    LABEL
}
