package dev.winnow.stats;

import java.util.Arrays;
import java.util.Comparator;
import java.util.stream.IntStream;

/**
 * Adjusted p-values for N simultaneous tests. Each method returns the usual adjusted p-value:
 * monotone in the raw p-value and capped at 1, so that "adjusted p &lt;= q" is exactly the
 * decision of the procedure at level q.
 *
 * <p>The output has the input's order. NaN inputs (tests that could not be computed) are left out
 * of N and stay NaN in the output; every other input must lie in [0, 1].
 *
 * <p>Below, p_(1) &lt;= ... &lt;= p_(N) are the sorted non-NaN p-values.
 */
public final class MultipleTesting {

    private MultipleTesting() {
    }

    /** Bonferroni: adjusted p = min(1, N p). */
    public static double[] bonferroni(double[] pValues) {
        double[] adjusted = validatedCopy(pValues);
        int n = countPresent(adjusted);
        for (int i = 0; i < adjusted.length; i++) {
            if (!Double.isNaN(adjusted[i])) {
                adjusted[i] = Math.min(1.0, n * adjusted[i]);
            }
        }
        return adjusted;
    }

    /**
     * Holm's step-down procedure (Holm 1979, Scandinavian Journal of Statistics 6):
     * adjusted p_(i) = max_{j &lt;= i} min(1, (N - j + 1) p_(j)).
     */
    public static double[] holm(double[] pValues) {
        double[] adjusted = validatedCopy(pValues);
        int[] order = ascendingOrderOfPresent(adjusted);
        int n = order.length;
        double runningMax = 0.0;
        for (int rank = 1; rank <= n; rank++) {
            int index = order[rank - 1];
            runningMax = Math.max(runningMax, Math.min(1.0, (n - rank + 1) * adjusted[index]));
            adjusted[index] = runningMax;
        }
        return adjusted;
    }

    /**
     * Benjamini-Hochberg step-up procedure controlling the false discovery rate
     * (Benjamini and Hochberg 1995, JRSS B 57(1)):
     * adjusted p_(i) = min_{j &gt;= i} min(1, N p_(j) / j).
     */
    public static double[] benjaminiHochberg(double[] pValues) {
        return stepUp(pValues, 1.0);
    }

    /**
     * Benjamini-Yekutieli procedure, valid under arbitrary dependence
     * (Benjamini and Yekutieli 2001, Annals of Statistics 29(4)):
     * adjusted p_(i) = min_{j &gt;= i} min(1, c(N) N p_(j) / j) with c(N) = sum_{i=1..N} 1/i.
     */
    public static double[] benjaminiYekutieli(double[] pValues) {
        int n = countPresent(validatedCopy(pValues));
        double harmonic = 0.0;
        for (int i = 1; i <= n; i++) {
            harmonic += 1.0 / i;
        }
        return stepUp(pValues, harmonic);
    }

    private static double[] stepUp(double[] pValues, double factor) {
        double[] adjusted = validatedCopy(pValues);
        int[] order = ascendingOrderOfPresent(adjusted);
        int n = order.length;
        double runningMin = 1.0;
        for (int rank = n; rank >= 1; rank--) {
            int index = order[rank - 1];
            runningMin = Math.min(runningMin, Math.min(1.0, factor * n * adjusted[index] / rank));
            adjusted[index] = runningMin;
        }
        return adjusted;
    }

    private static double[] validatedCopy(double[] pValues) {
        if (pValues == null) {
            throw new IllegalArgumentException("p-values must not be null; pass an empty array for no tests");
        }
        for (int i = 0; i < pValues.length; i++) {
            double p = pValues[i];
            if (!Double.isNaN(p) && !(p >= 0.0 && p <= 1.0)) {
                throw new IllegalArgumentException("p-value at index " + i + " is " + p + "; p-values must lie in [0, 1] (NaN marks a missing test)");
            }
        }
        return pValues.clone();
    }

    private static int countPresent(double[] values) {
        return (int) Arrays.stream(values).filter(v -> !Double.isNaN(v)).count();
    }

    private static int[] ascendingOrderOfPresent(double[] values) {
        return IntStream.range(0, values.length)
                .filter(i -> !Double.isNaN(values[i]))
                .boxed()
                .sorted(Comparator.comparingDouble(i -> values[i]))
                .mapToInt(Integer::intValue)
                .toArray();
    }
}
