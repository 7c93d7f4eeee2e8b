package dev.winnow.construct;

import java.util.Arrays;

/** The last {@code lag} cross-sections read, so that a lagged formation needs no second read of the panel. */
final class LagWindow {
    private final CrossSection[] slots;
    private final int[] indices;

    LagWindow(int lag) {
        slots = new CrossSection[lag];
        indices = new int[lag];
        Arrays.fill(indices, -1);
    }

    void put(int index, CrossSection rows) {
        int slot = index % slots.length;
        slots[slot] = rows;
        indices[slot] = index;
    }

    CrossSection get(int index) {
        int slot = index % slots.length;
        if (indices[slot] != index) {
            throw new IllegalStateException("cross-section " + index + " is no longer held");
        }
        return slots[slot];
    }
}
