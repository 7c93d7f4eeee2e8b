package dev.winnow.construct;

import java.util.Arrays;

/**
 * One sub-portfolio while it is held: its members (increasing security ids) and their current values, which start
 * as weights summing to one and drift with each member's return. A member without a return in a period leaves for
 * the rest of the holding period. Mutable on purpose: it is the engine's working state, copied into
 * {@link EngineState} for persistence.
 */
final class Holding {
    private int[] ids;
    private double[] values;
    private int size;

    Holding(int[] ids, double[] values) {
        this.ids = ids;
        this.values = values;
        this.size = ids.length;
    }

    static Holding empty() {
        return new Holding(new int[0], new double[0]);
    }

    /** Members {@code rows} of a cross-section, weighted equally or by market cap, normalised to sum to one. */
    static Holding of(CrossSection xs, int[] rows, boolean capWeighted) {
        int[] memberIds = new int[rows.length];
        double[] weights = new double[rows.length];
        double total = 0.0;
        for (int k = 0; k < rows.length; k++) {
            memberIds[k] = xs.securityIds()[rows[k]];
            weights[k] = capWeighted ? xs.marketCaps()[rows[k]] : 1.0;
            total += weights[k];
        }
        for (int k = 0; k < rows.length; k++) {
            weights[k] /= total;
        }
        return new Holding(memberIds, weights);
    }

    int size() {
        return size;
    }

    int id(int k) {
        return ids[k];
    }

    double value(int k) {
        return values[k];
    }

    int[] idsCopy() {
        return Arrays.copyOf(ids, size);
    }

    double[] valuesCopy() {
        return Arrays.copyOf(values, size);
    }

    /**
     * The value-weighted return sum(v_i r_i) / sum(v_i) of the members with a (finite) return in this cross-section,
     * using values before the drift; then drops the members without a return and drifts the others by (1 + r_i).
     * NaN when no member has a return.
     */
    double holdThrough(CrossSection xs) {
        return holdThrough(xs, null);
    }

    /**
     * As {@link #holdThrough(CrossSection)}, finding members through {@code rowOf} when given: the cross-section's row
     * of each security id (-1 where absent, and ids past its end absent), built once per date for all sub-portfolios
     * ({@link #rowIndex}) instead of one merge over the whole cross-section per sub-portfolio.
     */
    double holdThrough(CrossSection xs, int[] rowOf) {
        int[] rowIds = xs.securityIds();
        double[] returns = xs.returns();
        double weighted = 0.0;
        double total = 0.0;
        int kept = 0;
        int row = 0;
        for (int k = 0; k < size; k++) {
            int id = ids[k];
            double r;
            if (rowOf != null) {
                int at = id >= 0 && id < rowOf.length ? rowOf[id] : -1;
                r = at >= 0 ? returns[at] : Double.NaN;
            } else {
                while (row < rowIds.length && rowIds[row] < id) {
                    row++;
                }
                r = row < rowIds.length && rowIds[row] == id ? returns[row] : Double.NaN;
            }
            if (!Double.isFinite(r)) {
                continue;
            }
            weighted += values[k] * r;
            total += values[k];
            ids[kept] = id;
            values[kept] = values[k] * (1.0 + r);
            kept++;
        }
        size = kept;
        return kept == 0 ? Double.NaN : weighted / total;
    }

    /**
     * The row of each security id of {@code xs} (ids ascending and non-negative): -1 where absent. Reuses {@code scratch}
     * when it is large enough; null when the ids are too sparse for a dense index (then members are found by merging).
     */
    static int[] rowIndex(CrossSection xs, int[] scratch) {
        int[] rowIds = xs.securityIds();
        int n = rowIds.length;
        if (n == 0 || rowIds[0] < 0) {
            return null;
        }
        int maxId = rowIds[n - 1];
        if (maxId > 16L * n + 1024) {
            return null;
        }
        int[] index = scratch != null && scratch.length > maxId ? scratch : new int[maxId + 1 + (maxId >> 3)];
        Arrays.fill(index, -1);
        for (int row = 0; row < n; row++) {
            index[rowIds[row]] = row;
        }
        return index;
    }

}
