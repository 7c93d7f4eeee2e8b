package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.stats.Quantiles;
import java.util.Arrays;

/**
 * A dependent double sort: at each formation the eligible securities (finite signal and finite control signal) are
 * split on the control signal into c buckets (type-7 breakpoints at i/c over the eligible, ties to the lower bucket),
 * then on the signal into B buckets inside each control bucket (breakpoints from that control bucket's members).
 * Signal bucket j of the factor is the equal-weighted average of the c portfolios (control i, signal bucket j), each
 * weighted inside by {@code weighting}. Holds the c long portfolios (indices 0..c-1) and the c short ones (c..2c-1),
 * each leg combining its c with coefficient 1/c; a period where any of them is empty or has no returns has no return.
 */
final class DependentDoubleSortRule implements PortfolioRule {
    private final FactorDefinition def;
    private final int buckets;
    private final int controls;
    private final boolean capWeighted;

    DependentDoubleSortRule(FactorDefinition def) {
        this.def = def;
        this.buckets = def.effectiveBuckets();
        this.controls = def.control().buckets();
        this.capWeighted = PortfolioRule.capWeighted(def);
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        throw new IllegalStateException("a dependent double sort needs its control signal");
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal, double[] control) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal, control);
        Holding[] subs = new Holding[2 * controls];
        Arrays.setAll(subs, k -> Holding.empty());
        if (eligible.length == 0) {
            return subs;
        }
        double[] sortedControl = Eligibility.sortedValues(control, eligible);
        double[] controlCuts = new double[controls - 1];
        for (int i = 1; i < controls; i++) {
            controlCuts[i - 1] = Quantiles.type7Sorted(sortedControl, i / (double) controls);
        }
        int[][] members = new int[controls][eligible.length];
        int[] counts = new int[controls];
        for (int row : eligible) {
            int c = BucketSortRule.bucketOf(control[row], controlCuts) - 1;
            members[c][counts[c]++] = row;
        }
        boolean highMinusLow = def.effectiveDirection() == Direction.HIGH_MINUS_LOW;
        for (int c = 0; c < controls; c++) {
            int[] inside = Arrays.copyOf(members[c], counts[c]);
            if (inside.length == 0) {
                continue;
            }
            BucketEnds ends = BucketEnds.of(signal, inside, buckets);
            Holding lowHolding = Holding.of(rows, ends.low(), capWeighted);
            Holding highHolding = Holding.of(rows, ends.high(), capWeighted);
            subs[c] = highMinusLow ? highHolding : lowHolding;
            subs[controls + c] = highMinusLow ? lowHolding : highHolding;
        }
        return subs;
    }

    @Override
    public int[] longLeg() {
        int[] leg = new int[controls];
        Arrays.setAll(leg, c -> c);
        return leg;
    }

    @Override
    public int[] shortLeg() {
        int[] leg = new int[controls];
        Arrays.setAll(leg, c -> controls + c);
        return leg;
    }
}
