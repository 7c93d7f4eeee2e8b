package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSource;

import java.time.LocalDate;
import java.util.List;
import java.util.function.Predicate;

/**
 * A panel read from the store in blocks of {@value #BLOCK} consecutive dates, one query each: construction reads the
 * dates in order, and re-reads at most its lag window. The current and the previous block are kept. A source made
 * with a column filter decodes only the extra columns the filter accepts (ids, returns and market caps always).
 */
public final class StorePanelSource implements PanelSource {
    static final int BLOCK = 32;

    private final PanelStore panels;
    private final long panelId;
    private final List<LocalDate> dates;
    private final Predicate<String> columns;
    private int blockStart = -1;
    private List<CrossSection> block = List.of();
    private int previousStart = -1;
    private List<CrossSection> previous = List.of();

    public StorePanelSource(PanelStore panels, long panelId) {
        this(panels, panelId, name -> true);
    }

    /** @param columns the extra columns to decode; the others read as absent (all missing) */
    public StorePanelSource(PanelStore panels, long panelId, Predicate<String> columns) {
        this.panels = panels;
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
        int end = Math.min(dates.size(), start + BLOCK);
        List<CrossSection> loaded = panels.slices(panelId, dates.subList(start, end), columns);
        previousStart = blockStart;
        previous = block;
        blockStart = start;
        block = loaded;
        return block.get(index - start);
    }
}
