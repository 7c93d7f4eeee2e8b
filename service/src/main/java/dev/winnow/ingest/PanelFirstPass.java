package dev.winnow.ingest;

import dev.winnow.store.Limits;
import dev.winnow.store.SliceDecimals;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.time.LocalDate;
import java.util.BitSet;
import java.util.zip.ZipException;

/**
 * First pass over a panel upload: checks the header and every cell, infers the types of new columns, and records
 * the distinct dates with their row counts and file order. Keeps no rows: memory grows with dates and columns only.
 */
final class PanelFirstPass {

    private final PanelUpload upload;
    private final ErrorCollector errors;
    private final ProgressMeter meter;
    private final NumberCell number = new NumberCell();
    private final DateRule dateRule;

    final DateTable dates = new DateTable();
    final ColumnTally returns = new ColumnTally();
    final ColumnTally marketCaps = new ColumnTally();
    /** Null when the header failed its checks. */
    PanelLayout layout;
    ExtraColumn[] extras = new ExtraColumn[0];
    long rowsRead;
    long rowsRejected;

    private long line;
    private boolean rowFailed;
    private int[] rowDeferred = new int[0];
    private int rowDeferredCount;
    /** Told about every row without a problem, with what its cells hold; null when nobody listens. */
    private RowListener listener;
    private LocalDate rowDate;
    private double rowReturn;
    private double rowCap;
    /** The numbers read from the extra columns of the current row (NaN for labels and missing cells). */
    double[] rowNumbers = new double[0];
    /** Their decimal forms ({@link NumberCell#decimal()}), and those of the return and market cap. */
    long[] rowForms = new long[0];
    private long rowReturnForm;
    private long rowCapForm;

    /**
     * Receives the rows of a scan that have no problem (so far: see {@link ExtraColumn} on deferred cells), with the
     * decimal forms of their numbers ({@link NumberCell#decimal()}; {@code forms} parallel to {@code numbers}).
     */
    interface RowListener {
        void row(CsvTokenizer csv, long line, LocalDate date, double ret, double cap, double[] numbers,
                 long retForm, long capForm, long[] forms);
    }

    PanelFirstPass(PanelUpload upload, ErrorCollector errors, ProgressMeter meter) {
        this.upload = upload;
        this.errors = errors;
        this.meter = meter;
        this.dateRule = new DateRule(upload.mode(), upload.lastDate());
    }

    void run(double progressShare) throws IOException {
        try (InputStream in = meter.open(upload.file(), upload.gzip(), 0, progressShare)) {
            CsvTokenizer csv = new CsvTokenizer(in);
            HeaderRow header = HeaderRow.read(csv, errors, PanelLayout.REQUIRED_COLUMNS);
            if (header == null || (layout = PanelLayout.of(header, errors)) == null) {
                return;
            }
            extras = extraColumns(layout);
            rowDeferred = new int[extras.length];
            rowNumbers = new double[extras.length];
            rowForms = new long[extras.length];
            scanRows(csv);
            if (rowsRead == 0 && errors.isEmpty()) {
                errors.add(header.line() + 1, null, Messages.noDataRows());
            }
        } catch (CsvTokenizer.RecordTooLongException tooLong) {
            if (layout != null) {
                rowsRead++;
                rowsRejected++;
            }
            errors.add(tooLong.line(), null, Messages.recordTooLong(CsvTokenizer.MAX_RECORD_BYTES));
        } catch (ZipException | EOFException badGzip) {
            if (!upload.gzip()) {
                throw badGzip;
            }
            errors.add(Math.max(1, line), null, Messages.notGzip(badGzip.getMessage()));
        }
        settleDeferred();
    }

    /**
     * Scans the records of one chunk of the file (no header) with the given layout, telling {@code rowListener}
     * about each row without a problem. Lines are counted from the tokenizer's start (1); deferred cells are not
     * settled ({@link #mergeChunk} and {@link #settle} do that for the whole file).
     */
    void scanChunk(CsvTokenizer csv, PanelLayout chunkLayout, RowListener rowListener) throws IOException {
        layout = chunkLayout;
        listener = rowListener;
        extras = extraColumns(layout);
        rowDeferred = new int[extras.length];
        rowNumbers = new double[extras.length];
        rowForms = new long[extras.length];
        scanRows(csv);
    }

    /**
     * Adds a later chunk's counts, tallies, dates, column states and errors to this whole-file pass; the chunk's
     * lines start at {@code lineOffset + 1} and its rows at index {@code rowOffset} of the file.
     */
    void mergeChunk(PanelFirstPass chunk, ErrorCollector chunkErrors, long lineOffset, long rowOffset) {
        for (UploadError e : chunkErrors.errors()) {
            errors.add(e.line() + lineOffset, e.column(), e.message());
        }
        errors.countOnly(chunkErrors.total() - chunkErrors.errors().size());
        rowsRead += chunk.rowsRead;
        rowsRejected += chunk.rowsRejected;
        returns.merge(chunk.returns);
        marketCaps.merge(chunk.marketCaps);
        dates.absorb(chunk.dates);
        for (int i = 0; i < extras.length; i++) {
            extras[i].merge(chunk.extras[i], lineOffset, rowOffset);
        }
    }

    /** Once every chunk is merged: settles the deferred cells (see {@link #run}). */
    void settle() {
        settleDeferred();
    }

    /** Starts a whole-file pass for chunks: the header's layout, no rows yet. */
    void startChunked(PanelLayout chunkLayout) {
        layout = chunkLayout;
        extras = extraColumns(layout);
    }

    private ExtraColumn[] extraColumns(PanelLayout layout) {
        ExtraColumn[] columns = new ExtraColumn[layout.extraFields.length];
        for (int i = 0; i < columns.length; i++) {
            String name = layout.extraNames[i];
            columns[i] = new ExtraColumn(name, layout.extraFields[i], upload.existingSchema().get(name));
        }
        return columns;
    }

    private void scanRows(CsvTokenizer csv) throws IOException {
        while (HeaderRow.nextNonBlank(csv)) {
            line = csv.recordLine();
            rowFailed = false;
            rowDeferredCount = 0;
            rowsRead++;
            UploadError shapeProblem = RecordShape.problem(csv, layout.header);
            if (shapeProblem != null) {
                fail(shapeProblem.column(), shapeProblem.message());
            } else {
                checkCells(csv);
            }
            finishRow();
            if (listener != null && !rowFailed) {
                listener.row(csv, line, rowDate, rowReturn, rowCap, rowNumbers, rowReturnForm, rowCapForm, rowForms);
            }
            if (rowsRead % ProgressMeter.REPORT_EVERY == 0) {
                meter.report(rowsRead, rowsRejected, 0);
            }
            if (csv.unterminatedQuote()) {
                return;
            }
        }
    }

    private void checkCells(CsvTokenizer csv) {
        checkDate(csv, layout.dateField);
        checkSecurity(csv, layout.securityField);
        double r = checkNumber(csv, layout.returnField, PanelUpload.RETURN, returns);
        if (r < -1) {
            fail(PanelUpload.RETURN, Messages.returnBelowMinusOne(trimmedText(csv, layout.returnField)));
        }
        rowReturn = r;
        rowReturnForm = number.decimal();
        rowCap = Double.NaN;
        rowCapForm = SliceDecimals.NONE;
        if (layout.marketCapField >= 0) {
            double cap = checkNumber(csv, layout.marketCapField, PanelUpload.MARKET_CAP, marketCaps);
            rowCapForm = number.decimal();
            if (cap <= 0) {
                fail(PanelUpload.MARKET_CAP, Messages.marketCapNotPositive(trimmedText(csv, layout.marketCapField)));
            }
            rowCap = cap;
        }
        for (int i = 0; i < extras.length; i++) {
            ExtraColumn column = extras[i];
            rowNumbers[i] = Double.NaN;
            rowForms[i] = SliceDecimals.NONE;
            if (column.existingType == ColumnType.NUMBER) {
                rowNumbers[i] = checkNumber(csv, column.field, column.name, column.tally);
                rowForms[i] = number.decimal();
            } else if (column.existingType == ColumnType.LABEL || column.sawText) {
                checkLabel(csv, column);
            } else {
                rowNumbers[i] = checkNewColumnCell(csv, column, i);
                rowForms[i] = number.decimal();
            }
        }
    }

    private void checkDate(CsvTokenizer csv, int field) {
        String problem = dateRule.check(csv, field);
        rowDate = dateRule.date();
        if (dateRule.date() != null) {
            dates.record(dateRule.date());
        }
        if (problem != null) {
            fail(PanelUpload.DATE, problem);
        }
    }

    private void checkSecurity(CsvTokenizer csv, int field) {
        byte[] b = csv.buffer();
        int s = Cells.trimStart(b, csv.start(field), csv.end(field));
        int e = Cells.trimEnd(b, s, csv.end(field));
        if (s == e) {
            fail(PanelUpload.SECURITY, Messages.emptyCell(PanelUpload.SECURITY, "ACME01"));
        } else if (!Cells.isValidUtf8(b, s, e)) {
            fail(PanelUpload.SECURITY, Messages.notUtf8());
        } else {
            checkLength(b, s, e, PanelUpload.SECURITY, Limits.MAX_SECURITY_CHARS);
        }
    }

    /** A text cell longer than the limit (in UTF-16 code units, as the store counts) is an error of its row. */
    private void checkLength(byte[] b, int s, int e, String column, int limit) {
        if (e - s > limit) {
            int length = Cells.utf16Length(b, s, e);
            if (length > limit) {
                fail(column, Messages.tooLong(column, length, limit));
            }
        }
    }

    /** Checks a cell of a column that must hold numbers; returns the number, NaN when missing or wrong. */
    private double checkNumber(CsvTokenizer csv, int field, String column, ColumnTally tally) {
        switch (number.read(csv.buffer(), csv.start(field), csv.end(field))) {
            case EMPTY -> tally.missing();
            case NUMBER -> tally.number(number.value());
            case NON_FINITE -> {
                tally.unusableNumber();
                fail(column, Messages.notFinite(trimmedText(csv, field)));
            }
            case TEXT -> {
                tally.text();
                fail(column, Messages.notANumber(column, trimmedText(csv, field)));
            }
        }
        return number.value();
    }

    private void checkLabel(CsvTokenizer csv, ExtraColumn column) {
        byte[] b = csv.buffer();
        int s = Cells.trimStart(b, csv.start(column.field), csv.end(column.field));
        int e = Cells.trimEnd(b, s, csv.end(column.field));
        if (s == e) {
            column.tally.missing();
            return;
        }
        column.tally.text();
        if (!Cells.isValidUtf8(b, s, e)) {
            fail(column.name, Messages.notUtf8());
        } else {
            checkLength(b, s, e, column.name, Limits.MAX_LABEL_CHARS);
        }
        if (!column.sawText) {
            NumberCell.Kind kind = number.read(b, s, e);
            column.sawText = kind == NumberCell.Kind.TEXT;
            column.sawNumber |= !column.sawText;
        }
    }

    /** Checks a cell of a new column whose type is still open; returns its number, NaN when missing or text. */
    private double checkNewColumnCell(CsvTokenizer csv, ExtraColumn column, int index) {
        switch (number.read(csv.buffer(), csv.start(column.field), csv.end(column.field))) {
            case EMPTY -> column.tally.missing();
            case NUMBER -> {
                column.sawNumber = true;
                column.tally.number(number.value());
            }
            case NON_FINITE -> {
                column.sawNumber = true;
                column.tally.unusableNumber();
                column.deferNonFinite(line, trimmedText(csv, column.field));
                rowDeferred[rowDeferredCount++] = index;
            }
            case TEXT -> {
                column.sawText = true;
                column.tally.text();
                if (!Cells.isValidUtf8(csv.buffer(), csv.start(column.field), csv.end(column.field))) {
                    fail(column.name, Messages.notUtf8());
                } else {
                    byte[] b = csv.buffer();
                    int s = Cells.trimStart(b, csv.start(column.field), csv.end(column.field));
                    checkLength(b, s, Cells.trimEnd(b, s, csv.end(column.field)), column.name, Limits.MAX_LABEL_CHARS);
                }
            }
        }
        return number.value();
    }

    private void finishRow() {
        if (rowFailed) {
            rowsRejected++;
            return;
        }
        for (int i = 0; i < rowDeferredCount; i++) {
            extras[rowDeferred[i]].deferRow(rowsRead - 1);
        }
    }

    /** Once every cell is seen: errors for NaN/infinity in new numeric columns, and labels that became numbers. */
    private void settleDeferred() {
        BitSet deferredRejected = new BitSet();
        for (ExtraColumn column : extras) {
            column.settleDeferred(errors, deferredRejected);
            if (column.contradictsSchema()) {
                errors.add(layout.header.line(), column.name, Messages.labelColumnNowNumeric(column.name));
            }
        }
        rowsRejected += deferredRejected.cardinality();
    }

    private void fail(String column, String message) {
        rowFailed = true;
        errors.add(line, column, message);
    }

    private static String trimmedText(CsvTokenizer csv, int field) {
        return csv.text(field).strip();
    }
}
