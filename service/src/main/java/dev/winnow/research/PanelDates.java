package dev.winnow.research;

import java.time.LocalDate;
import java.util.Collections;
import java.util.List;

/** Positions of dates on a panel's grid (its distinct dates, ascending). */
public final class PanelDates {
    private PanelDates() {
    }

    /** Index of a grid date, or a 400 naming the nearest grid dates. */
    static int index(List<LocalDate> grid, LocalDate date, String panelName) {
        int i = Collections.binarySearch(grid, date);
        if (i >= 0) {
            return i;
        }
        int next = -i - 1;
        String nearest;
        if (grid.isEmpty()) {
            nearest = "the panel has no dates";
        } else if (next == 0) {
            nearest = "it precedes the first date " + grid.get(0);
        } else if (next == grid.size()) {
            nearest = "it follows the last date " + grid.get(grid.size() - 1);
        } else {
            nearest = "the nearest dates are " + grid.get(next - 1) + " and " + grid.get(next);
        }
        throw new InvalidRequestException("Date " + date + " is not a date of panel '" + panelName + "': " + nearest + ".");
    }

    /** Index of the first grid date on or after {@code date} (the grid's size when there is none). */
    static int insertionPoint(List<LocalDate> grid, LocalDate date) {
        int i = Collections.binarySearch(grid, date);
        return i >= 0 ? i : -i - 1;
    }
}
