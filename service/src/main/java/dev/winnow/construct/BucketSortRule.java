package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.stats.Quantiles;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Single sort into B buckets. Breakpoints are the type-7 quantiles at j/B (j = 1..B-1) of the breakpoint rows'
 * signals; a security's bucket is 1 + the number of breakpoints its signal is strictly above, so ties at a
 * breakpoint go to the lower bucket. Holds every bucket, bucket j at index j-1; the long leg is the top bucket and
 * the short leg the bottom one for high_minus_low (the reverse for low_minus_high), and every bucket is a stored
 * portfolio named "1".."B".
 */
final class BucketSortRule implements PortfolioRule {
    private final FactorDefinition def;
    private final int buckets;
    private final boolean capWeighted;
    private final boolean highMinusLow;

    BucketSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
        this.highMinusLow = def.effectiveDirection() == Direction.HIGH_MINUS_LOW;
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal);
        int[] breakpointRows = Eligibility.breakpointRows(def, rows, eligible);
        Holding[] held = new Holding[buckets];
        if (breakpointRows.length == 0) {
            Arrays.setAll(held, j -> Holding.empty());
            return held;
        }
        int[][] members = membersOf(signal, eligible, cuts(signal, breakpointRows, buckets), buckets);
        for (int j = 0; j < buckets; j++) {
            held[j] = Holding.of(rows, members[j], capWeighted);
        }
        return held;
    }

    /** The B-1 breakpoints: type-7 quantiles at j/B (j = 1..B-1) of the signal over {@code rows}. */
    static double[] cuts(double[] signal, int[] rows, int buckets) {
        double[] values = new double[rows.length];
        for (int k = 0; k < rows.length; k++) {
            values[k] = signal[rows[k]];
        }
        double[] probabilities = new double[buckets - 1];
        for (int j = 1; j < buckets; j++) {
            probabilities[j - 1] = j / (double) buckets;
        }
        // selection, not a sort: the breakpoints are all a sort needs of the ordered sample
        return Quantiles.type7Select(values, probabilities);
    }

    /**
     * Every bucket of a sort of {@code rows} into B buckets on breakpoints from those same rows: members[j-1] holds
     * the rows of bucket j, in the given order.
     */
    static int[][] bucketsOf(double[] signal, int[] rows, int buckets) {
        return membersOf(signal, rows, cuts(signal, rows, buckets), buckets);
    }

    /**
     * The rows of each bucket on the given breakpoints, in the given order: members[j-1] holds bucket j. Counts
     * first, so that each bucket's array is allocated at its size (not B arrays as long as all the rows).
     */
    private static int[][] membersOf(double[] signal, int[] rows, double[] cuts, int buckets) {
        int[] bucket = new int[rows.length];
        int[] counts = new int[buckets];
        for (int k = 0; k < rows.length; k++) {
            int j = bucketOf(signal[rows[k]], cuts) - 1;
            bucket[k] = j;
            counts[j]++;
        }
        int[][] members = new int[buckets][];
        for (int j = 0; j < buckets; j++) {
            members[j] = new int[counts[j]];
        }
        int[] filled = new int[buckets];
        for (int k = 0; k < rows.length; k++) {
            int j = bucket[k];
            members[j][filled[j]++] = rows[k];
        }
        return members;
    }

    /** Buckets "1".."B", bucket j being sub-portfolio j-1 (the layout of this rule and of the within sort). */
    static List<Portfolio> namedBuckets(int buckets) {
        List<Portfolio> out = new ArrayList<>(buckets);
        for (int j = 0; j < buckets; j++) {
            out.add(new Portfolio(String.valueOf(j + 1), new int[] {j}));
        }
        return out;
    }

    static int bucketOf(double value, double[] cuts) {
        int above = 0;
        for (double cut : cuts) {
            if (value > cut) {
                above++;
            }
        }
        return 1 + above;
    }

    @Override
    public int[] longLeg() {
        return new int[] {highMinusLow ? buckets - 1 : 0};
    }

    @Override
    public int[] shortLeg() {
        return new int[] {highMinusLow ? 0 : buckets - 1};
    }

    @Override
    public List<Portfolio> portfolios() {
        return namedBuckets(buckets);
    }
}
