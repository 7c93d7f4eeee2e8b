package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSource;

import java.time.LocalDate;
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
 * <p>Read ahead: once the dates are read in order (a block right after the previous one), the next block is read and
 * decoded on a background thread while the caller works on the current one, so a build's reading overlaps its
 * construction. At most one block is read ahead, so memory stays three blocks whatever the panel's length. A block
 * asked for before its read ahead has started is read by the caller itself (the read ahead is cancelled), so a busy
 * pool never makes a reader wait for other readers' work; a failed read ahead fails the caller's read with its error.
 * The threads are the service's {@link PanelReadAhead}; sources are opened by {@link PanelStore#source}.
 */
public final class StorePanelSource implements PanelSource {
    static final int BLOCK = 32;

    private final PanelStore panels;
    private final PanelReadAhead readAhead;
    private final long panelId;
    private final List<LocalDate> dates;
    private final Predicate<String> columns;
    private int blockStart = -1;
    private List<CrossSection> block = List.of();
    private int previousStart = -1;
    private List<CrossSection> previous = List.of();
    private int aheadStart = -1;
    private FutureTask<List<CrossSection>> ahead;

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
        List<CrossSection> loaded = start == aheadStart ? collectAhead() : read(start);
        if (start != aheadStart) {
            dropAhead();
        }
        aheadStart = -1;
        ahead = null;
        previousStart = blockStart;
        previous = block;
        blockStart = start;
        block = loaded;
        int next = start + BLOCK;
        if ((inOrder || start == 0) && next < dates.size()) {
            FutureTask<List<CrossSection>> task = new FutureTask<>(() -> read(next));
            if (readAhead.start(task)) {
                aheadStart = next;
                ahead = task;
            }
        }
        return block.get(index - start);
    }

    private List<CrossSection> read(int start) {
        int end = Math.min(dates.size(), start + BLOCK);
        return panels.slices(panelId, dates.subList(start, end), columns);
    }

    /** The block read ahead: its result, or read here when the read ahead has not started yet. */
    private List<CrossSection> collectAhead() {
        FutureTask<List<CrossSection>> task = ahead;
        if (task.cancel(false)) {
            return read(aheadStart);
        }
        try {
            return task.get();
        } catch (CancellationException e) {
            return read(aheadStart);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while reading the panel", e);
        } catch (ExecutionException e) {
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

    /** Abandons a block read ahead that the reader did not go on to (it jumped elsewhere). */
    private void dropAhead() {
        if (ahead != null) {
            ahead.cancel(false);
        }
    }
}
