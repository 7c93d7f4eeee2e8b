package dev.winnow.construct;

import java.util.Arrays;

/** Helpers for recipe operations along the grid: aligning an earlier date's values to today's rows. */
final class Along {
    private Along() {
    }

    /**
     * Values given for securities {@code fromIds} (increasing) re-indexed to the securities {@code toIds}
     * (increasing): NaN for a security absent from {@code fromIds}. One merge pass.
     */
    static double[] align(int[] fromIds, double[] fromValues, int[] toIds) {
        double[] out = new double[toIds.length];
        int a = 0;
        for (int i = 0; i < toIds.length; i++) {
            int id = toIds[i];
            while (a < fromIds.length && fromIds[a] < id) {
                a++;
            }
            out[i] = a < fromIds.length && fromIds[a] == id ? fromValues[a] : Double.NaN;
        }
        return out;
    }

    /** The recipe's value at k - p aligned to the rows at k; all missing when k - p < 0. */
    static double[] past(Recipe.Context ctx, Recipe of, int k, int p) {
        int[] ids = ctx.rows(k).securityIds();
        if (k - p < 0) {
            double[] out = new double[ids.length];
            Arrays.fill(out, Double.NaN);
            return out;
        }
        return align(ctx.rows(k - p).securityIds(), ctx.valueOf(of, k - p), ids);
    }

    /** The recipe's values at k-p+1 .. k aligned to the rows at k, oldest first; null when k - p + 1 < 0. */
    static double[][] window(Recipe.Context ctx, Recipe of, int k, int p) {
        if (k - p + 1 < 0) {
            return null;
        }
        double[][] out = new double[p][];
        for (int j = k - p + 1; j <= k; j++) {
            out[j - (k - p + 1)] = past(ctx, of, k, k - j);
        }
        return out;
    }

    /** The mean of row i over the window, summed oldest first; NaN when any value is missing. */
    static double mean(double[][] window, int i) {
        double sum = 0.0;
        for (double[] column : window) {
            sum += column[i];
        }
        return finite(sum / window.length);
    }

    /** The value, or NaN when it is not finite (a missing value stays missing, an overflow becomes missing). */
    static double finite(double x) {
        return Double.isFinite(x) ? x : Double.NaN;
    }
}
