package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.stats.Quantiles;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The 2x3 size and signal sort of Fama and French (1993), "Common risk factors in the returns on stocks and bonds",
 * Journal of Financial Economics 33, 3-56. Size breakpoint: type-7 median of market_cap (small = at or below);
 * signal breakpoints: type-7 30th and 70th percentiles (low = at or below the 30th, high = above the 70th, neutral
 * otherwise), all computed on the breakpoint rows.
 * <ul>
 * <li>output SIGNAL: long (SH + BH)/2, short (SL + BL)/2 for high-minus-low (legs swapped for low-minus-high);</li>
 * <li>output SIZE: long (SL + SN + SH)/3, short (BL + BN + BH)/3.</li>
 * </ul>
 * Either output holds all six, SL, SN, SH, BL, BN, BH in that order, each a stored portfolio ({@link #NAMES}).
 */
final class TwoByThreeRule implements PortfolioRule {
    private static final int LOW = 0;
    private static final int NEUTRAL = 1;
    private static final int HIGH = 2;

    private final FactorDefinition def;
    private final boolean sizeOutput;
    private final boolean highMinusLow;
    private final boolean capWeighted;

    TwoByThreeRule(FactorDefinition def) {
        this.def = def;
        this.sizeOutput = def.effectiveOutput() == Output.SIZE;
        this.highMinusLow = def.effectiveDirection() == Direction.HIGH_MINUS_LOW;
        this.capWeighted = PortfolioRule.capWeighted(def);
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal);
        int[] breakpointRows = Eligibility.breakpointRows(def, rows, eligible);
        Holding[] six = new Holding[6];
        if (breakpointRows.length == 0) {
            Arrays.setAll(six, k -> Holding.empty());
        } else {
            double[] caps = rows.marketCaps();
                double sizeCut = Quantiles.type7Sorted(Eligibility.sortedValues(caps, breakpointRows), 0.5);
            double[] sortedSignal = Eligibility.sortedValues(signal, breakpointRows);
            double p30 = Quantiles.type7Sorted(sortedSignal, 0.3);
            double p70 = Quantiles.type7Sorted(sortedSignal, 0.7);
            int[][] members = new int[6][eligible.length];
            int[] counts = new int[6];
            for (int i : eligible) {
                int cell = (caps[i] > sizeCut ? 3 : 0) + groupOf(signal[i], p30, p70);
                members[cell][counts[cell]++] = i;
            }
            for (int cell = 0; cell < 6; cell++) {
                six[cell] = Holding.of(rows, Arrays.copyOf(members[cell], counts[cell]), capWeighted);
            }
        }
        return six;
    }

    private static int groupOf(double value, double p30, double p70) {
        if (value <= p30) {
            return LOW;
        }
        return value > p70 ? HIGH : NEUTRAL;
    }

    @Override
    public int[] longLeg() {
        if (sizeOutput) {
            return new int[] {LOW, NEUTRAL, HIGH};
        }
        return highMinusLow ? new int[] {HIGH, 3 + HIGH} : new int[] {LOW, 3 + LOW};
    }

    @Override
    public int[] shortLeg() {
        if (sizeOutput) {
            return new int[] {3 + LOW, 3 + NEUTRAL, 3 + HIGH};
        }
        return highMinusLow ? new int[] {LOW, 3 + LOW} : new int[] {HIGH, 3 + HIGH};
    }

    /** The six portfolios in the order held: small_low, small_mid, small_high, big_low, big_mid, big_high. */
    static final List<String> NAMES = List.of("small_low", "small_mid", "small_high", "big_low", "big_mid", "big_high");

    @Override
    public List<Portfolio> portfolios() {
        List<Portfolio> out = new ArrayList<>(6);
        for (int cell = 0; cell < 6; cell++) {
            out.add(new Portfolio(NAMES.get(cell), new int[] {cell}));
        }
        return out;
    }
}
