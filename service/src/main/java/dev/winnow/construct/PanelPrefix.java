package dev.winnow.construct;

import java.time.LocalDate;
import java.util.List;
import java.util.Objects;

/**
 * The panel as it stood when only its first {@code size} grid dates had arrived: reads go to the underlying panel
 * (and its cache), so a build run in segments over growing prefixes reads each cross-section from the store once.
 */
public record PanelPrefix(PanelSource panel, int size) implements PanelSource {

    public PanelPrefix {
        Objects.requireNonNull(panel, "panel");
        if (size < 0 || size > panel.dates().size()) {
            throw new IllegalArgumentException("prefix size must be between 0 and the panel's " + panel.dates().size()
                    + " dates, got " + size);
        }
    }

    @Override
    public List<LocalDate> dates() {
        return panel.dates().subList(0, size);
    }

    @Override
    public CrossSection crossSection(int index) {
        Objects.checkIndex(index, size);
        return panel.crossSection(index);
    }
}
