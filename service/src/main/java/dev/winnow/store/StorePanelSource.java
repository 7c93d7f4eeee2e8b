package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSource;

import java.time.LocalDate;
import java.util.ArrayDeque;
import java.util.List;
import java.util.concurrent.CancellationException;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.FutureTask;
import java.util.function.Predicate;

/**
 * A panel read from the store in blocks of {@value #BLOCK} consecutive dates, one query each: construction reads the
 * dates in order, and re-reads at most its lag window. The current and the previous block are kept. A source made
 * with a column filter decodes only the extra columns the filter accepts (ids, returns and market caps always).
 *
 * <p>Read ahead: once the dates are read in order (a block right after the previous one), the next
 * {@value #AHEAD} blocks are read and decoded on background threads while the caller works on the current one, so a
 * build's reading overlaps its construction, and a read-ahead thread that starts late (both cores busy) costs the
 * reader nothing as long as the block after it is still coming. At most {@value #AHEAD} blocks are read ahead, so
 * memory stays {@value #AHEAD} + 2 blocks whatever the panel's length. A block asked for before its read ahead has
 * started is read by the caller itself (the read ahead is cancelled), so a busy pool never makes a reader wait for
 * other readers' work; a failed read ahead fails the caller's read with its error; a jump elsewhere cancels what was
 * read ahead. The threads are the service's {@link PanelReadAhead}; sources are opened by {@link PanelStore#source}.
 */
public final class StorePanelSource implements PanelSource {
    static final int BLOCK = 32;
    /** Blocks read ahead of the current one. */
    static final int AHEAD = 2;

    private final PanelStore panels;
    private final PanelReadAhead readAhead;
    private final long panelId;
    private final List<LocalDate> dates;
    private final Predicate<String> columns;
    private int blockStart = -1;
    private List<CrossSection> block = List.of();
    private int previousStart = -1;
    private List<CrossSection> previous = List.of();
    /** The blocks being read ahead, in date order: the first starts right after the current block. */
    private final ArrayDeque<Ahead> ahead = new ArrayDeque<>(AHEAD);

    private record Ahead(int start, FutureTask<List<CrossSection>> task) {
    }

    /** @param columns the extra columns to decode; the others read as absent (all missing) */
    StorePanelSource(PanelStore panels, PanelReadAhead readAhead, long panelId, Predicate<String> columns) {
        this.panels = panels;
        this.readAhead = readAhead;
        this.panelId = panelId;
        this.columns = columns;
        this.dates = List.copyOf(panels.dates(panelId));
    }

    @Override
    public List<LocalDate> dates() {
        return dates;
    }

    @Override
    public CrossSection crossSection(int index) {
        if (index >= blockStart && index < blockStart + block.size()) {
            return block.get(index - blockStart);
        }
        if (index >= previousStart && index < previousStart + previous.size()) {
            return previous.get(index - previousStart);
        }
        int start = index / BLOCK * BLOCK;
        boolean inOrder = blockStart >= 0 && start == blockStart + BLOCK;
        Ahead first = ahead.peekFirst();
        List<CrossSection> loaded;
        if (first != null && first.start() == start) {
            ahead.removeFirst();
            loaded = collect(first);
        } else {
            dropAhead();
            loaded = read(start);
        }
        previousStart = blockStart;
        previous = block;
        blockStart = start;
        block = loaded;
        // a jump elsewhere has dropped what was read ahead above: the blocks read ahead always follow the current one
        if (inOrder || start == 0) {
            readAheadFrom(start + BLOCK);
        }
        return block.get(index - start);
    }

    /** Starts reading the blocks from {@code next} on that are not being read yet, up to {@value #AHEAD}. */
    private void readAheadFrom(int next) {
        int from = ahead.isEmpty() ? next : ahead.peekLast().start() + BLOCK;
        for (int at = from; ahead.size() < AHEAD && at < dates.size(); at += BLOCK) {
            int blockAt = at;
            FutureTask<List<CrossSection>> task = new FutureTask<>(() -> read(blockAt));
            if (!readAhead.start(task)) {
                return;
            }
            ahead.addLast(new Ahead(blockAt, task));
        }
    }

    private List<CrossSection> read(int start) {
        int end = Math.min(dates.size(), start + BLOCK);
        return panels.slices(panelId, dates.subList(start, end), columns);
    }

    /** A block read ahead: its result, or read here when its read ahead has not started yet. */
    private List<CrossSection> collect(Ahead block) {
        FutureTask<List<CrossSection>> task = block.task();
        if (task.cancel(false)) {
            return read(block.start());
        }
        try {
            return task.get();
        } catch (CancellationException e) {
            return read(block.start());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while reading the panel", e);
        } catch (ExecutionException e) {
            dropAhead();
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException r) {
                throw r;
            }
            if (cause instanceof Error err) {
                throw err;
            }
            throw new IllegalStateException(cause);
        }
    }

    /** Abandons the blocks read ahead that the reader did not go on to (it jumped elsewhere, or a read failed). */
    private void dropAhead() {
        for (Ahead a : ahead) {
            a.task().cancel(false);
        }
        ahead.clear();
    }
}
