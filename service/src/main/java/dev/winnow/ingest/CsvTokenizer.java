package dev.winnow.ingest;

import java.io.IOException;
import java.io.InputStream;
import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * Splits a UTF-8 byte stream into CSV records as RFC 4180 section 2 defines them: comma-separated fields, fields in
 * double quotes may hold commas, line breaks and doubled double quotes. Records end at CRLF, LF or a lone CR; the last
 * record may lack a line break. A UTF-8 byte order mark at the very start is skipped.
 *
 * <p>Works on bytes (the delimiters are ASCII, so UTF-8 text never contains them inside a multi-byte character):
 * a field is a range of {@link #buffer()}, valid until the next call to {@link #next()}. Quoted fields are unescaped
 * in place. Instead of failing, the tokenizer flags the two quoting faults for the caller to report:
 * a quote that is never closed ({@link #unterminatedQuote()}) and a stray quote ({@link #malformedField()}).
 */
final class CsvTokenizer {

    private static final int INITIAL_BUFFER = 1 << 16;
    /** Longest record accepted; keeps an unclosed quote from pulling the whole file into memory. */
    static final int MAX_RECORD_BYTES = 1 << 24;
    /** Non-zero for the bytes that end an unquoted run: comma, double quote, CR, LF. */
    private static final byte[] SPECIAL = new byte[256];

    /** Eight bytes at a time, the first byte lowest, for finding the end of an unquoted run. */
    private static final VarHandle WORD = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    private static final long ONES = 0x0101010101010101L;
    private static final long HIGHS = 0x8080808080808080L;

    static {
        SPECIAL[','] = 1;
        SPECIAL['"'] = 1;
        SPECIAL['\r'] = 1;
        SPECIAL['\n'] = 1;
    }

    private final InputStream in;
    private byte[] buf = new byte[INITIAL_BUFFER];
    private int pos;
    private int limit;
    private boolean eof;
    private boolean started;
    /** Start of the current record in buf: bytes before it may be discarded on refill. */
    private int recordStart;
    private int lastShift;
    /** Input bytes dropped from the front of buf so far. */
    private long dropped;

    private int[] starts = new int[16];
    private int[] ends = new int[16];
    private int count;
    private boolean anyQuoted;
    private int malformedField;
    private boolean unterminated;

    /** Physical line (1-based) of the next unread byte. */
    private long line = 1;
    private long recordLine;
    /** The previous record ended with CR: a directly following LF belongs to that line break. */
    private boolean pendingLf;

    CsvTokenizer(InputStream in) {
        this.in = in;
    }

    /**
     * Splits bytes [from, from + length) of {@code bytes} in place, without copying them; quoted fields are unescaped
     * in that array. Positions ({@link #position()}) count from {@code from}.
     */
    CsvTokenizer(byte[] bytes, int from, int length) {
        this.in = null;
        this.buf = bytes;
        this.pos = from;
        this.recordStart = from;
        this.limit = from + length;
        this.dropped = -from;
        this.eof = true;
    }

    /** Reads the next record; false at the end of input. */
    boolean next() throws IOException {
        boolean read = nextRecord();
        if (read && in == null && pos - recordStart >= MAX_RECORD_BYTES - 4) {
            // the stream form fails such a record when its buffer cannot grow further; so does the in-place form, a
            // little early rather than late (its caller, the one-pass parse, then leaves the file to the two passes)
            throw new RecordTooLongException(recordLine);
        }
        return read;
    }

    private boolean nextRecord() throws IOException {
        count = 0;
        anyQuoted = false;
        malformedField = -1;
        unterminated = false;
        if (!started) {
            started = true;
            skipByteOrderMark();
        }
        recordStart = pos;
        if (pendingLf) {
            if (!ensureByte()) {
                return false;
            }
            pendingLf = false;
            if (buf[pos] == '\n') {
                pos++;
            }
            recordStart = pos;
        }
        if (!ensureByte()) {
            return false;
        }
        recordLine = line;
        while (true) {
            if (!ensureByte()) {
                addField(pos, pos);
                return true;
            }
            if (buf[pos] == '"') {
                anyQuoted = true;
                if (!readQuoted()) {
                    return true;
                }
            } else {
                readPlain();
            }
            if (!ensureByte()) {
                return true;
            }
            byte c = buf[pos++];
            if (c == ',') {
                continue;
            }
            line++;
            if (c == '\r') {
                pendingLf = true;
            }
            return true;
        }
    }

    /** Input bytes consumed so far: the offset, in the stream, of the first byte after the current record. */
    long position() {
        return dropped + pos + (pendingLf && pos < limit && buf[pos] == '\n' ? 1 : 0);
    }

    /** Physical line (1-based) of the next unread byte. */
    long nextLine() {
        return line;
    }

    int fieldCount() {
        return count;
    }

    /** Physical line (1-based) where the current record starts. */
    long recordLine() {
        return recordLine;
    }

    /** True when the record is an empty line: no bytes between two line breaks. */
    boolean isBlankLine() {
        return count == 1 && !anyQuoted && starts[0] == ends[0];
    }

    /** The input ended inside a quoted field, which is then the record's last field. */
    boolean unterminatedQuote() {
        return unterminated;
    }

    /** Index of the first field with a stray double quote, or -1. */
    int malformedField() {
        return malformedField;
    }

    byte[] buffer() {
        return buf;
    }

    int start(int field) {
        return starts[field];
    }

    int end(int field) {
        return ends[field];
    }

    /** The field's text, decoded as UTF-8 (malformed bytes become U+FFFD). */
    String text(int field) {
        return new String(buf, starts[field], ends[field] - starts[field], StandardCharsets.UTF_8);
    }

    private void skipByteOrderMark() throws IOException {
        while (limit - pos < 3 && !eof) {
            fill();
        }
        if (limit - pos >= 3 && (buf[pos] & 0xff) == 0xEF && (buf[pos + 1] & 0xff) == 0xBB && (buf[pos + 2] & 0xff) == 0xBF) {
            pos += 3;
        }
    }

    private void readPlain() throws IOException {
        int start = pos;
        while (true) {
            byte[] b = buf;
            int p = pos;
            int lim = limit;
            while (p <= lim - 8) {
                long special = specialBytes((long) WORD.get(b, p));
                if (special != 0) {
                    p += Long.numberOfTrailingZeros(special) >>> 3;
                    break;
                }
                p += 8;
            }
            while (p < lim && SPECIAL[b[p] & 0xff] == 0) {
                p++;
            }
            pos = p;
            if (p < lim) {
                if (b[p] != '"') {
                    break;
                }
                flagMalformed();
                pos++;
                continue;
            }
            boolean more = fill();
            start -= lastShift;
            if (!more) {
                break;
            }
        }
        addField(start, pos);
    }

    /**
     * The high bit of each byte of {@code w} that may be a comma, double quote, CR or LF (the lowest flagged byte
     * always is one; bytes above it may be flagged falsely): the zero-byte test (x - 0x01..01) &amp; ~x &amp; 0x80..80
     * on w xor each delimiter repeated (H. S. Warren, Hacker's Delight, 2nd ed., section 6-1).
     */
    private static long specialBytes(long w) {
        return zeroBytes(w ^ (',' * ONES)) | zeroBytes(w ^ ('"' * ONES)) | zeroBytes(w ^ ('\r' * ONES))
                | zeroBytes(w ^ ('\n' * ONES));
    }

    private static long zeroBytes(long x) {
        return (x - ONES) & ~x & HIGHS;
    }

    /** Reads a quoted field starting at the opening quote; false when the input ends inside it. */
    private boolean readQuoted() throws IOException {
        pos++;
        int start = pos;
        int write = pos;
        boolean previousCr = false;
        while (true) {
            if (pos >= limit) {
                boolean more = fill();
                start -= lastShift;
                write -= lastShift;
                if (!more) {
                    unterminated = true;
                    addField(start, write);
                    return false;
                }
            }
            byte c = buf[pos];
            if (c == '"') {
                if (pos + 1 >= limit) {
                    fill();
                    start -= lastShift;
                    write -= lastShift;
                }
                if (pos + 1 < limit && buf[pos + 1] == '"') {
                    buf[write++] = '"';
                    pos += 2;
                    previousCr = false;
                    continue;
                }
                pos++;
                addField(start, write);
                skipAfterClosingQuote();
                return true;
            }
            if (c == '\r' || (c == '\n' && !previousCr)) {
                line++;
            }
            previousCr = c == '\r';
            buf[write++] = c;
            pos++;
        }
    }

    /** After a closing quote only a delimiter may follow; anything else is flagged and skipped. */
    private void skipAfterClosingQuote() throws IOException {
        while (ensureByte()) {
            byte c = buf[pos];
            if (c == ',' || c == '\r' || c == '\n') {
                return;
            }
            if (malformedField < 0) {
                malformedField = count - 1;
            }
            pos++;
        }
    }

    private void flagMalformed() {
        if (malformedField < 0) {
            malformedField = count;
        }
    }

    private void addField(int start, int end) {
        if (count == starts.length) {
            starts = Arrays.copyOf(starts, count * 2);
            ends = Arrays.copyOf(ends, count * 2);
        }
        starts[count] = start;
        ends[count] = end;
        count++;
    }

    /** Makes buf[pos] readable; false at the end of input. */
    private boolean ensureByte() throws IOException {
        while (pos >= limit) {
            if (!fill()) {
                return false;
            }
        }
        return true;
    }

    /**
     * Reads more bytes after limit, first moving the current record to the front of the buffer when the free tail is
     * small, or growing the buffer when the record fills it. Sets {@link #lastShift} to how far the record moved left,
     * so callers can adjust offsets they hold. Returns false at the end of input.
     */
    private boolean fill() throws IOException {
        lastShift = 0;
        if (eof) {
            return false;
        }
        if (recordStart > 0 && buf.length - limit < buf.length / 2) {
            int shift = recordStart;
            System.arraycopy(buf, shift, buf, 0, limit - shift);
            pos -= shift;
            limit -= shift;
            recordStart = 0;
            dropped += shift;
            for (int i = 0; i < count; i++) {
                starts[i] -= shift;
                ends[i] -= shift;
            }
            lastShift = shift;
        }
        if (limit == buf.length) {
            if (buf.length >= MAX_RECORD_BYTES) {
                throw new RecordTooLongException(recordLine);
            }
            buf = Arrays.copyOf(buf, buf.length * 2);
        }
        int n = in.read(buf, limit, buf.length - limit);
        while (n == 0) {
            n = in.read(buf, limit, buf.length - limit);
        }
        if (n < 0) {
            eof = true;
            return false;
        }
        limit += n;
        return true;
    }

    /** A record is longer than {@link #MAX_RECORD_BYTES}: almost always a double quote that is never closed. */
    static final class RecordTooLongException extends IOException {

        private final long line;

        RecordTooLongException(long line) {
            super("record starting at line " + line + " is longer than " + MAX_RECORD_BYTES + " bytes");
            this.line = line;
        }

        long line() {
            return line;
        }
    }
}
