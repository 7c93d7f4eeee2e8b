package dev.winnow.stats;

import java.util.Arrays;

/**
 * One variable's values over a set of keys (the securities of one cross-section: increasing integer ids), prepared
 * once so that its correlations with many other keyed variables over the keys both have stay linear: the values'
 * stable sort order is computed when the values are, and the Spearman (1904) ranks among the common keys are then
 * read off that order in one walk ({@link Ranks#ranksAmong}), instead of sorting the common values again for every pair.
 * The result is the same number, to the last bit, as {@link Correlations#spearman} (or {@link Correlations#pearson})
 * of the common values gathered in key order: the average ranks are exact halves, and the Pearson step is the same
 * function over the same values in the same order.
 */
public final class KeyedValues {
    private final int[] keys;
    private final double[] values;
    private final int[] order;
    private final boolean distinct;

    private KeyedValues(int[] keys, double[] values, int[] order) {
        this.keys = keys;
        this.values = values;
        this.order = order;
        this.distinct = order != null && Ranks.distinct(order, values);
    }

    /**
     * @param keys   strictly increasing keys (not copied: the caller hands them over)
     * @param values one finite value per key (not copied)
     * @param method SPEARMAN computes the sort order now; PEARSON needs none
     */
    public static KeyedValues of(int[] keys, double[] values, Correlations.Method method) {
        if (keys.length != values.length) {
            throw new IllegalArgumentException("keys and values must pair up: lengths " + keys.length + " and " + values.length);
        }
        for (int i = 0; i < keys.length; i++) {
            if (i > 0 && keys[i] <= keys[i - 1]) {
                throw new IllegalArgumentException("keys must increase strictly; key " + keys[i] + " follows " + keys[i - 1]);
            }
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("values must be finite; value " + i + " is " + values[i]);
            }
        }
        return new KeyedValues(keys, values, method == Correlations.Method.SPEARMAN ? Ranks.sortedOrder(values) : null);
    }

    public int size() {
        return keys.length;
    }

    /**
     * The correlation of x and y over the keys both have, x's and y's values paired by key: Spearman (both must have
     * been prepared for it) or Pearson (Pearson 1896). NaN when fewer than {@code minCommon} keys are common (and, as in
     * {@link Correlations}, with fewer than {@value Correlations#MIN_OBSERVATIONS} pairs or a side without variation).
     */
    public static double correlation(KeyedValues x, KeyedValues y, Correlations.Method method, int minCommon) {
        boolean spearman = method == Correlations.Method.SPEARMAN;
        if (spearman && (x.order == null || y.order == null)) {
            throw new IllegalArgumentException("a Spearman correlation needs both sides prepared with method SPEARMAN");
        }
        int[] commonX = new int[x.keys.length];
        int[] commonY = new int[y.keys.length];
        int n = 0;
        int j = 0;
        for (int i = 0; i < x.keys.length; i++) {
            int key = x.keys[i];
            while (j < y.keys.length && y.keys[j] < key) {
                commonY[j++] = -1;
            }
            if (j < y.keys.length && y.keys[j] == key) {
                commonX[i] = n;
                commonY[j++] = n++;
            } else {
                commonX[i] = -1;
            }
        }
        Arrays.fill(commonY, j, commonY.length, -1);
        if (n < minCommon || n < Correlations.MIN_OBSERVATIONS) {
            return Double.NaN;
        }
        double[] a = new double[n];
        double[] b = new double[n];
        if (spearman) {
            Ranks.ranksAmong(x.order, x.values, x.distinct, commonX, a);
            Ranks.ranksAmong(y.order, y.values, y.distinct, commonY, b);
        } else {
            gather(x.values, commonX, a);
            gather(y.values, commonY, b);
        }
        return Correlations.pearson(a, b, n);
    }

    private static void gather(double[] values, int[] common, double[] out) {
        for (int i = 0; i < values.length; i++) {
            if (common[i] >= 0) {
                out[common[i]] = values[i];
            }
        }
    }
}
