package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import dev.winnow.store.Limits;
import dev.winnow.store.SliceDecimals;
import java.io.IOException;
import java.io.InputStream;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Second pass over a panel upload that passed the first: hands one {@link CrossSection} per date to the sink in
 * ascending date order.
 *
 * <p>The dates are split into ranges scanned one file read each. When the first pass saw every date's rows in one
 * block with the blocks in ascending order, one range holds all dates and one read suffices: each date's block
 * is complete, and emitted, before the next one starts, so one date's rows are held at a time. Otherwise consecutive
 * dates (in date order) are grouped so each range holds at most {@code rowBudget} rows (a date with more rows gets a
 * range of its own), and the file is read once per range, keeping only that range's rows.
 */
final class PanelSecondPass {

    /** Texts kept for sharing between rows; past this many distinct texts, new ones are not shared. */
    private static final int MAX_SHARED_TEXTS = 200_000;

    private final PanelUpload upload;
    private final PanelLayout layout;
    private final DateTable dates;
    private final SecurityIds securityIds;
    private final CrossSectionSink sink;
    private final ErrorCollector errors;
    private final ProgressMeter meter;
    private final long rowsRead;

    private final int[] numberFields;
    private final String[] numberNames;
    private final int[] labelFields;
    private final String[] labelNames;

    private final NumberCell number = new NumberCell();
    private final DateCell dateCell = new DateCell();
    private final Map<String, Integer> idsByCode = new HashMap<>();
    private final TextCache texts = new TextCache(MAX_SHARED_TEXTS);
    private final Map<Integer, String> codesById = new HashMap<>();

    private long rowsEmitted;
    private long duplicateRows;
    private boolean emitting = true;
    /** Set by a problem that ends the parse (a date past {@link Limits#MAX_ROWS_PER_DATE}): no more reads. */
    private boolean stopped;

    PanelSecondPass(PanelUpload upload, PanelLayout layout, ColumnType[] extraTypes, DateTable dates, long rowsRead,
                    SecurityIds securityIds, CrossSectionSink sink, ErrorCollector errors, ProgressMeter meter) {
        this.upload = upload;
        this.layout = layout;
        this.dates = dates;
        this.rowsRead = rowsRead;
        this.securityIds = securityIds;
        this.sink = sink;
        this.errors = errors;
        this.meter = meter;
        List<Integer> numericExtras = new ArrayList<>();
        List<Integer> labelExtras = new ArrayList<>();
        for (int i = 0; i < extraTypes.length; i++) {
            (extraTypes[i] == ColumnType.NUMBER ? numericExtras : labelExtras).add(i);
        }
        numberFields = numericExtras.stream().mapToInt(i -> layout.extraFields[i]).toArray();
        numberNames = numericExtras.stream().map(i -> layout.extraNames[i]).toArray(String[]::new);
        labelFields = labelExtras.stream().mapToInt(i -> layout.extraFields[i]).toArray();
        labelNames = labelExtras.stream().map(i -> layout.extraNames[i]).toArray(String[]::new);
    }

    /** Groups of date indexes, each ascending by date, the groups in ascending order; one file read per group. */
    static List<int[]> plan(DateTable dates, int rowBudget) {
        int[] ascending = dates.ascendingIndexes();
        if (dates.inDateOrder()) {
            return List.of(ascending);
        }
        List<int[]> ranges = new ArrayList<>();
        int from = 0;
        long rows = 0;
        for (int k = 0; k < ascending.length; k++) {
            int count = dates.count(ascending[k]);
            if (k > from && rows + count > rowBudget) {
                ranges.add(Arrays.copyOfRange(ascending, from, k));
                from = k;
                rows = 0;
            }
            rows += count;
        }
        if (from < ascending.length) {
            ranges.add(Arrays.copyOfRange(ascending, from, ascending.length));
        }
        return ranges;
    }

    /** Runs the scans of the plan over the progress fractions [start, 1). */
    void run(List<int[]> plan, double start) throws IOException, SinkException {
        double share = (1 - start) / plan.size();
        for (int r = 0; r < plan.size() && !stopped; r++) {
            try (InputStream in = meter.open(upload.file(), upload.gzip(), start + r * share, share)) {
                scan(new CsvTokenizer(in), plan.get(r));
            }
        }
    }

    long rowsEmitted() {
        return rowsEmitted;
    }

    long duplicateRows() {
        return duplicateRows;
    }

    int distinctSecurities() {
        return idsByCode.size();
    }

    private void scan(CsvTokenizer csv, int[] range) throws IOException, SinkException {
        int[] slotOfDate = new int[dates.size()];
        Arrays.fill(slotOfDate, -1);
        for (int slot = 0; slot < range.length; slot++) {
            slotOfDate[range[slot]] = slot;
        }
        DateBlock[] blocks = new DateBlock[range.length];
        int nextToEmit = 0;
        long rowsSeen = 0;
        HeaderRow.nextNonBlank(csv);
        while (HeaderRow.nextNonBlank(csv)) {
            if (++rowsSeen % ProgressMeter.REPORT_EVERY == 0) {
                meter.report(rowsRead, duplicateRows, rowsEmitted);
            }
            byte[] b = csv.buffer();
            LocalDate date = dateCell.read(b, csv.start(layout.dateField), csv.end(layout.dateField));
            int dateIndex = date == null ? -1 : dates.indexOf(date);
            if (dateIndex < 0 || csv.fieldCount() != layout.width()) {
                throw fileChanged();
            }
            int slot = slotOfDate[dateIndex];
            if (slot < 0) {
                continue;
            }
            DateBlock block = blocks[slot];
            if (block == null) {
                block = new DateBlock(Math.min(dates.count(dateIndex), Limits.MAX_ROWS_PER_DATE), numberFields.length, labelFields.length);
                blocks[slot] = block;
            }
            if (block.isFull()) {
                if (dates.count(dateIndex) > Limits.MAX_ROWS_PER_DATE) {
                    tooManyRows(dateIndex, block, csv.recordLine());
                    return;
                }
                throw fileChanged();
            }
            addRow(csv, block);
            if (block.isFull()) {
                while (nextToEmit < range.length && blocks[nextToEmit] != null && blocks[nextToEmit].isFull()) {
                    emit(range[nextToEmit], blocks[nextToEmit]);
                    blocks[nextToEmit++] = null;
                }
            }
        }
        if (nextToEmit != range.length) {
            throw fileChanged();
        }
    }

    /**
     * A date with more rows than one date may hold: the rows held so far are checked for repeated securities (an
     * upload of one row repeated gets its line-numbered duplicate errors), else the date is reported as too large.
     * Either way the parse ends here, so memory stays bounded by the limit.
     */
    private void tooManyRows(int dateIndex, DateBlock block, long line) {
        LocalDate date = dates.date(dateIndex);
        CrossSection held = block.toCrossSection(date, numberNames, labelNames, (securityId, firstLine, dupLine) -> {
            duplicateRows++;
            if (errors.keeps(dupLine)) {
                errors.add(dupLine, PanelUpload.SECURITY, Messages.duplicateSecurity(codeOf(securityId), date, firstLine));
            } else {
                errors.countOnly(1);
            }
        });
        if (held != null) {
            errors.add(line, PanelUpload.DATE, Messages.tooManyRowsAtDate(date, Limits.MAX_ROWS_PER_DATE));
        }
        emitting = false;
        stopped = true;
    }

    private void addRow(CsvTokenizer csv, DateBlock block) throws SinkException {
        int k = block.size++;
        block.lines[k] = csv.recordLine();
        block.ids[k] = idOf(csv, layout.securityField);
        block.returns[k] = numberAt(csv, layout.returnField);
        block.marketCaps[k] = layout.marketCapField < 0 ? Double.NaN : numberAt(csv, layout.marketCapField);
        for (int c = 0; c < numberFields.length; c++) {
            block.numbers[c][k] = numberAt(csv, numberFields[c]);
        }
        for (int c = 0; c < labelFields.length; c++) {
            block.labels[c][k] = trimmed(csv, labelFields[c]);
        }
    }

    private double numberAt(CsvTokenizer csv, int field) {
        number.read(csv.buffer(), csv.start(field), csv.end(field));
        return number.value();
    }

    private int idOf(CsvTokenizer csv, int field) throws SinkException {
        String code = trimmed(csv, field);
        return idFor(idsByCode, securityIds, code);
    }

    /** The cell's text without surrounding spaces and tabs, shared between equal cells; null when empty. */
    private String trimmed(CsvTokenizer csv, int field) {
        byte[] b = csv.buffer();
        int s = Cells.trimStart(b, csv.start(field), csv.end(field));
        int e = Cells.trimEnd(b, s, csv.end(field));
        return s == e ? null : texts.text(b, s, e);
    }

    private void emit(int dateIndex, DateBlock block) throws SinkException {
        LocalDate date = dates.date(dateIndex);
        CrossSection crossSection = block.toCrossSection(date, numberNames, labelNames,
                (securityId, firstLine, line) -> {
                    duplicateRows++;
                    if (errors.keeps(line)) {
                        errors.add(line, PanelUpload.SECURITY,
                                Messages.duplicateSecurity(codeOf(securityId), date, firstLine));
                    } else {
                        errors.countOnly(1);
                    }
                });
        if (crossSection == null) {
            emitting = false;
            return;
        }
        if (!emitting) {
            return;
        }
        rowsEmitted += emit(sink, crossSection);
    }

    /** The code behind an id, by a reverse map built when the first duplicate needs it. */
    private String codeOf(int securityId) {
        return codeOf(idsByCode, codesById, securityId);
    }

    /** The code behind an id, by a reverse map ({@code codesById}, rebuilt when codes were added) of {@code idsByCode}. */
    /** The id of a security code: from {@code idsByCode} when seen before, else from the store, then remembered. */
    static int idFor(Map<String, Integer> idsByCode, SecurityIds securityIds, String code) throws SinkException {
        Integer id = idsByCode.get(code);
        if (id == null) {
            try {
                id = securityIds.idFor(code);
            } catch (Exception storeFailure) {
                throw new SinkException(storeFailure);
            }
            idsByCode.put(code, id);
        }
        return id;
    }

    /** Hands one cross-section to the sink; returns its rows. */
    static int emit(CrossSectionSink sink, CrossSection crossSection) throws SinkException {
        return emit(sink, crossSection, null);
    }

    /** Hands one cross-section and the decimal forms of its numbers (may be null) to the sink; returns its rows. */
    static int emit(CrossSectionSink sink, CrossSection crossSection, SliceDecimals decimals) throws SinkException {
        try {
            sink.accept(crossSection, decimals);
        } catch (Exception storeFailure) {
            throw new SinkException(storeFailure);
        }
        return crossSection.size();
    }

    static String codeOf(Map<String, Integer> idsByCode, Map<Integer, String> codesById, int securityId) {
        if (codesById.size() != idsByCode.size()) {
            codesById.clear();
            idsByCode.forEach((code, id) -> codesById.put(id, code));
        }
        return codesById.getOrDefault(securityId, String.valueOf(securityId));
    }

    private static IllegalStateException fileChanged() {
        return new IllegalStateException("the upload file changed between the first and the second pass");
    }
}
