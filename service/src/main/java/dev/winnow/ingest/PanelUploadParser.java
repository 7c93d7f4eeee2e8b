package dev.winnow.ingest;

import java.io.IOException;
import java.time.LocalDate;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Parses a panel upload (CSV, optionally gzip) within a small, bounded heap.
 *
 * <p>When the file keeps each date's rows together with the dates ascending (the usual export order), one pass on all
 * cores does everything ({@link ChunkedPanelParse}): it checks every cell and hands each date's cross-section to the
 * sink as soon as that date's rows end. Otherwise, or when that pass finds out that the file does not suit it, the
 * sink discards what it received and the file is read in two streaming passes:
 *
 * <p>Pass 1 checks the header and every cell, infers the types of new columns and records the dates. When it finds
 * any problem the parse ends there, and the result lists up to 100 problems with their line numbers. Otherwise pass
 * 2 reads the file again (once, or once per range of dates when the rows of a date are scattered or the dates are not
 * in order; see {@link #PanelUploadParser(int)}) and hands one {@link dev.winnow.construct.CrossSection} per date to
 * the sink in ascending date order, security ids from {@link SecurityIds}, rows sorted by id.
 *
 * <p>Both ways give the same result, cross-sections and errors. A security twice at the same date is reported only
 * when the file has no other problem. The sink may have received some dates' cross-sections before a problem shows
 * (none are sent after the first such date), so the caller must stage what the sink receives and publish only an
 * {@link PanelParseResult#accepted() accepted} result.
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
    private final int chunkBytes;
    private final int workers;

    public PanelUploadParser() {
        this(DEFAULT_ROW_BUDGET);
    }

    /**
     * With the one-pass path's chunk size and worker threads given (tests make chunks tiny to put boundaries
     * everywhere); 0 workers turns the one-pass path off.
     */
    PanelUploadParser(int rowBudget, int chunkBytes, int workers) {
        this(rowBudget, requirePositive(chunkBytes), Math.max(0, workers), true);
    }

    private static int requirePositive(int chunkBytes) {
        if (chunkBytes < 1) {
            throw new IllegalArgumentException("chunkBytes must be positive, got " + chunkBytes);
        }
        return chunkBytes;
    }

    /**
     * @param rowBudget rows the second pass may hold at once when the file is not in date order; fewer means more
     *                  reads of the file. A date with more rows than this is still held whole.
     */
    public PanelUploadParser(int rowBudget) {
        this(rowBudget, ChunkedPanelParse.CHUNK_BYTES, Math.max(2, Runtime.getRuntime().availableProcessors()), true);
    }

    private PanelUploadParser(int rowBudget, int chunkBytes, int workers, boolean checked) {
        if (rowBudget < 1) {
            throw new IllegalArgumentException("rowBudget must be at least 1, got " + rowBudget);
        }
        this.rowBudget = rowBudget;
        this.chunkBytes = chunkBytes;
        this.workers = workers;
    }

    /** Pass 1 only: checks the upload and infers its schema and dates without sending any rows. */
    public PanelParseResult validate(PanelUpload upload, ProgressListener progress) throws IOException {
        ErrorCollector errors = new ErrorCollector();
        ProgressMeter meter = new ProgressMeter(progress, upload.file());
        PanelFirstPass first = new PanelFirstPass(upload, errors, meter);
        first.run(1.0);
        meter.finish(first.rowsRead, first.rowsRejected, 0);
        return result(upload, first, errors, -1, 0, 0);
    }

    /**
     * Checks the upload and, when it has no problem, sends its cross-sections to {@code sink}: in one pass on all
     * cores when the file keeps each date's rows together in ascending date order ({@link ChunkedPanelParse}),
     * otherwise in the two passes described above. When the one-pass path finds out late that the file does not
     * suit it, the sink is told to {@link CrossSectionSink#discardAccepted() discard} what it received and the
     * two passes run; {@code securityIds} is still asked once per distinct code.
     *
     * @throws SinkException when {@code securityIds} or {@code sink} throws; the upload is then incomplete
     * @throws IOException   when the file cannot be read (a corrupt gzip stream is reported as an upload error)
     */
    public PanelParseResult parse(PanelUpload upload, SecurityIds securityIds, CrossSectionSink sink,
                                  ProgressListener progress) throws IOException, SinkException {
        CachedSecurityIds ids = new CachedSecurityIds(securityIds);
        ProgressMeter meter = new ProgressMeter(progress, upload.file());
        if (workers > 0) {
            ErrorCollector errors = new ErrorCollector();
            try {
                ChunkedPanelParse.Outcome one = new ChunkedPanelParse(upload, errors, meter, new java.util.HashMap<>(), ids,
                        sink, chunkBytes, workers).run();
                long rejected = one.whole().rowsRejected + one.duplicateRows();
                meter.finish(one.whole().rowsRead, rejected, one.rowsEmitted());
                return result(upload, one.whole(), errors, one.distinctSecurities(), one.duplicateRows(), one.rowsEmitted());
            } catch (ChunkedPanelParse.Unsuitable twoPassesNeeded) {
                try {
                    sink.discardAccepted();
                } catch (Exception storeFailure) {
                    throw new SinkException(storeFailure);
                }
            } catch (InterruptedException interrupted) {
                Thread.currentThread().interrupt();
                throw new java.io.InterruptedIOException("the upload parse was interrupted");
            }
        }
        return twoPasses(upload, ids, sink, meter);
    }

    private PanelParseResult twoPasses(PanelUpload upload, SecurityIds securityIds, CrossSectionSink sink,
                                       ProgressMeter meter) throws IOException, SinkException {
        ErrorCollector errors = new ErrorCollector();
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
        long duplicates = second == null ? 0 : second.duplicateRows();
        long emitted = second == null ? 0 : second.rowsEmitted();
        meter.finish(first.rowsRead, first.rowsRejected + duplicates, emitted);
        return result(upload, first, errors, second == null ? -1 : second.distinctSecurities(), duplicates, emitted);
    }

    /** Asks the delegate once per distinct code over both the one-pass attempt and the two passes. */
    private static final class CachedSecurityIds implements SecurityIds {
        private final SecurityIds delegate;
        private final java.util.Map<String, Integer> ids = new java.util.HashMap<>();

        CachedSecurityIds(SecurityIds delegate) {
            this.delegate = delegate;
        }

        @Override
        public int idFor(String code) throws Exception {
            Integer id = ids.get(code);
            if (id == null) {
                id = delegate.idFor(code);
                ids.put(code, id);
            }
            return id;
        }
    }

    private static PanelParseResult result(PanelUpload upload, PanelFirstPass first, ErrorCollector errors,
                                           int distinctSecurities, long duplicateRows, long rowsEmitted) {
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
        long rejected = first.rowsRejected + duplicateRows;
        UploadStats stats = stats(first.dates, dates, distinctSecurities, columns);
        return new PanelParseResult(errors.errors(), errors.total(), first.rowsRead, first.rowsRead - rejected,
                rejected, Collections.unmodifiableMap(schema), Collections.unmodifiableMap(newColumns), dates, stats,
                rowsEmitted);
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
