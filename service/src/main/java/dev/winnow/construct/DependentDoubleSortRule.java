package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * A dependent double sort: at each formation the eligible securities (finite signal and finite control signal) are
 * split on the control signal into c buckets (type-7 breakpoints at i/c over the eligible, ties to the lower bucket),
 * then on the signal into B buckets inside each control bucket (breakpoints from that control bucket's members).
 * Signal bucket j of the factor is the equal-weighted average of the c portfolios (control i, signal bucket j), each
 * weighted inside by {@code weighting}. Holds all c x B portfolios, (control i, signal bucket j) at index
 * (i-1) B + (j-1); each leg combines the c portfolios of its end bucket with coefficient 1/c, and stored portfolio "j"
 * averages the c portfolios of signal bucket j; a period where any of them is empty or has no returns has no return.
 */
final class DependentDoubleSortRule implements PortfolioRule {
    private final FactorDefinition def;
    private final int buckets;
    private final int controls;
    private final boolean capWeighted;
    private final boolean highMinusLow;

    DependentDoubleSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.controls = def.control().buckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
        this.highMinusLow = def.effectiveDirection() == Direction.HIGH_MINUS_LOW;
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        throw new IllegalStateException("a dependent double sort needs its control signal");
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal, double[] control) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal, control);
        Holding[] subs = new Holding[controls * buckets];
        Arrays.setAll(subs, k -> Holding.empty());
        if (eligible.length == 0) {
            return subs;
        }
        double[] controlCuts = BucketSortRule.cuts(control, eligible, controls);
        int[][] members = new int[controls][eligible.length];
        int[] counts = new int[controls];
        for (int row : eligible) {
            int c = BucketSortRule.bucketOf(control[row], controlCuts) - 1;
            members[c][counts[c]++] = row;
        }
        for (int c = 0; c < controls; c++) {
            int[] inside = Arrays.copyOf(members[c], counts[c]);
            if (inside.length == 0) {
                continue;
            }
            int[][] signalBuckets = BucketSortRule.bucketsOf(signal, inside, buckets);
            for (int j = 0; j < buckets; j++) {
                subs[c * buckets + j] = Holding.of(rows, signalBuckets[j], capWeighted);
            }
        }
        return subs;
    }

    /** The c portfolios (control i, signal bucket j) for every control bucket i, in control order. */
    private int[] signalBucket(int j) {
        int[] subs = new int[controls];
        Arrays.setAll(subs, c -> c * buckets + j);
        return subs;
    }

    @Override
    public int[] longLeg() {
        return signalBucket(highMinusLow ? buckets - 1 : 0);
    }

    @Override
    public int[] shortLeg() {
        return signalBucket(highMinusLow ? 0 : buckets - 1);
    }

    @Override
    public List<Portfolio> portfolios() {
        List<Portfolio> out = new ArrayList<>(buckets);
        for (int j = 0; j < buckets; j++) {
            out.add(new Portfolio(String.valueOf(j + 1), signalBucket(j)));
        }
        return out;
    }
}
