package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * A single sort into B buckets whose breakpoints are computed inside each group of a label column ({@code within}):
 * in each group, the type-7 quantiles at j/B of that group's eligible signals, ties to the lower bucket (as in
 * {@link BucketSortRule}). Securities with an empty label are not eligible, and a group with fewer eligible securities
 * than B sits out the formation. Bucket j pools the members of bucket j of every group, weighted by
 * {@code weighting} across the pooled members. Holds the long bucket (index 0) and the short bucket (index 1).
 */
final class WithinGroupSortRule implements LongShortRule {
    private final FactorDefinition def;
    private final int buckets;
    private final boolean capWeighted;

    WithinGroupSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        String[] labels = rows.labelColumn(def.within());
        Map<String, List<Integer>> groups = new TreeMap<>();
        for (int i : Eligibility.eligibleRows(def, rows, signal)) {
            if (labels[i] != null) {
                groups.computeIfAbsent(labels[i], k -> new ArrayList<>()).add(i);
            }
        }
        int[] low = new int[rows.size()];
        int[] high = new int[rows.size()];
        int lows = 0;
        int highs = 0;
        for (List<Integer> group : groups.values()) {
            if (group.size() < buckets) {
                continue;
            }
            BucketEnds ends = BucketEnds.of(signal, group.stream().mapToInt(Integer::intValue).toArray(), buckets);
            System.arraycopy(ends.low(), 0, low, lows, ends.low().length);
            lows += ends.low().length;
            System.arraycopy(ends.high(), 0, high, highs, ends.high().length);
            highs += ends.high().length;
        }
        int[] lowRows = Arrays.copyOf(low, lows);
        int[] highRows = Arrays.copyOf(high, highs);
        Arrays.sort(lowRows);
        Arrays.sort(highRows);
        Holding lowHolding = Holding.of(rows, lowRows, capWeighted);
        Holding highHolding = Holding.of(rows, highRows, capWeighted);
        return def.effectiveDirection() == Direction.HIGH_MINUS_LOW
                ? new Holding[] {highHolding, lowHolding}
                : new Holding[] {lowHolding, highHolding};
    }
}
