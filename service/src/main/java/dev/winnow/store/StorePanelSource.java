package dev.winnow.store;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSource;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A panel read from the store one slice at a time. The few most recent slices are kept, since construction reads
 * a formation date and the periods after it in order.
 */
public final class StorePanelSource implements PanelSource {
    private static final int CACHED_SLICES = 8;

    private final PanelStore panels;
    private final long panelId;
    private final List<LocalDate> dates;
    private final Map<Integer, CrossSection> recent = new LinkedHashMap<>(16, 0.75f, true) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<Integer, CrossSection> eldest) {
            return size() > CACHED_SLICES;
        }
    };

    private final PanelStore.Columns columns;

    public StorePanelSource(PanelStore panels, long panelId) {
        this(panels, panelId, null);
    }

    /** A source whose cross-sections hold only the given columns (besides ids, returns and caps); null: all. */
    public StorePanelSource(PanelStore panels, long panelId, PanelStore.Columns columns) {
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
        return recent.computeIfAbsent(index, i -> panels.slice(panelId, dates.get(i), columns));
    }
}
