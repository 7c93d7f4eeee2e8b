package dev.winnow.research;

import dev.winnow.construct.CrossSection;

/**
 * A signal's value for every row of a cross-section at a grid index. Today a signal is a panel column; signal recipes
 * evaluated along the grid plug in behind this interface.
 */
public interface CrossSectionSignal {

    /** One value per row of {@code rows} (NaN where missing); {@code gridIndex} is the rows' position on the grid. */
    double[] values(int gridIndex, CrossSection rows);

    /** A numeric panel column (return and market_cap included). */
    record Column(String name) implements CrossSectionSignal {
        @Override
        public double[] values(int gridIndex, CrossSection rows) {
            return rows.numberColumn(name);
        }
    }
}
