package dev.winnow.stats;

import java.util.Arrays;

/**
 * Sample quantiles by definition 7 of Hyndman and Fan (1996), "Sample Quantiles in Statistical Packages",
 * The American Statistician 50(4), 361-365: linear interpolation between order statistics,
 * <pre>
 *   h = (n - 1) p,   Q(p) = x[floor h] + (h - floor h) (x[floor h + 1] - x[floor h])
 * </pre>
 * with the sorted sample x[0] <= ... <= x[n-1] (0-based) and Q(1) = x[n-1]. This is the default of R's
 * {@code quantile}, of numpy's {@code quantile} (method "linear") and Commons Math's {@code EstimationType.R_7}.
 */
public final class Quantiles {
    private Quantiles() {
    }

    /** Type-7 quantile of unsorted finite values; NaN for an empty sample. The input is not modified. */
    public static double type7(double[] values, double p) {
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        return type7Sorted(sorted, p);
    }

    /**
     * Type-7 quantile of values already sorted ascending (the caller sorts once for several probabilities);
     * NaN for an empty sample.
     *
     * @throws IllegalArgumentException when p is outside [0, 1] or a value is not finite
     */
    public static double type7Sorted(double[] sorted, double p) {
        if (!(p >= 0.0 && p <= 1.0)) {
            throw new IllegalArgumentException("quantile probability must be within [0, 1], got " + p);
        }
        int n = sorted.length;
        if (n == 0) {
            return Double.NaN;
        }
        if (!Double.isFinite(sorted[0]) || !Double.isFinite(sorted[n - 1])) {
            throw new IllegalArgumentException("quantile sample must hold finite values only; drop missing values first");
        }
        double h = (n - 1) * p;
        int j = (int) Math.floor(h);
        if (j >= n - 1) {
            return sorted[n - 1];
        }
        return sorted[j] + (h - j) * (sorted[j + 1] - sorted[j]);
    }

    /**
     * Type-7 quantiles (the definition above) at several probabilities at once, by selection instead of a full sort:
     * only the order statistics x[floor h] and x[floor h + 1] of each probability are put in place, by a multiple
     * selection (Hoare's FIND, 1961, "Algorithm 65: Find", CACM 4(7): partition around a pivot and continue only in
     * the parts that hold a wanted rank; the partition is branch-free, see {@code select}), expected time O(n log k)
     * for k probabilities instead of O(n log n). Gives
     * exactly the values of {@link #type7Sorted} on the sorted sample (the same order statistics, the same formula; only
     * the sign of a zero may differ, which no comparison sees).
     *
     * @param values        the sample, finite values only; reordered in place
     * @param probabilities each within [0, 1]
     * @return the quantile at each probability, in the given order; NaN for an empty sample
     * @throws IllegalArgumentException when a probability is outside [0, 1] or a value is not finite
     */
    public static double[] type7Select(double[] values, double[] probabilities) {
        int n = values.length;
        double[] out = new double[probabilities.length];
        for (double p : probabilities) {
            if (!(p >= 0.0 && p <= 1.0)) {
                throw new IllegalArgumentException("quantile probability must be within [0, 1], got " + p);
            }
        }
        if (n == 0) {
            Arrays.fill(out, Double.NaN);
            return out;
        }
        requireFinite(values);
        int[] ranks = new int[2 * probabilities.length];
        int k = 0;
        for (double p : probabilities) {
            int j = (int) Math.floor((n - 1) * p);
            ranks[k++] = Math.min(j, n - 1);
            ranks[k++] = Math.min(j + 1, n - 1);
        }
        // ascending and distinct, by hand: a stream here, and later Arrays.sort, made this method costly to compile
        // (C2 inlined them and compiled it four times during a build's first dates, 0.3 s of compiler time); the
        // loops over the sample are in methods of their own for the same reason
        int distinct = sortDistinct(ranks, k);
        select(values, 0, n - 1, ranks, 0, distinct - 1);
        for (int q = 0; q < probabilities.length; q++) {
            double h = (n - 1) * probabilities[q];
            int j = (int) Math.floor(h);
            out[q] = j >= n - 1 ? values[n - 1] : values[j] + (h - j) * (values[j + 1] - values[j]);
        }
        return out;
    }

    /**
     * Puts a[r] in its sorted place for every r in ranks[rLo..rHi] (ascending, all within [lo, hi]). Each step
     * partitions around the median of three with Lomuto's scheme (Bentley, 1986, "Programming Pearls", column 10) in
     * its branch-free form: every element is swapped into place and the boundary moves by the comparison's outcome,
     * so the loop has no branch that depends on the data. On an unordered sample each comparison is a coin toss, and
     * the mispredicted branches of Hoare's two inner loops cost several times the comparisons themselves.
     */
    private static void select(double[] a, int lo, int hi, int[] ranks, int rLo, int rHi) {
        while (rLo <= rHi) {
            if (hi - lo < 24) {
                insertionSort(a, lo, hi);
                return;
            }
            int mid = (lo + hi) >>> 1;
            double x = a[lo];
            double y = a[mid];
            double z = a[hi];
            double pivot = x < y ? (y < z ? y : Math.max(x, z)) : (x < z ? x : Math.max(y, z));
            // the pivot is one of the elements, so j <= hi
            int j = partitionBelow(a, lo, hi, pivot);
            if (j == lo) {
                // the pivot is the least element: its copies (the elements below the next double up) come first and
                // are in place, which always makes progress
                int k = partitionBelow(a, lo, hi, Math.nextUp(pivot));
                while (rLo <= rHi && ranks[rLo] < k) {
                    rLo++;
                }
                lo = k;
                continue;
            }
            int split = rLo;
            while (split <= rHi && ranks[split] < j) {
                split++;
            }
            // ranks[rLo..split) lie in a[lo..j), ranks[split..rHi] in a[j..hi], each part smaller than the whole:
            // recurse into the side with fewer ranks
            if (split - rLo < rHi - split + 1) {
                select(a, lo, j - 1, ranks, rLo, split - 1);
                lo = j;
                rLo = split;
            } else {
                select(a, j, hi, ranks, split, rHi);
                hi = j - 1;
                rHi = split - 1;
            }
        }
    }

    /**
     * Moves the elements of a[lo..hi] below the pivot to its front: afterwards a[lo..j) < pivot <= a[j..hi], j
     * returned. A method of its own so that the compiler sees its loop alone and turns the comparison into a
     * conditional move rather than a branch.
     */
    private static int partitionBelow(double[] a, int lo, int hi, double pivot) {
        int j = lo;
        for (int i = lo; i <= hi; i++) {
            double v = a[i];
            a[i] = a[j];
            a[j] = v;
            j += v < pivot ? 1 : 0;
        }
        return j;
    }

    private static void requireFinite(double[] values) {
        for (double v : values) {
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("quantile sample must hold finite values only; drop missing values first");
            }
        }
    }

    /** Sorts a[0..n) (a few ranks) and moves its distinct values to the front; returns how many there are. */
    private static int sortDistinct(int[] a, int n) {
        for (int i = 1; i < n; i++) {
            int v = a[i];
            int j = i - 1;
            while (j >= 0 && a[j] > v) {
                a[j + 1] = a[j];
                j--;
            }
            a[j + 1] = v;
        }
        int distinct = 0;
        for (int i = 0; i < n; i++) {
            if (distinct == 0 || a[i] != a[distinct - 1]) {
                a[distinct++] = a[i];
            }
        }
        return distinct;
    }

    private static void insertionSort(double[] a, int lo, int hi) {
        for (int i = lo + 1; i <= hi; i++) {
            double v = a[i];
            int j = i - 1;
            while (j >= lo && a[j] > v) {
                a[j + 1] = a[j];
                j--;
            }
            a[j + 1] = v;
        }
    }
}
