package dev.winnow.ingest;

import java.io.IOException;
import java.time.LocalDate;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Parses a panel upload (CSV, optionally gzip) in two streaming passes, within a small, bounded heap.
 *
 * <p>Pass 1 checks the header and every cell, infers the types of new columns and records the dates. When it finds
 * any problem the parse ends there, and the result lists up to 100 problems with their line numbers. Otherwise pass
 * 2 reads the file again (once, or once per range of dates when the rows of a date are scattered or the dates are not
 * in order; see {@link #PanelUploadParser(int)}) and hands one {@link dev.winnow.construct.CrossSection} per date to
 * the sink in ascending date order, security ids from {@link SecurityIds}, rows sorted by id.
 *
 * <p>Pass 2 can still find one problem: a security twice at the same date. The sink may have received some dates'
 * cross-sections by then (none are sent after the first such date), so the caller must stage what the sink
 * receives and publish only an {@link PanelParseResult#accepted() accepted} result.
 *
 * <p>Cell rules: cells are trimmed of surrounding spaces and tabs; an empty cell is a missing value (NaN for
 * numbers, null for labels); empty lines are skipped (they still count for line numbers). Numbers are plain
 * decimals (see {@link NumberCell}); dates are yyyy-mm-dd. Column types follow {@link ExtraColumn}.
 */
public final class PanelUploadParser {

    /** Rows held at once when the file is not in date order (about 70 MB with 4 numeric and 1 label column). */
    public static final int DEFAULT_ROW_BUDGET = 1_000_000;
    private static final double FIRST_PASS_SHARE_BEFORE_EMIT = 0.5;

    private final int rowBudget;

    public PanelUploadParser() {
        this(DEFAULT_ROW_BUDGET);
    }

    /**
     * @param rowBudget rows the second pass may hold at once when the file is not in date order; fewer means more
     *                  reads of the file. A date with more rows than this is still held whole.
     */
    public PanelUploadParser(int rowBudget) {
        if (rowBudget < 1) {
            throw new IllegalArgumentException("rowBudget must be at least 1, got " + rowBudget);
        }
        this.rowBudget = rowBudget;
    }

    /** Pass 1 only: checks the upload and infers its schema and dates without sending any rows. */
    public PanelParseResult validate(PanelUpload upload, ProgressListener progress) throws IOException {
        ErrorCollector errors = new ErrorCollector();
        ProgressMeter meter = new ProgressMeter(progress, upload.file());
        PanelFirstPass first = new PanelFirstPass(upload, errors, meter);
        first.run(1.0);
        meter.finish(first.rowsRead, first.rowsRejected, 0);
        return result(upload, first, errors, null);
    }

    /**
     * Both passes: checks the upload and, when it has no problem, sends its cross-sections to {@code sink}.
     *
     * @throws SinkException when {@code securityIds} or {@code sink} throws; the upload is then incomplete
     * @throws IOException   when the file cannot be read (a corrupt gzip stream is reported as an upload error)
     */
    public PanelParseResult parse(PanelUpload upload, SecurityIds securityIds, CrossSectionSink sink,
                                  ProgressListener progress) throws IOException, SinkException {
        ErrorCollector errors = new ErrorCollector();
        ProgressMeter meter = new ProgressMeter(progress, upload.file());
        PanelFirstPass first = new PanelFirstPass(upload, errors, meter);
        first.run(FIRST_PASS_SHARE_BEFORE_EMIT);
        PanelSecondPass second = null;
        if (errors.isEmpty()) {
            ColumnType[] types = new ColumnType[first.extras.length];
            for (int i = 0; i < types.length; i++) {
                types[i] = first.extras[i].finalType();
            }
            second = new PanelSecondPass(upload, first.layout, types, first.dates, first.rowsRead, securityIds, sink,
                    errors, meter);
            second.run(PanelSecondPass.plan(first.dates, rowBudget), FIRST_PASS_SHARE_BEFORE_EMIT);
        }
        long rejected = first.rowsRejected + (second == null ? 0 : second.duplicateRows());
        meter.finish(first.rowsRead, rejected, second == null ? 0 : second.rowsEmitted());
        return result(upload, first, errors, second);
    }

    private static PanelParseResult result(PanelUpload upload, PanelFirstPass first, ErrorCollector errors,
                                           PanelSecondPass second) {
        Map<String, ColumnType> newColumns = new LinkedHashMap<>();
        Map<String, ColumnSummary> columns = new LinkedHashMap<>();
        columns.put(PanelUpload.RETURN, first.returns.summary(ColumnType.NUMBER));
        if (first.layout != null && first.layout.marketCapField >= 0) {
            columns.put(PanelUpload.MARKET_CAP, first.marketCaps.summary(ColumnType.NUMBER));
        }
        for (ExtraColumn column : first.extras) {
            if (column.existingType == null) {
                newColumns.put(column.name, column.finalType());
            }
            columns.put(column.name, column.tally.summary(column.finalType()));
        }
        Map<String, ColumnType> schema = new LinkedHashMap<>(upload.existingSchema());
        schema.putAll(newColumns);
        List<LocalDate> dates = first.dates.ascendingDates();
        long rejected = first.rowsRejected + (second == null ? 0 : second.duplicateRows());
        UploadStats stats = stats(first.dates, dates, second == null ? -1 : second.distinctSecurities(), columns);
        return new PanelParseResult(errors.errors(), errors.total(), first.rowsRead, first.rowsRead - rejected,
                rejected, Collections.unmodifiableMap(schema), Collections.unmodifiableMap(newColumns), dates, stats,
                second == null ? 0 : second.rowsEmitted());
    }

    private static UploadStats stats(DateTable table, List<LocalDate> dates, int securities,
                                     Map<String, ColumnSummary> columns) {
        int n = table.size();
        int min = n == 0 ? 0 : Integer.MAX_VALUE;
        int max = 0;
        long total = 0;
        for (int i = 0; i < n; i++) {
            min = Math.min(min, table.count(i));
            max = Math.max(max, table.count(i));
            total += table.count(i);
        }
        return new UploadStats(n, n == 0 ? null : dates.get(0), n == 0 ? null : dates.get(n - 1), min, max,
                n == 0 ? Double.NaN : (double) total / n, securities, columns);
    }
}
