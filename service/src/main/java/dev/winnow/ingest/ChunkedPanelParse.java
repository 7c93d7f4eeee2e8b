package dev.winnow.ingest;

import dev.winnow.construct.CrossSection;
import dev.winnow.store.Limits;

import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.time.LocalDate;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.Deque;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.zip.ZipException;

/**
 * The one-pass parse of a panel upload whose dates come in ascending blocks (every date's rows together, the usual
 * export order), on all cores: a reader cuts the (decompressed) file into chunks of about {@value #CHUNK_BYTES} bytes
 * at line breaks; worker threads check and read each chunk with the same rules as the first pass
 * ({@link PanelFirstPass#scanChunk}); this thread takes the chunks back in file order, adds their errors (with file
 * line numbers) and counts to the whole-file state, maps security codes to ids in order of first appearance, and hands
 * each date's cross-section to the sink as soon as the date's block ends, while the file is still being read.
 * Memory stays bounded: a few chunks in flight and one date's rows.
 *
 * <p>The result equals the two-pass parse's. Where this path cannot guarantee that, it gives up with
 * {@link Unsuitable} before the result is formed, and the caller discards what the sink received and parses the file
 * in two passes: a date that comes back after another date or out of ascending order, a new column whose type the
 * first chunk did not tell (numbers there, text later, or no value at all), a header problem, a chunk boundary inside
 * a quoted field, an unreadable gzip stream, a record longer than the chunk limit, or a date with more than
 * {@value #MAX_ROWS_PER_DATE} rows (the two passes know each date's count before reading its rows, so they hold a
 * large date, or report one past {@link Limits#MAX_ROWS_PER_DATE}, within bounded memory; this path grows its block
 * row by row, doubling, and a block of a million rows with its copy took most of a small heap).
 *
 * <p>New column types are decided by the first chunk: a column with any text there is a label column; otherwise a
 * number column, which the whole file must confirm. Once any error is found no more cross-sections are formed (the
 * upload is rejected), but every chunk is still checked so the first 100 errors in file order and the total are
 * reported.
 */
final class ChunkedPanelParse {

    /** Bytes per chunk: large enough that each chunk holds many dates' rows, small enough to keep memory low. */
    static final int CHUNK_BYTES = 1 << 20;
    /** A single record may not exceed this; longer lines are left to the two-pass parse to report. */
    private static final int MAX_CHUNK_BYTES = CsvTokenizer.MAX_RECORD_BYTES + CHUNK_BYTES;
    private static final Object END = new Object();
    /**
     * The most rows one date may have in this path; a larger date is left to the two passes. Far above any usual
     * cross-section, and a quarter of {@link Limits#MAX_ROWS_PER_DATE}, so the block and its doubling copy stay a few
     * tens of megabytes (a service with a 128 MB heap ran out of memory growing a block towards a million rows).
     */
    static final int MAX_ROWS_PER_DATE = 1 << 18;

    /** The file does not suit the one-pass path; the two-pass parse must run instead. */
    static final class Unsuitable extends Exception {
        Unsuitable(String why) {
            super(why, null, false, false);
        }
    }

    /** What the parse produced, for {@link PanelUploadParser}'s result. */
    record Outcome(PanelFirstPass whole, int distinctSecurities, long duplicateRows, long rowsEmitted) {
    }

    private final PanelUpload upload;
    private final ErrorCollector errors;
    private final ProgressMeter meter;
    private final Map<String, Integer> idsByCode;
    private final SecurityIds securityIds;
    private final CrossSectionSink sink;
    private final int chunkBytes;
    private final int workers;
    /**
     * Chunk buffers the workers are done with, for the reader to fill again: a chunk buffer of a megabyte is a
     * humongous object to G1 with a small heap, and allocating 1,400 of them for a 1.4 GB file cost as much garbage
     * collection as the rest of the ingest. A few chunks are in flight at a time, so a few buffers go round.
     */
    private final BlockingQueue<byte[]> spareBuffers;
    /** Chunks taken back, whose row arrays the next chunks' rows reuse ({@link ChunkRows#ChunkRows}). */
    private final BlockingQueue<ChunkRows> spareRows;

    private PanelLayout layout;
    private PanelFirstPass whole;
    /** Per extra column (header order): read as numbers, as labels (both for the first chunk's new columns). */
    private boolean[] numberColumn;
    private boolean[] labelColumn;
    private int[] numberSlot;
    private int[] labelSlot;
    private String[] numberNames;
    private String[] labelNames;

    private long lineOffset;
    private long rowOffset;
    private DateBlock block;
    private int lastBlockRows = 16;
    private LocalDate blockDate;
    private long rowsEmitted;
    private long duplicateRows;
    /** Duplicate (date, security) rows, reported only when the file has no other problem (as the second pass does). */
    private final ErrorCollector duplicates = new ErrorCollector();
    private boolean emitting = true;
    private int distinctSecurities = -1;

    ChunkedPanelParse(PanelUpload upload, ErrorCollector errors, ProgressMeter meter, Map<String, Integer> idsByCode,
                      SecurityIds securityIds, CrossSectionSink sink, int chunkBytes, int workers) {
        this.upload = upload;
        this.errors = errors;
        this.meter = meter;
        this.idsByCode = idsByCode;
        this.securityIds = securityIds;
        this.sink = sink;
        this.chunkBytes = chunkBytes;
        this.workers = workers;
        this.spareBuffers = new ArrayBlockingQueue<>(2 * workers + 2);
        this.spareRows = new ArrayBlockingQueue<>(workers + 1);
    }

    /** One chunk of the decompressed file, cut after a line break (the last one may end anywhere). */
    private record Chunk(byte[] bytes, int from, int length, boolean last) {
    }

    Outcome run() throws IOException, SinkException, Unsuitable, InterruptedException {
        BlockingQueue<Object> chunks = new ArrayBlockingQueue<>(workers);
        ExecutorService pool = Executors.newFixedThreadPool(workers, r -> {
            Thread t = new Thread(r, "upload-parse");
            t.setDaemon(true);
            return t;
        });
        try (InputStream in = open()) {
            Thread reader = new Thread(() -> read(in, chunks), "upload-read");
            reader.setDaemon(true);
            reader.start();
            try {
                parse(chunks, pool);
            } finally {
                reader.interrupt();
                in.close();
                reader.join(10_000);
            }
        } finally {
            pool.shutdownNow();
        }
        return new Outcome(whole, distinctSecurities, duplicateRows, rowsEmitted);
    }

    private InputStream open() throws IOException, Unsuitable {
        try {
            return meter.open(upload.file(), upload.gzip(), 0, 1.0);
        } catch (ZipException | EOFException notGzip) {
            throw new Unsuitable("not gzip data");
        }
    }

    private void parse(BlockingQueue<Object> chunks, ExecutorService pool)
            throws IOException, SinkException, Unsuitable, InterruptedException {
        Chunk first = next(chunks);
        if (first == END_CHUNK) {
            throw new Unsuitable("empty upload");
        }
        CsvTokenizer csv = new CsvTokenizer(first.bytes(), first.from(), first.length());
        ErrorCollector headerErrors = new ErrorCollector();
        HeaderRow header = HeaderRow.read(csv, headerErrors, PanelLayout.REQUIRED_COLUMNS);
        if (header == null || (layout = PanelLayout.of(header, headerErrors)) == null) {
            throw new Unsuitable("header problem");
        }
        long headerEnd = csv.position();
        if (headerEnd > first.length() || (headerEnd == first.length() && !first.last())) {
            throw new Unsuitable("header longer than a chunk");
        }
        whole = new PanelFirstPass(upload, errors, meter);
        whole.startChunked(layout);
        lineOffset = csv.nextLine() - 1;
        planColumns(null);
        ChunkRows rows = scan(new Chunk(first.bytes(), first.from() + (int) headerEnd, first.length() - (int) headerEnd, first.last()), takeCodeTable());
        planColumns(rows.pass.extras);
        add(rows);

        Deque<Future<ChunkRows>> inFlight = new ArrayDeque<>();
        boolean end = first.last();
        while (true) {
            while (!end && inFlight.size() < workers) {
                Object item = inFlight.isEmpty() ? chunks.take() : chunks.poll();
                if (item == null) {
                    break;
                }
                Chunk chunk = unwrap(item);
                if (chunk == END_CHUNK) {
                    end = true;
                    break;
                }
                TextCache codes = takeCodeTable();
                inFlight.add(pool.submit(() -> scan(chunk, codes)));
                end = chunk.last();
            }
            if (inFlight.isEmpty()) {
                break;
            }
            add(await(inFlight.removeFirst()));
        }
        if (errors.isEmpty()) {
            finishBlock();
        }
        whole.settle();
        if (errors.isEmpty()) {
            distinctSecurities = idsByCode.size();
            for (UploadError e : duplicates.errors()) {
                errors.add(e.line(), e.column(), e.message());
            }
            errors.countOnly(duplicates.total() - duplicates.errors().size());
        } else {
            duplicateRows = 0;
        }
        if (rowsTotal() == 0) {
            throw new Unsuitable("no data rows");
        }
        for (int i = 0; i < whole.extras.length; i++) {
            ExtraColumn column = whole.extras[i];
            if (column.existingType == null && (column.finalType() == ColumnType.NUMBER) != (numberSlot[i] >= 0)) {
                throw new Unsuitable("column " + column.name + " changed type after the first chunk");
            }
        }
    }

    private long rowsTotal() {
        return whole.rowsRead;
    }

    private static final Chunk END_CHUNK = new Chunk(new byte[0], 0, 0, true);

    private static Chunk next(BlockingQueue<Object> chunks) throws IOException, Unsuitable, InterruptedException {
        return unwrap(chunks.take());
    }

    private static Chunk unwrap(Object item) throws IOException, Unsuitable {
        if (item == END) {
            return END_CHUNK;
        }
        if (item instanceof Throwable failure) {
            throw rethrown(failure);
        }
        return (Chunk) item;
    }

    private static ChunkRows await(Future<ChunkRows> future) throws IOException, Unsuitable, InterruptedException {
        try {
            return future.get();
        } catch (ExecutionException e) {
            throw rethrown(e.getCause());
        }
    }

    /** Throws a reader's or worker's failure on this thread as what it is (returns only to satisfy the compiler). */
    private static IllegalStateException rethrown(Throwable failure) throws IOException, Unsuitable {
        if (failure instanceof Unsuitable u) {
            throw u;
        }
        if (failure instanceof IOException io) {
            throw io;
        }
        if (failure instanceof RuntimeException r) {
            throw r;
        }
        if (failure instanceof Error err) {
            throw err;
        }
        return new IllegalStateException(failure);
    }

    /** The reader: cuts the stream into chunks after their last line break and queues them, then END. */
    private void read(InputStream in, BlockingQueue<Object> chunks) {
        try {
            byte[] buf = buffer(chunkBytes);
            int filled = 0;
            while (true) {
                int n = in.read(buf, filled, buf.length - filled);
                boolean eof = n < 0;
                if (n > 0) {
                    filled += n;
                    if (filled < buf.length) {
                        continue;
                    }
                }
                if (eof) {
                    chunks.put(filled > 0 ? new Chunk(buf, 0, filled, true) : END);
                    if (filled > 0) {
                        chunks.put(END);
                    }
                    return;
                }
                int cut = lastLineBreak(buf, filled);
                if (cut < 0) {
                    if (buf.length >= MAX_CHUNK_BYTES) {
                        chunks.put(new Unsuitable("a record longer than a chunk"));
                        return;
                    }
                    buf = Arrays.copyOf(buf, buf.length * 2);
                    continue;
                }
                byte[] next = buffer(Math.max(chunkBytes, filled - cut));
                System.arraycopy(buf, cut, next, 0, filled - cut);
                chunks.put(new Chunk(buf, 0, cut, false));
                buf = next;
                filled = filled - cut;
            }
        } catch (InterruptedException stop) {
            Thread.currentThread().interrupt();
        } catch (ZipException | EOFException badGzip) {
            offer(chunks, upload.gzip() ? new Unsuitable("unreadable gzip stream") : badGzip);
        } catch (IOException | RuntimeException | Error e) {
            // whatever ends the reader, the parsing thread is told: it never waits for a chunk that cannot come
            offer(chunks, e);
        }
    }

    /** A spare chunk buffer when one of the usual size is asked for and one is free, else a new one. */
    private byte[] buffer(int size) {
        byte[] spare = size == chunkBytes ? spareBuffers.poll() : null;
        return spare != null ? spare : new byte[size];
    }

    /** Gives a chunk's buffer back once nothing refers to it any more (the rows of a chunk hold no reference to it). */
    private void recycle(byte[] buffer) {
        if (buffer.length == chunkBytes) {
            spareBuffers.offer(buffer);
        }
    }

    private static void offer(BlockingQueue<Object> chunks, Object failure) {
        try {
            chunks.put(failure);
        } catch (InterruptedException stop) {
            Thread.currentThread().interrupt();
        }
    }

    /** The length of the chunk up to and including its last LF, or -1 when it has none. */
    private static int lastLineBreak(byte[] b, int filled) {
        for (int i = filled - 1; i >= 0; i--) {
            if (b[i] == '\n') {
                return i + 1;
            }
        }
        return -1;
    }

    /**
     * Which extra columns to read as numbers and which as labels: by schema for existing columns; for new ones, both
     * while {@code firstChunk} is null (the first chunk), then numbers unless the first chunk saw text.
     */
    private void planColumns(ExtraColumn[] firstChunk) {
        int n = layout.extraFields.length;
        numberColumn = new boolean[n];
        labelColumn = new boolean[n];
        numberSlot = new int[n];
        labelSlot = new int[n];
        int numbers = 0;
        int labels = 0;
        java.util.List<String> numberList = new java.util.ArrayList<>();
        java.util.List<String> labelList = new java.util.ArrayList<>();
        for (int i = 0; i < n; i++) {
            String name = layout.extraNames[i];
            ColumnType existing = upload.existingSchema().get(name);
            ColumnType type = existing != null ? existing
                    : firstChunk == null ? null : firstChunk[i].sawText ? ColumnType.LABEL : ColumnType.NUMBER;
            numberColumn[i] = type != ColumnType.LABEL;
            labelColumn[i] = type != ColumnType.NUMBER;
            numberSlot[i] = type == ColumnType.NUMBER ? numbers++ : -1;
            labelSlot[i] = type == ColumnType.LABEL ? labels++ : -1;
            if (type == ColumnType.NUMBER) {
                numberList.add(name);
            } else if (type == ColumnType.LABEL) {
                labelList.add(name);
            }
        }
        numberNames = numberList.toArray(String[]::new);
        labelNames = labelList.toArray(String[]::new);
    }

    /** A chunk's rows without a problem, column by column, and its pass state. Built by a worker thread. */
    private final class ChunkRows implements PanelFirstPass.RowListener {
        final PanelFirstPass pass;
        final ErrorCollector chunkErrors = new ErrorCollector();
        final boolean[] numbers = numberColumn.clone();
        final boolean[] labels = labelColumn.clone();
        /**
         * The security code table this chunk reads into: one of a few tables that go round the workers and keep
         * their codes from chunk to chunk ({@link #spareCodes}), so a chunk looks its codes up instead of adding
         * 3,000 of them to a new table and mapping each to its id again. Indexes of codes already in the table
         * before this chunk are below {@link #codesBefore}; the texts of those the chunk added are {@link #newCodes}.
         */
        final TextCache codes;
        final int codesBefore;
        String[] newCodes;
        final TextCache[] labelTexts = new TextCache[labels.length];
        final LocalDate[] dateList = new LocalDate[64];
        int dateCount;
        long lineBreaks;
        int n;
        int[] lines;
        int[] dateOf;
        int[] code;
        double[] returns;
        double[] caps;
        double[][] values;
        int[][] labelCodes;
        long[] returnForms;
        long[] capForms;
        long[][] forms;

        /**
         * Rows for a chunk of about {@code expectedRows} rows, read with the code table {@code codes}, in the arrays
         * of {@code done} (a chunk already taken back, or null) when they are large enough and for the same columns:
         * about 2 GB of row arrays were allocated for the 1.4 GB benchmark file, one set per chunk.
         */
        ChunkRows(int expectedRows, ChunkRows done, TextCache codes) {
            this.codes = codes;
            this.codesBefore = codes.size();
            pass = new PanelFirstPass(upload, chunkErrors, ProgressMeter.silent());
            if (done != null && done.lines.length >= expectedRows && Arrays.equals(done.numbers, numbers)
                    && Arrays.equals(done.labels, labels)) {
                lines = done.lines;
                dateOf = done.dateOf;
                code = done.code;
                returns = done.returns;
                caps = done.caps;
                returnForms = done.returnForms;
                capForms = done.capForms;
                values = done.values;
                forms = done.forms;
                labelCodes = done.labelCodes;
                for (int i = 0; i < labels.length; i++) {
                    labelTexts[i] = labels[i] ? new TextCache(Integer.MAX_VALUE) : null;
                }
                return;
            }
            lines = new int[expectedRows];
            dateOf = new int[expectedRows];
            code = new int[expectedRows];
            returns = new double[expectedRows];
            caps = new double[expectedRows];
            returnForms = new long[expectedRows];
            capForms = new long[expectedRows];
            values = new double[numbers.length][];
            forms = new long[numbers.length][];
            labelCodes = new int[labels.length][];
            for (int i = 0; i < numbers.length; i++) {
                values[i] = numbers[i] ? new double[expectedRows] : null;
                forms[i] = numbers[i] ? new long[expectedRows] : null;
                labelCodes[i] = labels[i] ? new int[expectedRows] : null;
                labelTexts[i] = labels[i] ? new TextCache(Integer.MAX_VALUE) : null;
            }
        }

        @Override
        public void row(CsvTokenizer csv, long line, LocalDate date, double ret, double cap, double[] rowNumbers,
                        long retForm, long capForm, long[] rowForms) {
            if (n == lines.length) {
                grow();
            }
            lines[n] = (int) line;
            if (dateCount == 0 || dateList[dateCount - 1] != date) {
                if (dateCount == dateList.length) {
                    throw new IllegalStateException("too many dates in one chunk");
                }
                dateList[dateCount++] = date;
            }
            dateOf[n] = dateCount - 1;
            byte[] b = csv.buffer();
            int field = layout.securityField;
            int s = Cells.trimStart(b, csv.start(field), csv.end(field));
            // a file in date blocks repeats the securities in the same order: guess the one after the last
            int security = codes.indexOf(b, s, Cells.trimEnd(b, s, csv.end(field)), n == 0 ? 0 : code[n - 1] + 1);
            code[n] = security;
            returns[n] = ret;
            caps[n] = cap;
            returnForms[n] = retForm;
            capForms[n] = capForm;
            for (int i = 0; i < numbers.length; i++) {
                if (numbers[i]) {
                    values[i][n] = rowNumbers[i];
                    forms[i][n] = rowForms[i];
                }
                if (labels[i]) {
                    int f = layout.extraFields[i];
                    int ls = Cells.trimStart(b, csv.start(f), csv.end(f));
                    int le = Cells.trimEnd(b, ls, csv.end(f));
                    // a security's label mostly stays what it was at the last date
                    int[] last = labelOfSecurity(i, security);
                    int labelCode = ls == le ? -1 : labelTexts[i].indexOf(b, ls, le, last[security]);
                    labelCodes[i][n] = labelCode;
                    last[security] = labelCode;
                }
            }
            n++;
        }

        /** Per label column, the last label code seen for each security code of the chunk (-1: none yet). */
        private int[][] lastLabels;

        private int[] labelOfSecurity(int column, int security) {
            if (lastLabels == null) {
                lastLabels = new int[labels.length][];
            }
            int[] last = lastLabels[column];
            if (last == null || security >= last.length) {
                int old = last == null ? 0 : last.length;
                last = last == null ? new int[Math.max(1024, security + 1)] : Arrays.copyOf(last, Math.max(old * 2, security + 1));
                Arrays.fill(last, old, last.length, -1);
                lastLabels[column] = last;
            }
            return last;
        }

        private void grow() {
            int capacity = Math.max(1024, n * 2);
            lines = Arrays.copyOf(lines, capacity);
            dateOf = Arrays.copyOf(dateOf, capacity);
            code = Arrays.copyOf(code, capacity);
            returns = Arrays.copyOf(returns, capacity);
            caps = Arrays.copyOf(caps, capacity);
            returnForms = Arrays.copyOf(returnForms, capacity);
            capForms = Arrays.copyOf(capForms, capacity);
            for (int i = 0; i < numbers.length; i++) {
                if (values[i] != null) {
                    values[i] = Arrays.copyOf(values[i], capacity);
                    forms[i] = Arrays.copyOf(forms[i], capacity);
                }
                if (labelCodes[i] != null) {
                    labelCodes[i] = Arrays.copyOf(labelCodes[i], capacity);
                }
            }
        }
    }

    /** Checks and reads one chunk (any thread). A date that changes more often than 64 times a chunk gives up. */
    private ChunkRows scan(Chunk chunk, TextCache codes) throws IOException, Unsuitable {
        ChunkRows rows = new ChunkRows(Math.max(16, chunk.length() / 48), spareRows.poll(), codes);
        CsvTokenizer csv = new CsvTokenizer(chunk.bytes(), chunk.from(), chunk.length());
        try {
            rows.pass.scanChunk(csv, layout, rows);
        } catch (IllegalStateException tooManyDates) {
            throw new Unsuitable(tooManyDates.getMessage());
        } catch (CsvTokenizer.RecordTooLongException tooLong) {
            throw new Unsuitable("a record longer than the limit");
        }
        if (csv.unterminatedQuote() && !chunk.last()) {
            throw new Unsuitable("a chunk boundary inside a quoted field");
        }
        rows.lineBreaks = csv.nextLine() - 1;
        rows.newCodes = new String[rows.codes.size() - rows.codesBefore]; // read here: the table goes on to other scans
        for (int c = 0; c < rows.newCodes.length; c++) {
            rows.newCodes[c] = rows.codes.textAt(rows.codesBefore + c);
        }
        spareCodes.offer(rows.codes); // only after the scan; the next chunk to take it is submitted later, so lies later
        recycle(chunk.bytes());
        return rows;
    }

    /** Adds a chunk, in file order: errors and counts always, its rows while the upload has no error. */
    private void add(ChunkRows rows) throws SinkException, Unsuitable, IOException {
        whole.mergeChunk(rows.pass, rows.chunkErrors, lineOffset, rowOffset);
        if (errors.isEmpty()) {
            assemble(rows);
        }
        lineOffset += rows.lineBreaks;
        rowOffset += rows.pass.rowsRead;
        spareRows.offer(rows); // nothing refers to its arrays any more: a worker may fill them with a later chunk
        meter.report(whole.rowsRead, whole.rowsRejected + duplicateRows, rowsEmitted);
    }

    /**
     * Code tables between scans. This thread takes a table when it submits a chunk, in file order, and the worker
     * gives it back when the chunk's scan ends, so each table sees its chunks in file order, the order in which this
     * thread takes them back: the codes a chunk added to its table are resolved to ids ({@link #idsOfTable}) before
     * any later chunk's.
     */
    private final BlockingQueue<TextCache> spareCodes = new java.util.concurrent.LinkedBlockingQueue<>();
    /** Per code table (this thread only): the security id of each of its code indexes resolved so far. */
    private final Map<TextCache, int[]> idsOfTable = new java.util.IdentityHashMap<>();

    private TextCache takeCodeTable() {
        TextCache table = spareCodes.poll();
        return table != null ? table : new TextCache(Integer.MAX_VALUE);
    }

    private void assemble(ChunkRows rows) throws SinkException, Unsuitable {
        // a chunk whose dates go back gives up before any of its dates is handed over (most files not in
        // ascending blocks are found out here, in their first chunk, with nothing staged to discard)
        for (int d = 0; d < rows.dateCount; d++) {
            LocalDate previous = d == 0 ? blockDate : rows.dateList[d - 1];
            if (previous != null && (d == 0 ? rows.dateList[d].isBefore(previous) : !rows.dateList[d].isAfter(previous))) {
                throw new Unsuitable("dates not in ascending blocks");
            }
        }
        int[] known = idsOfTable.getOrDefault(rows.codes, new int[0]);
        if (known.length != rows.codesBefore) {
            throw new IllegalStateException("code table out of step: " + known.length + " ids for " + rows.codesBefore + " codes");
        }
        // the codes new to this table, in order of first appearance in this chunk: the ones new to the file get ids in
        // the same order as when every chunk had a table of its own
        int[] idOf = known;
        if (rows.newCodes.length > 0) {
            idOf = Arrays.copyOf(known, rows.codesBefore + rows.newCodes.length);
            for (int c = 0; c < rows.newCodes.length; c++) {
                idOf[rows.codesBefore + c] = idFor(rows.newCodes[c]);
            }
            idsOfTable.put(rows.codes, idOf);
        }
        int numberCount = numberNames.length;
        int labelCount = labelNames.length;
        for (int r = 0; r < rows.n; r++) {
            LocalDate date = rows.dateList[rows.dateOf[r]];
            if (!date.equals(blockDate)) {
                if (blockDate != null && !date.isAfter(blockDate)) {
                    throw new Unsuitable("dates not in ascending blocks");
                }
                finishBlock();
                blockDate = date;
                block = new DateBlock(lastBlockRows, numberCount, labelCount).withForms();
            }
            if (block.size >= MAX_ROWS_PER_DATE) {
                // the two passes hold or report this date (duplicates or its size) within bounded memory
                throw new Unsuitable("a date with more rows than this path holds");
            }
            block.ensureRoom();
            int k = block.size++;
            block.ids[k] = idOf[rows.code[r]];
            block.lines[k] = rows.lines[r] + lineOffset;
            block.returns[k] = rows.returns[r];
            block.marketCaps[k] = rows.caps[r];
            boolean forms = block.keepsForms();
            if (forms) {
                block.returnForms[k] = rows.returnForms[r];
                block.capForms[k] = rows.capForms[r];
            }
            for (int i = 0; i < rows.numbers.length; i++) {
                if (numberSlot[i] >= 0) {
                    block.numbers[numberSlot[i]][k] = rows.values[i][r];
                    if (forms) {
                        block.numberForms[numberSlot[i]][k] = rows.forms[i][r];
                    }
                }
                if (labelSlot[i] >= 0) {
                    int labelCode = rows.labelCodes[i][r];
                    block.labels[labelSlot[i]][k] = labelCode < 0 ? null : rows.labelTexts[i].textAt(labelCode);
                }
            }
        }
    }

    private int idFor(String code) throws SinkException {
        return PanelSecondPass.idFor(idsByCode, securityIds, code);
    }

    private final Map<Integer, String> codesById = new HashMap<>();

    /**
     * Forms and hands over the finished date's cross-section, unless a security occurs twice in it; after such a
     * date nothing more is handed over, but later dates are still checked for duplicates.
     */
    private void finishBlock() throws SinkException {
        if (block == null) {
            return;
        }
        DateBlock done = block;
        LocalDate date = blockDate;
        done.trim();
        CrossSection cs = done.toCrossSection(date, numberNames, labelNames, (securityId, firstLine, line) -> {
            duplicateRows++;
            if (duplicates.keeps(line)) {
                duplicates.add(line, PanelUpload.SECURITY, Messages.duplicateSecurity(codeOf(securityId), date, firstLine));
            } else {
                duplicates.countOnly(1);
            }
        });
        block = null;
        lastBlockRows = done.size;
        if (cs == null) {
            emitting = false;
        }
        if (!emitting) {
            return;
        }
        rowsEmitted += PanelSecondPass.emit(sink, cs, done.decimals());
    }

    private String codeOf(int securityId) {
        return PanelSecondPass.codeOf(idsByCode, codesById, securityId);
    }
}
