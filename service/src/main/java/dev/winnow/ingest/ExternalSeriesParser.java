package dev.winnow.ingest;

import dev.winnow.stats.ReturnSeries;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.Map;
import java.util.TreeMap;
import java.util.zip.ZipException;

/**
 * Parses an external return series upload: CSV (RFC 4180, optionally gzip) with exactly the columns {@code date}
 * and {@code return}, one row per date, rows in any order. Same cell rules as panel uploads, except that a return
 * may not be missing: a series leaves a missing period out. Series are small, so the rows are held in memory.
 */
public final class ExternalSeriesParser {

    static final String COLUMNS = "date and return";

    /**
     * @param mode     append: every date after {@code lastDate}; revise: any dates
     * @param lastDate the series' last stored date, null for a new series
     */
    public SeriesParseResult parse(Path file, boolean gzip, UploadMode mode, LocalDate lastDate) throws IOException {
        if (mode == null) {
            throw new IllegalArgumentException("mode is required: APPEND or REVISE");
        }
        ErrorCollector errors = new ErrorCollector();
        Rows rows = new Rows(mode, lastDate, errors);
        try (InputStream in = Gzip.decompressedIf(gzip, DirectFile.open(file))) {
            rows.read(new CsvTokenizer(in));
        } catch (CsvTokenizer.RecordTooLongException tooLong) {
            rows.reject(tooLong.line(), null, Messages.recordTooLong(CsvTokenizer.MAX_RECORD_BYTES));
        } catch (ZipException | EOFException badGzip) {
            if (!gzip) {
                throw badGzip;
            }
            errors.add(Math.max(1, rows.line), null, Messages.notGzip(badGzip.getMessage()));
        }
        ReturnSeries series = ReturnSeries.empty();
        if (errors.isEmpty()) {
            series = new ReturnSeries(rows.byDate.keySet().toArray(LocalDate[]::new),
                    rows.byDate.values().stream().mapToDouble(Double::doubleValue).toArray());
        }
        return new SeriesParseResult(errors.errors(), errors.total(), rows.read, rows.read - rows.rejected,
                rows.rejected, series);
    }

    /** The row-by-row checks and the accepted rows. */
    private static final class Rows {

        private final ErrorCollector errors;
        private final DateRule dateRule;
        private final NumberCell number = new NumberCell();
        private final Map<LocalDate, Long> firstLines = new HashMap<>();
        final TreeMap<LocalDate, Double> byDate = new TreeMap<>();
        long read;
        long rejected;
        long line;
        private boolean rowFailed;

        Rows(UploadMode mode, LocalDate lastDate, ErrorCollector errors) {
            this.dateRule = new DateRule(mode, lastDate);
            this.errors = errors;
        }

        void read(CsvTokenizer csv) throws IOException {
            HeaderRow header = HeaderRow.read(csv, errors, COLUMNS);
            if (header == null || !hasExactColumns(header)) {
                return;
            }
            int dateField = header.indexOf(PanelUpload.DATE);
            int returnField = header.indexOf(PanelUpload.RETURN);
            while (HeaderRow.nextNonBlank(csv)) {
                read++;
                line = csv.recordLine();
                rowFailed = false;
                UploadError shapeProblem = RecordShape.problem(csv, header);
                if (shapeProblem != null) {
                    fail(shapeProblem.column(), shapeProblem.message());
                } else {
                    LocalDate date = date(csv, dateField);
                    double value = value(csv, returnField);
                    if (!rowFailed) {
                        byDate.put(date, value);
                    }
                }
                rejected += rowFailed ? 1 : 0;
            }
            if (read == 0 && errors.isEmpty()) {
                errors.add(header.line() + 1, null, Messages.noDataRows());
            }
        }

        void reject(long atLine, String column, String message) {
            read++;
            rejected++;
            errors.add(atLine, column, message);
        }

        private boolean hasExactColumns(HeaderRow header) {
            boolean ok = true;
            for (String required : new String[] {PanelUpload.DATE, PanelUpload.RETURN}) {
                if (header.indexOf(required) < 0) {
                    errors.add(header.line(), required, Messages.missingColumn(required, COLUMNS));
                    ok = false;
                }
            }
            for (String name : header.names()) {
                if (!PanelUpload.DATE.equals(name) && !PanelUpload.RETURN.equals(name)) {
                    errors.add(header.line(), name, Messages.unexpectedColumn(name, COLUMNS));
                    ok = false;
                }
            }
            return ok;
        }

        private LocalDate date(CsvTokenizer csv, int field) {
            String problem = dateRule.check(csv, field);
            if (problem != null) {
                fail(PanelUpload.DATE, problem);
            }
            LocalDate date = dateRule.date();
            if (date != null) {
                Long first = firstLines.putIfAbsent(date, line);
                if (first != null) {
                    fail(PanelUpload.DATE, Messages.duplicateDate(date, first));
                }
            }
            return date;
        }

        private double value(CsvTokenizer csv, int field) {
            String text = csv.text(field).strip();
            switch (number.read(csv.buffer(), csv.start(field), csv.end(field))) {
                case EMPTY -> fail(PanelUpload.RETURN, Messages.emptyCell(PanelUpload.RETURN, "0.0125"));
                case TEXT -> fail(PanelUpload.RETURN, Messages.notANumber(PanelUpload.RETURN, text));
                case NON_FINITE -> fail(PanelUpload.RETURN, Messages.notFinite(text));
                case NUMBER -> {
                    if (number.value() < -1) {
                        fail(PanelUpload.RETURN, Messages.returnBelowMinusOne(text));
                    }
                }
            }
            return number.value();
        }

        private void fail(String column, String message) {
            rowFailed = true;
            errors.add(line, column, message);
        }
    }
}
