package dev.winnow.ingest;

import java.lang.invoke.MethodHandles;
import java.lang.invoke.VarHandle;
import java.nio.ByteOrder;
import java.time.DateTimeException;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.Map;

/**
 * Reads ISO dates {@code yyyy-mm-dd} (exactly four-digit year, two-digit month and day, surrounding spaces and tabs
 * ignored) from UTF-8 bytes. A panel repeats each date once per security, so parsed dates are cached by their digits
 * and the same {@link LocalDate} instance is returned for the same text. Not thread-safe.
 */
final class DateCell {

    enum Kind { EMPTY, DATE, INVALID }

    /** Cache marker for text with the date shape that names no calendar day, such as 2023-02-30. */
    private static final LocalDate NOT_A_DAY = LocalDate.MIN;

    private final Map<Integer, LocalDate> cache = new HashMap<>();
    private int lastKey = -1;
    private LocalDate lastDate;
    private Kind kind;
    /** The last cell's ten bytes when they were exactly a date's shape with nothing to trim (else lastBytesValid off). */
    private long lastHead;
    private short lastTail;
    private boolean lastBytesValid;
    private static final VarHandle HEAD = MethodHandles.byteArrayViewVarHandle(long[].class, ByteOrder.LITTLE_ENDIAN);
    private static final VarHandle TAIL = MethodHandles.byteArrayViewVarHandle(short[].class, ByteOrder.LITTLE_ENDIAN);

    Kind kind() {
        return kind;
    }

    /** Reads bytes [start, end); returns the date, or null when the cell is empty or not a date (see {@link #kind()}). */
    LocalDate read(byte[] b, int start, int end) {
        // a panel repeats each date on row after row: the same ten bytes as the last cell give the same answer
        if (lastBytesValid && end - start == 10 && (long) HEAD.get(b, start) == lastHead
                && (short) TAIL.get(b, start + 8) == lastTail) {
            kind = lastDate == NOT_A_DAY ? Kind.INVALID : Kind.DATE;
            return lastDate == NOT_A_DAY ? null : lastDate;
        }
        lastBytesValid = false;
        int s = Cells.trimStart(b, start, end);
        int e = Cells.trimEnd(b, s, end);
        if (s == e) {
            kind = Kind.EMPTY;
            return null;
        }
        int key = packedDigits(b, s, e);
        if (key < 0) {
            kind = Kind.INVALID;
            return null;
        }
        if (key != lastKey) {
            LocalDate date = cache.computeIfAbsent(key, DateCell::toDate);
            lastKey = key;
            lastDate = date;
        }
        if (s == start && e == end) {
            lastHead = (long) HEAD.get(b, start);
            lastTail = (short) TAIL.get(b, start + 8);
            lastBytesValid = true;
        }
        if (lastDate == NOT_A_DAY) {
            kind = Kind.INVALID;
            return null;
        }
        kind = Kind.DATE;
        return lastDate;
    }

    /** yyyymmdd as an int when the text has the shape dddd-dd-dd, else -1. */
    private static int packedDigits(byte[] b, int s, int e) {
        if (e - s != 10 || b[s + 4] != '-' || b[s + 7] != '-') {
            return -1;
        }
        int key = 0;
        for (int i = s; i < e; i++) {
            if (i == s + 4 || i == s + 7) {
                continue;
            }
            int d = b[i] - '0';
            if (d < 0 || d > 9) {
                return -1;
            }
            key = key * 10 + d;
        }
        return key;
    }

    private static LocalDate toDate(int key) {
        try {
            return LocalDate.of(key / 10000, key / 100 % 100, key % 100);
        } catch (DateTimeException notADay) {
            return NOT_A_DAY;
        }
    }
}
