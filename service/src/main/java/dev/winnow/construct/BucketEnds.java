package dev.winnow.construct;

import dev.winnow.stats.Quantiles;
import java.util.Arrays;

/**
 * The two end buckets of a sort of some rows into B buckets: breakpoints are the type-7 quantiles at j/B
 * (j = 1..B-1) of those rows' signals, and a row's bucket is 1 + the number of breakpoints its signal is strictly
 * above (ties to the lower bucket), as in {@link BucketSortRule}.
 *
 * @param low  rows in bucket 1, in the given order
 * @param high rows in bucket B, in the given order
 */
record BucketEnds(int[] low, int[] high) {

    static BucketEnds of(double[] signal, int[] rows, int buckets) {
        double[] sorted = Eligibility.sortedValues(signal, rows);
        double[] cuts = new double[buckets - 1];
        for (int j = 1; j < buckets; j++) {
            cuts[j - 1] = Quantiles.type7Sorted(sorted, j / (double) buckets);
        }
        int[] low = new int[rows.length];
        int[] high = new int[rows.length];
        int lows = 0;
        int highs = 0;
        for (int row : rows) {
            int bucket = BucketSortRule.bucketOf(signal[row], cuts);
            if (bucket == 1) {
                low[lows++] = row;
            } else if (bucket == buckets) {
                high[highs++] = row;
            }
        }
        return new BucketEnds(Arrays.copyOf(low, lows), Arrays.copyOf(high, highs));
    }
}
