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
 * {@code weighting} across the pooled members. Holds every pooled bucket, bucket j at index j-1 (stored as portfolio
 * "j"); the legs are the extreme buckets as in {@link BucketSortRule}.
 */
final class WithinGroupSortRule implements PortfolioRule {
    private final FactorDefinition def;
    private final int buckets;
    private final boolean capWeighted;
    private final boolean highMinusLow;

    WithinGroupSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
        this.highMinusLow = def.effectiveDirection() == Direction.HIGH_MINUS_LOW;
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
        int[][] pooled = new int[buckets][rows.size()];
        int[] counts = new int[buckets];
        for (List<Integer> group : groups.values()) {
            if (group.size() < buckets) {
                continue;
            }
            int[][] members = BucketSortRule.bucketsOf(signal, group.stream().mapToInt(Integer::intValue).toArray(), buckets);
            for (int j = 0; j < buckets; j++) {
                System.arraycopy(members[j], 0, pooled[j], counts[j], members[j].length);
                counts[j] += members[j].length;
            }
        }
        Holding[] held = new Holding[buckets];
        for (int j = 0; j < buckets; j++) {
            int[] bucketRows = Arrays.copyOf(pooled[j], counts[j]);
            Arrays.sort(bucketRows);
            held[j] = Holding.of(rows, bucketRows, capWeighted);
        }
        return held;
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
        return BucketSortRule.namedBuckets(buckets);
    }
}
