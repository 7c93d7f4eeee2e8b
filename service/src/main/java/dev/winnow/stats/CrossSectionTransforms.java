package dev.winnow.stats;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;
import java.util.function.UnaryOperator;

/**
 * Cross-sectional transforms of one date's values, for signal recipes. Each works on the finite values only (a
 * missing input stays missing) and, with group labels, separately inside each group (a missing label is missing).
 */
public final class CrossSectionTransforms {
    private CrossSectionTransforms() {
    }

    /**
     * Applies {@code transform} to the finite values of {@code values} (all together, or inside each group of equal
     * {@code groups} labels when given), writing results back to their positions; NaN elsewhere.
     */
    public static double[] byGroup(double[] values, String[] groups, UnaryOperator<double[]> transform) {
        int n = values.length;
        if (groups != null && groups.length != n) {
            throw new IllegalArgumentException("group labels (" + groups.length + ") and values (" + n + ") differ in length");
        }
        double[] out = new double[n];
        Arrays.fill(out, Double.NaN);
        Map<String, int[]> members = new HashMap<>();
        Map<String, Integer> sizes = new HashMap<>();
        String whole = "";
        for (int i = 0; i < n; i++) {
            if (!Double.isFinite(values[i]) || (groups != null && groups[i] == null)) {
                continue;
            }
            String g = groups == null ? whole : groups[i];
            int size = sizes.getOrDefault(g, 0);
            int[] list = members.computeIfAbsent(g, x -> new int[n]);
            list[size] = i;
            sizes.put(g, size + 1);
        }
        for (Map.Entry<String, int[]> e : members.entrySet()) {
            int size = sizes.get(e.getKey());
            int[] rows = e.getValue();
            double[] group = new double[size];
            for (int k = 0; k < size; k++) {
                group[k] = values[rows[k]];
            }
            double[] result = transform.apply(group);
            for (int k = 0; k < size; k++) {
                out[rows[k]] = result[k];
            }
        }
        return out;
    }

    /**
     * Scaled ranks (a - 1) / (n - 1), a the average rank (ties share the mean of the ranks they span, as scipy's
     * {@code rankdata(method='average')}); 0.5 when n = 1.
     */
    public static double[] rankScaled(double[] values) {
        int n = values.length;
        double[] out = new double[n];
        if (n == 1) {
            out[0] = 0.5;
            return out;
        }
        double[] ranks = Ranks.averageRanks(values, n);
        for (int i = 0; i < n; i++) {
            out[i] = (ranks[i] - 1.0) / (n - 1);
        }
        return out;
    }

    /**
     * z = (x - mean) / s with the sample standard deviation s = sqrt(sum (x - mean)^2 / (n - 1)), two-pass; all NaN
     * when n < 2 or s = 0.
     */
    public static double[] zScore(double[] values) {
        int n = values.length;
        double[] out = new double[n];
        double mean = mean(values);
        double squares = 0.0;
        for (double v : values) {
            squares += (v - mean) * (v - mean);
        }
        double sd = n < 2 ? 0.0 : Math.sqrt(squares / (n - 1));
        for (int i = 0; i < n; i++) {
            out[i] = sd > 0 ? (values[i] - mean) / sd : Double.NaN;
        }
        return out;
    }

    /** Each value clipped to [Q(lower), Q(upper)], Q the type-7 quantile of the values ({@link Quantiles}). */
    public static double[] winsorize(double[] values, double lower, double upper) {
        if (!(lower >= 0 && lower < upper && upper <= 1)) {
            throw new IllegalArgumentException("winsorising needs 0 <= lower < upper <= 1, got " + lower + " and " + upper);
        }
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        double lo = Quantiles.type7Sorted(sorted, lower);
        double hi = Quantiles.type7Sorted(sorted, upper);
        double[] out = new double[values.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = Math.min(Math.max(values[i], lo), hi);
        }
        return out;
    }

    /** x - mean(x). */
    public static double[] demean(double[] values) {
        double mean = mean(values);
        double[] out = new double[values.length];
        for (int i = 0; i < out.length; i++) {
            out[i] = values[i] - mean;
        }
        return out;
    }

    private static double mean(double[] values) {
        double sum = 0.0;
        for (double v : values) {
            sum += v;
        }
        return sum / values.length;
    }
}
