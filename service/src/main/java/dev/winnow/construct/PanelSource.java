package dev.winnow.construct;

import java.time.LocalDate;
import java.util.List;

/**
 * Read access to a panel for construction: the sorted grid of distinct dates and the cross-section at any grid index.
 * Implementations stream from the store, so callers should ask for cross-sections in date order and hold few at once.
 */
public interface PanelSource {

    /** The panel's distinct dates, strictly increasing: the period grid. */
    List<LocalDate> dates();

    /** The rows at grid index {@code index} (0-based). */
    CrossSection crossSection(int index);
}
