package dev.winnow.ingest;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;

/**
 * The distinct dates of an upload in order of first appearance, with their row counts, and whether the file keeps
 * each date's rows together (contiguous) with the blocks in ascending date order.
 */
final class DateTable {

    private final Map<LocalDate, Integer> indexes = new HashMap<>();
    private final List<LocalDate> dates = new ArrayList<>();
    private int[] counts = new int[256];
    private final BitSet closedBlocks = new BitSet();
    private int currentBlock = -1;
    private boolean contiguous = true;
    private boolean ascending = true;
    private LocalDate lookedUp;
    private int lookedUpIndex = -1;

    /** Counts one row at the date (in file order). */
    void record(LocalDate date) {
        int i = indexOrAdd(date);
        counts[i]++;
        if (i != currentBlock) {
            if (currentBlock >= 0) {
                closedBlocks.set(currentBlock);
                ascending &= date.isAfter(dates.get(currentBlock));
            }
            contiguous &= !closedBlocks.get(i);
            currentBlock = i;
        }
    }

    /**
     * Adds another table's dates and counts (a later part of the file), in its order of first appearance. Whether the
     * file keeps dates together is then no longer tracked: {@link #inDateOrder} answers false.
     */
    void absorb(DateTable other) {
        for (int k = 0; k < other.size(); k++) {
            int i = indexOrAdd(other.date(k)); // may grow counts: index first
            counts[i] += other.count(k);
        }
        contiguous = false;
    }

    private int indexOrAdd(LocalDate date) {
        int i = indexOf(date);
        if (i < 0) {
            i = dates.size();
            dates.add(date);
            indexes.put(date, i);
            if (i == counts.length) {
                counts = Arrays.copyOf(counts, i * 2);
            }
            lookedUp = date;
            lookedUpIndex = i;
        }
        return i;
    }

    /** Index of a known date, or -1. */
    int indexOf(LocalDate date) {
        if (date != lookedUp) {
            Integer i = indexes.get(date);
            lookedUp = date;
            lookedUpIndex = i == null ? -1 : i;
        }
        return lookedUpIndex;
    }

    int size() {
        return dates.size();
    }

    LocalDate date(int index) {
        return dates.get(index);
    }

    int count(int index) {
        return counts[index];
    }

    /** True when every date's rows form one block and the blocks come in ascending date order. */
    boolean inDateOrder() {
        return contiguous && ascending;
    }

    /** Date indexes ordered by date. */
    int[] ascendingIndexes() {
        return IntStream.range(0, dates.size()).boxed()
                .sorted(Comparator.comparing(dates::get))
                .mapToInt(Integer::intValue).toArray();
    }

    List<LocalDate> ascendingDates() {
        List<LocalDate> sorted = new ArrayList<>(dates);
        sorted.sort(null);
        return sorted;
    }
}
