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
        if (spearman) {
            int[] a = new int[n];
            int[] b = new int[n];
            Ranks.doubledRanksAmong(x.order, x.values, x.distinct, commonX, a);
            Ranks.doubledRanksAmong(y.order, y.values, y.distinct, commonY, b);
            return rankCorrelation(a, b, n);
        }
        double[] a = new double[n];
        double[] b = new double[n];
        gather(x.values, commonX, a);
        gather(y.values, commonY, b);
        return Correlations.pearson(a, b, n);
    }

    /**
     * Pearson's correlation of two rank vectors given as doubled ranks (2 x rank, whole numbers). Ranks 1..n, ties
     * averaged, always sum to n(n+1)/2, so their mean is (n+1)/2; every deviation from it is a multiple of 1/2 and
     * every product a multiple of 1/4, so the shifted sums of {@link ShiftedSums} over these ranks are exact in
     * floating point (for n below about 10^5), whatever the order of summation. They are therefore computed here
     * exactly in integers, four times over, and handed to the same formula ({@link ShiftedSums#correlation}): the
     * result is bit for bit the one {@link Correlations#pearson} gives for the ranks as doubles, in one pass instead
     * of three.
     */
    static double rankCorrelation(int[] doubledX, int[] doubledY, int n) {
        long centre = n + 1L;
        long sumXX = 0;
        long sumYY = 0;
        long sumXY = 0;
        for (int u = 0; u < n; u++) {
            long dx = doubledX[u] - centre;
            long dy = doubledY[u] - centre;
            sumXX += dx * dx;
            sumYY += dy * dy;
            sumXY += dx * dy;
        }
        return ShiftedSums.correlation(n, 0.0, 0.0, sumXX / 4.0, sumYY / 4.0, sumXY / 4.0);
    }

    private static void gather(double[] values, int[] common, double[] out) {
        for (int i = 0; i < values.length; i++) {
            if (common[i] >= 0) {
                out[common[i]] = values[i];
            }
        }
    }
}
