package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Direction;
import dev.winnow.stats.Ranks;

/**
 * Rank-weighted long-short portfolios: every eligible security is held. With a_i the average rank (ties share their
 * mean rank) of security i's signal among the n eligible and d_i = a_i - (n + 1) / 2, the high leg holds the
 * securities with d_i > 0 at weights d_i / sum of positive d, the low leg those with d_i < 0 at |d_i| / sum of |negative
 * d|. {@code high_minus_low} is long the high leg; {@code low_minus_high} the reverse. A formation with n < 2 has no
 * portfolio. Holds the long leg (index 0) and the short leg (index 1).
 */
final class RankWeightedRule implements LongShortRule {
    private final FactorDefinition def;

    RankWeightedRule(FactorDefinition def) {
        this.def = def;
    }

    @Override
    public Holding[] form(CrossSection rows, double[] signal) {
        int[] eligible = Eligibility.eligibleRows(def, rows, signal);
        int n = eligible.length;
        if (n < 2) {
            return new Holding[] {Holding.empty(), Holding.empty()};
        }
        double[] values = new double[n];
        for (int k = 0; k < n; k++) {
            values[k] = signal[eligible[k]];
        }
        double[] ranks = Ranks.averageRanks(values, n);
        double centre = (n + 1) / 2.0;
        double positive = 0.0;
        double negative = 0.0;
        int highs = 0;
        int lows = 0;
        for (double a : ranks) {
            double d = a - centre;
            if (d > 0) {
                positive += d;
                highs++;
            } else if (d < 0) {
                negative -= d;
                lows++;
            }
        }
        int[] highIds = new int[highs];
        double[] highWeights = new double[highs];
        int[] lowIds = new int[lows];
        double[] lowWeights = new double[lows];
        int h = 0;
        int l = 0;
        for (int k = 0; k < n; k++) {
            double d = ranks[k] - centre;
            int id = rows.securityIds()[eligible[k]];
            if (d > 0) {
                highIds[h] = id;
                highWeights[h++] = d / positive;
            } else if (d < 0) {
                lowIds[l] = id;
                lowWeights[l++] = -d / negative;
            }
        }
        Holding high = new Holding(highIds, highWeights);
        Holding low = new Holding(lowIds, lowWeights);
        return def.effectiveDirection() == Direction.HIGH_MINUS_LOW ? new Holding[] {high, low} : new Holding[] {low, high};
    }
}
