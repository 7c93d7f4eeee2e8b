package dev.winnow.ingest;

import dev.winnow.stats.ReturnSeries;
import java.util.List;

/**
 * Outcome of parsing an external return series upload.
 *
 * @param errors       the first 100 problems by line
 * @param errorCount   all problems found
 * @param rowsRead     data rows in the file (empty lines are not rows)
 * @param rowsAccepted data rows without a problem
 * @param rowsRejected data rows with at least one problem
 * @param series       the rows sorted by date when the upload is accepted, else empty
 */
public record SeriesParseResult(List<UploadError> errors, long errorCount, long rowsRead, long rowsAccepted,
                                long rowsRejected, ReturnSeries series) {

    public SeriesParseResult {
        errors = List.copyOf(errors);
    }

    public boolean accepted() {
        return errorCount == 0;
    }
}
