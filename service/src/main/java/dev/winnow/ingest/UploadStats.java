package dev.winnow.ingest;

import java.time.LocalDate;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Frequency-agnostic facts about a panel upload (no annualisation, no assumed spacing of dates).
 *
 * @param dateCount          distinct valid dates
 * @param firstDate          earliest date, null when there is none
 * @param lastDate           latest date, null when there is none
 * @param minRowsPerDate     fewest rows at one date (0 when there are no dates)
 * @param maxRowsPerDate     most rows at one date
 * @param meanRowsPerDate    rows per date on average (NaN when there are no dates)
 * @param distinctSecurities distinct security identifiers, or -1 when the second pass did not run
 * @param columns            per column (return, market_cap when present, then the extra columns in file order)
 */
public record UploadStats(int dateCount, LocalDate firstDate, LocalDate lastDate, int minRowsPerDate,
                          int maxRowsPerDate, double meanRowsPerDate, int distinctSecurities,
                          Map<String, ColumnSummary> columns) {

    public UploadStats {
        columns = Collections.unmodifiableMap(new LinkedHashMap<>(columns));
    }
}
