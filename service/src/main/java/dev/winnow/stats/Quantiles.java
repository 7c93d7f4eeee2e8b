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
}
