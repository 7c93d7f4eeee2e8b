package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.stats.Quantiles;
import java.util.Arrays;

/**
 * Single sort into B buckets. Breakpoints are the type-7 quantiles at j/B (j = 1..B-1) of the breakpoint rows'
 * signals; a security's bucket is 1 + the number of breakpoints its signal is strictly above, so ties at a
 * breakpoint go to the lower bucket. Holds the long bucket (index 0) and the short bucket (index 1) only.
 */
final class BucketSortRule implements PortfolioRule {
    private final FactorDefinition def;
    private final int buckets;
    private final boolean capWeighted;

    BucketSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal);
        int[] breakpointRows = Eligibility.breakpointRows(def, rows, eligible);
        if (breakpointRows.length == 0) {
            return new Holding[] {Holding.empty(), Holding.empty()};
        }
        double[] sorted = Eligibility.sortedValues(signal, breakpointRows);
        double[] cuts = new double[buckets - 1];
        for (int j = 1; j < buckets; j++) {
            cuts[j - 1] = Quantiles.type7Sorted(sorted, j / (double) buckets);
        }
        int[] low = new int[eligible.length];
        int[] high = new int[eligible.length];
        int lows = 0;
        int highs = 0;
        for (int i : eligible) {
            int bucket = bucketOf(signal[i], cuts);
            if (bucket == 1) {
                low[lows++] = i;
            } else if (bucket == buckets) {
                high[highs++] = i;
            }
        }
        Holding lowHolding = Holding.of(rows, Arrays.copyOf(low, lows), capWeighted);
        Holding highHolding = Holding.of(rows, Arrays.copyOf(high, highs), capWeighted);
        return def.effectiveDirection() == Direction.HIGH_MINUS_LOW
                ? new Holding[] {highHolding, lowHolding}
                : new Holding[] {lowHolding, highHolding};
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
        return new int[] {0};
    }

    @Override
    public int[] shortLeg() {
        return new int[] {1};
    }
}
