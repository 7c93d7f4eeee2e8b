package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Weighting;
import dev.winnow.stats.Quantiles;
import java.util.Arrays;
import java.util.Map;

/**
 * Which rows of the formation cross-section may enter the portfolios. The method's own rule first (sort: finite
 * signal, plus market_cap finite and positive when cap-weighted, plus a finite control signal in a double sort;
 * size_sort: both; market: positive cap; rank_weighted: finite signal), then the
 * {@link Universe} restrictions in their documented order.
 */
final class Eligibility {
    private Eligibility() {
    }

    /** Eligible row indices of {@code xs}, increasing; {@code signal} aligned with its rows (null: no signal needed). */
    static int[] eligibleRows(FactorDefinition def, CrossSection xs, double[] signal) {
        return eligibleRows(def, xs, signal, null);
    }

    /** The same, also requiring a finite {@code control} value (a dependent double sort's control signal) when given. */
    static int[] eligibleRows(FactorDefinition def, CrossSection xs, double[] signal, double[] control) {
        boolean needsCap = def.method() == Method.SIZE_SORT || def.method() == Method.MARKET
                || (def.method() == Method.SORT && def.effectiveWeighting() == Weighting.CAP);
        return rows(def.effectiveUniverse(), xs, signal, control, needsCap);
    }

    /**
     * Row indices of {@code xs}, increasing, with a finite {@code signal} (unless null), a finite positive market_cap
     * when {@code needsCap}, that pass the universe's restrictions.
     */
    static int[] rows(Universe universe, CrossSection xs, double[] signal, boolean needsCap) {
        return rows(universe, xs, signal, null, needsCap);
    }

    /** The same, also requiring a finite {@code control} value when given. */
    static int[] rows(Universe universe, CrossSection xs, double[] signal, double[] control, boolean needsCap) {
        int n = xs.size();
        double[] caps = xs.marketCaps();
        Double minCap = universe.minMarketCap();
        String[][] filterLabels = new String[universe.labelFilters().size()][];
        LabelFilter[] filters = new LabelFilter[filterLabels.length];
        int f = 0;
        for (Map.Entry<String, LabelFilter> e : universe.labelFilters().entrySet()) {
            filterLabels[f] = xs.labelColumn(e.getKey());
            filters[f++] = e.getValue();
        }
        LabelEquals segment = universe.segment();
        String[] segmentLabels = segment == null ? null : xs.labelColumn(segment.column());
        int[] kept = new int[n];
        int m = 0;
        rows:
        for (int i = 0; i < n; i++) {
            if ((signal != null && !Double.isFinite(signal[i])) || (control != null && !Double.isFinite(control[i]))
                    || (needsCap && !hasPositiveCap(caps[i]))) {
                continue;
            }
            if (minCap != null && !(Double.isFinite(caps[i]) && caps[i] >= minCap)) {
                continue;
            }
            for (int k = 0; k < filters.length; k++) {
                if (!filters[k].admits(filterLabels[k][i])) {
                    continue rows;
                }
            }
            if (segment != null && !segment.matches(segmentLabels[i])) {
                continue;
            }
            kept[m++] = i;
        }
        int[] eligible = Arrays.copyOf(kept, m);
        return universe.sizeHalf() == null ? eligible : sizeHalf(eligible, caps, universe.sizeHalf());
    }

    /** The eligible rows whose breakpoint label matches; all eligible rows without a breakpoint subset. */
    static int[] breakpointRows(FactorDefinition def, CrossSection xs, int[] eligible) {
        LabelEquals subset = def.breakpoints();
        if (subset == null) {
            return eligible;
        }
        String[] labels = xs.labelColumn(subset.column());
        return Arrays.stream(eligible).filter(i -> subset.matches(labels[i])).toArray();
    }

    /** Values of a column at the given rows, sorted ascending (ready for {@link Quantiles#type7Sorted}). */
    static double[] sortedValues(double[] column, int[] rows) {
        double[] values = new double[rows.length];
        for (int k = 0; k < rows.length; k++) {
            values[k] = column[rows[k]];
        }
        Arrays.sort(values);
        return values;
    }

    static boolean hasPositiveCap(double cap) {
        return Double.isFinite(cap) && cap > 0;
    }

    /** Keeps the rows at or below (SMALL) or above (BIG) the type-7 median cap; rows without a positive cap drop. */
    private static int[] sizeHalf(int[] rows, double[] caps, SizeHalf half) {
        int[] withCap = Arrays.stream(rows).filter(i -> hasPositiveCap(caps[i])).toArray();
        double median = Quantiles.type7Sorted(sortedValues(caps, withCap), 0.5);
        return Arrays.stream(withCap).filter(i -> (caps[i] <= median) == (half == SizeHalf.SMALL)).toArray();
    }
}
