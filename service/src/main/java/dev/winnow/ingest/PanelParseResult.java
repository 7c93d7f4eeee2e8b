package dev.winnow.ingest;

import java.time.LocalDate;
import java.util.List;
import java.util.Map;

/**
 * Outcome of parsing a panel upload. The upload is accepted only when {@link #accepted()}; otherwise the store must
 * discard anything the sink received.
 *
 * @param errors       the first 100 problems by line
 * @param errorCount   all problems found, also past the first 100
 * @param rowsRead     data rows in the file (empty lines are not rows)
 * @param rowsAccepted data rows without a problem
 * @param rowsRejected data rows with at least one problem; problems with the header or a whole column reject no row
 * @param schema       the panel's extra columns after this upload: the existing schema plus {@code newColumns}
 * @param newColumns   extra columns this upload introduces, with their inferred types, in file order
 * @param dates        the upload's distinct valid dates, ascending
 * @param stats        frequency-agnostic facts about the upload
 * @param rowsEmitted  rows handed to the sink in cross-sections
 */
public record PanelParseResult(List<UploadError> errors, long errorCount, long rowsRead, long rowsAccepted,
                               long rowsRejected, Map<String, ColumnType> schema, Map<String, ColumnType> newColumns,
                               List<LocalDate> dates, UploadStats stats, long rowsEmitted) {

    public PanelParseResult {
        errors = List.copyOf(errors);
        dates = List.copyOf(dates);
    }

    public boolean accepted() {
        return errorCount == 0;
    }
}
