package dev.winnow.construct;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/** Test panel over cross-sections held in memory; records the grid indices read, in order. */
final class InMemoryPanel implements PanelSource {
    private final List<CrossSection> sections;
    final List<Integer> reads = new ArrayList<>();

    InMemoryPanel(List<CrossSection> sections) {
        this.sections = List.copyOf(sections);
    }

    /** The panel as it stood when only its first {@code k} dates had arrived. */
    InMemoryPanel prefix(int k) {
        return new InMemoryPanel(sections.subList(0, k));
    }

    @Override
    public List<LocalDate> dates() {
        return sections.stream().map(CrossSection::date).toList();
    }

    @Override
    public CrossSection crossSection(int index) {
        reads.add(index);
        return sections.get(index);
    }
}
