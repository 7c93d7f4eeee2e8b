package dev.winnow.ingest;

/**
 * Counts and range of one column over the upload's cells that parsed. For labels min, max and mean are NaN.
 *
 * @param present cells with a value
 * @param missing empty cells
 */
public record ColumnSummary(ColumnType type, long present, long missing, double min, double max, double mean) {
}
