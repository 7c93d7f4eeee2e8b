package dev.winnow.research;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSource;
import dev.winnow.construct.Recipe;
import dev.winnow.construct.SignalEvaluator;
import dev.winnow.stats.ReturnSeries;

import java.util.Map;

/**
 * A signal's value for every row of the cross-section at a grid index: a panel column, or a recipe evaluated along the
 * grid by {@link SignalEvaluator}. Callers ask for increasing grid indices (a jump backwards restarts the evaluator).
 */
public interface CrossSectionSignal {

    /** One value per row of {@code rows} (NaN where missing); {@code rows} is the panel's cross-section at gridIndex. */
    double[] values(int gridIndex, CrossSection rows);

    /** The signal of a recipe over a panel: a column read directly, anything else through the evaluator. */
    static CrossSectionSignal of(Recipe recipe, PanelSource panel, Map<String, ReturnSeries> factors) {
        return recipe.columnName() != null ? new Column(recipe.columnName()) : new Evaluated(recipe, panel, factors);
    }

    /** A numeric panel column (return and market_cap included). */
    record Column(String name) implements CrossSectionSignal {
        @Override
        public double[] values(int gridIndex, CrossSection rows) {
            return rows.numberColumn(name);
        }
    }

    /** A recipe, fed the panel's cross-sections in grid order. */
    final class Evaluated implements CrossSectionSignal {
        private final Recipe recipe;
        private final PanelSource panel;
        private final Map<String, ReturnSeries> factors;
        private SignalEvaluator evaluator;
        private int next = -1;

        Evaluated(Recipe recipe, PanelSource panel, Map<String, ReturnSeries> factors) {
            this.recipe = recipe;
            this.panel = panel;
            this.factors = factors;
        }

        @Override
        public double[] values(int gridIndex, CrossSection rows) {
            int from = Math.max(0, gridIndex - recipe.lookback());
            if (evaluator == null || gridIndex < next - 1 || from > next) {
                evaluator = new SignalEvaluator(recipe, factors, 0);
                next = from;
            }
            for (; next <= gridIndex; next++) {
                evaluator.offer(next, next == gridIndex ? rows : panel.crossSection(next));
            }
            return evaluator.valueAt(gridIndex);
        }
    }
}
