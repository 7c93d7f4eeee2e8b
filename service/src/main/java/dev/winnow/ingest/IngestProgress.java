package dev.winnow.ingest;

/**
 * A progress snapshot of a panel parse.
 *
 * @param fraction     share of the planned work done, 0..1, never decreasing within one parse
 * @param rowsRead     data rows read by the first pass so far
 * @param rowsAccepted data rows without error so far
 * @param rowsRejected data rows with at least one error so far
 * @param rowsEmitted  rows handed to the sink so far (second pass)
 */
public record IngestProgress(double fraction, long rowsRead, long rowsAccepted, long rowsRejected, long rowsEmitted) {
}
