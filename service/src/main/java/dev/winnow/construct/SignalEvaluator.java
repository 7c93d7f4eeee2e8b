package dev.winnow.construct;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.HashMap;
import java.util.HashSet;
import java.util.Map;
import java.util.Set;

/**
 * Evaluates a {@link Recipe} along a panel's grid. This is the public entry point for anything that needs a signal's
 * values at a grid index (construction, {@code GET /v1/panels/{panel}/signals}, cross-sectional evidence).
 *
 * <p>One-off: {@link #evaluate(Recipe, PanelSource, Map, int)}. Streaming along the grid: construct with the history
 * depth you need beyond the recipe's own lookback, {@link #offer} each cross-section in grid order (consecutive
 * indices), and ask {@link #valueAt} for any index whose window is held. Only the columns the recipe reads are kept,
 * and every sub-recipe's value at an index is computed once while that index is held.
 */
public final class SignalEvaluator {
    private final Recipe recipe;
    private final int depth;
    private final Map<String, Map<LocalDate, Double>> factorReturns = new HashMap<>();
    private final Set<String> numbers;
    private final Set<String> labels;
    private final CrossSection[] held;
    private final int[] heldIndex;
    private final Map<Recipe, double[][]> cache = new HashMap<>();
    private final Map<Recipe, int[]> cacheIndex = new HashMap<>();
    private int newest = -1;
    private final Recipe.Context context = new Recipe.Context() {
        @Override
        public CrossSection rows(int j) {
            return heldRows(j);
        }

        @Override
        public double[] valueOf(Recipe r, int j) {
            return cached(r, j);
        }

        @Override
        public double factorReturn(String factor, int j) {
            Double v = factorReturns.get(factor).get(heldRows(j).date());
            return v == null ? Double.NaN : v;
        }
    };

    /**
     * @param recipe      the signal
     * @param factors     the return series of every factor in {@code recipe.factors()} (others are ignored)
     * @param extraDepth  grid dates to keep beyond the recipe's lookback (a caller that asks for k - extraDepth
     *                    after offering k), at least 0
     */
    public SignalEvaluator(Recipe recipe, Map<String, ReturnSeries> factors, int extraDepth) {
        if (extraDepth < 0) {
            throw new IllegalArgumentException("extra history depth must be at least 0, got " + extraDepth);
        }
        this.recipe = recipe;
        for (String name : recipe.factors()) {
            ReturnSeries series = factors == null ? null : factors.get(name);
            if (series == null) {
                throw new IllegalArgumentException("the signal reads factor '" + name + "': pass its return series");
            }
            Map<LocalDate, Double> byDate = new HashMap<>();
            for (int i = 0; i < series.size(); i++) {
                byDate.put(series.date(i), series.value(i));
            }
            factorReturns.put(name, byDate);
        }
        this.depth = recipe.lookback() + extraDepth + 1;
        this.numbers = new HashSet<>(recipe.numberColumns());
        this.labels = new HashSet<>(recipe.labelColumns());
        this.held = new CrossSection[depth];
        this.heldIndex = new int[depth];
        java.util.Arrays.fill(heldIndex, -1);
    }

    /** The values at grid index k of {@code panel}, aligned with {@code panel.crossSection(k)}'s rows (NaN = missing). */
    public static double[] evaluate(Recipe recipe, PanelSource panel, Map<String, ReturnSeries> factors, int k) {
        SignalEvaluator evaluator = new SignalEvaluator(recipe, factors, 0);
        for (int j = Math.max(0, k - recipe.lookback()); j <= k; j++) {
            evaluator.offer(j, panel.crossSection(j));
        }
        return evaluator.valueAt(k);
    }

    /** Grid dates before k that the value at k reads. */
    public int lookback() {
        return recipe.lookback();
    }

    /** Hands over the cross-section at grid index {@code index}: the first offer starts anywhere, then consecutively. */
    public void offer(int index, CrossSection rows) {
        if (newest >= 0 && index != newest + 1) {
            throw new IllegalArgumentException("cross-sections must be offered in grid order: got #" + index
                    + " after #" + newest);
        }
        int slot = index % depth;
        held[slot] = slim(rows);
        heldIndex[slot] = index;
        newest = index;
    }

    /** The recipe's values at grid index k (k within the held history), aligned with the rows offered at k. */
    public double[] valueAt(int k) {
        if (k < 0 || k > newest || Math.max(0, k - recipe.lookback()) < newest - depth + 1) {
            throw new IllegalArgumentException("grid index #" + k + " is outside the held history (newest #" + newest + ")");
        }
        return cached(recipe, k);
    }

    private CrossSection heldRows(int j) {
        int slot = j % depth;
        if (j < 0 || heldIndex[slot] != j) {
            throw new IllegalStateException("cross-section #" + j + " is not held (newest #" + newest + ", depth " + depth + ")");
        }
        return held[slot];
    }

    private double[] cached(Recipe r, int j) {
        if (j < 0) {
            return null;
        }
        if (r instanceof Recipe.Column) {
            return r.evaluate(context, j);
        }
        double[][] values = cache.computeIfAbsent(r, x -> new double[depth][]);
        int[] index = cacheIndex.computeIfAbsent(r, x -> {
            int[] a = new int[depth];
            java.util.Arrays.fill(a, -1);
            return a;
        });
        int slot = j % depth;
        if (index[slot] != j) {
            values[slot] = r.evaluate(context, j);
            index[slot] = j;
        }
        return values[slot];
    }

    /** The cross-section with only the columns the recipe reads (return is always kept). */
    private CrossSection slim(CrossSection rows) {
        Map<String, double[]> keptNumbers = new HashMap<>();
        for (String name : numbers) {
            if (!name.equals("return") && !name.equals("market_cap")) {
                keptNumbers.put(name, rows.numberColumn(name));
            }
        }
        Map<String, String[]> keptLabels = new HashMap<>();
        for (String name : labels) {
            keptLabels.put(name, rows.labelColumn(name));
        }
        return new CrossSection(rows.date(), rows.securityIds(), rows.returns(), rows.marketCaps(), keptNumbers, keptLabels);
    }
}
