package dev.winnow.construct;

import java.util.Arrays;

/**
 * A leg's security weights, sorted by security id, summing to one (or empty): each non-empty sub-portfolio of the
 * leg is normalised, then the sub-portfolios are combined with equal coefficients renormalised over the non-empty
 * ones (a leg of three sub-portfolios with one emptied uses 1/2 each).
 */
record LegWeights(int[] ids, double[] weights) {

    static final LegWeights EMPTY = new LegWeights(new int[0], new double[0]);

    static LegWeights of(Holding[] subs, int[] leg) {
        if (leg.length == 1) {
            LegWeights single = ofOne(subs[leg[0]]);
            if (single != null) {
                return single;
            }
        }
        double[] totals = new double[leg.length];
        int nonEmpty = 0;
        int members = 0;
        for (int j = 0; j < leg.length; j++) {
            Holding h = subs[leg[j]];
            for (int k = 0; k < h.size(); k++) {
                totals[j] += h.value(k);
            }
            if (totals[j] > 0) { // a sub-portfolio wiped out (total loss) counts as empty
                nonEmpty++;
                members += h.size();
            }
        }
        if (nonEmpty == 0) {
            return EMPTY;
        }
        long[] packed = new long[members];
        double[] raw = new double[members];
        int m = 0;
        for (int j = 0; j < leg.length; j++) {
            Holding h = subs[leg[j]];
            double total = totals[j];
            if (!(total > 0)) {
                continue;
            }
            for (int k = 0; k < h.size(); k++) {
                raw[m] = h.value(k) / total / nonEmpty;
                packed[m] = ((long) h.id(k) << 32) | m; // sort by id, remembering the position
                m++;
            }
        }
        Arrays.sort(packed);
        int[] ids = new int[members];
        double[] weights = new double[members];
        for (int k = 0; k < members; k++) {
            ids[k] = (int) (packed[k] >> 32);
            weights[k] = raw[(int) packed[k]];
        }
        return new LegWeights(ids, weights);
    }

    /**
     * A leg of one sub-portfolio whose members come in increasing id order (as holdings keep them): its values over
     * their total, the same arithmetic as the general case (whose further division by the one non-empty
     * sub-portfolio is exact), without the sort. Null when the ids are not in order, so that the general case sorts
     * them.
     */
    private static LegWeights ofOne(Holding h) {
        int n = h.size();
        double total = 0.0;
        for (int k = 0; k < n; k++) {
            total += h.value(k);
        }
        if (!(total > 0)) { // a sub-portfolio wiped out (total loss) counts as empty
            return EMPTY;
        }
        int[] ids = new int[n];
        double[] weights = new double[n];
        for (int k = 0; k < n; k++) {
            ids[k] = h.id(k);
            if (k > 0 && ids[k] <= ids[k - 1]) {
                return null;
            }
            weights[k] = h.value(k) / total;
        }
        return new LegWeights(ids, weights);
    }

    /** Sum over securities of |w_this - w_other|, a security absent from one side weighing 0 there. */
    double distance(LegWeights other) {
        double sum = 0.0;
        int a = 0;
        int b = 0;
        while (a < ids.length || b < other.ids.length) {
            if (b >= other.ids.length || (a < ids.length && ids[a] < other.ids[b])) {
                sum += Math.abs(weights[a++]);
            } else if (a >= ids.length || other.ids[b] < ids[a]) {
                sum += Math.abs(other.weights[b++]);
            } else {
                sum += Math.abs(weights[a++] - other.weights[b++]);
            }
        }
        return sum;
    }

    /**
     * Turnover of a formation: over the long and short legs, sum_i |w_new_i - w_old_i|, where the old book's
     * holdings have drifted to the end of their last holding period. A null old book is an empty book.
     */
    static double turnover(PortfolioRule rule, Holding[] next, Holding[] previous) {
        double total = 0.0;
        for (int[] leg : new int[][] {rule.longLeg(), rule.shortLeg()}) {
            if (leg.length == 0) {
                continue;
            }
            LegWeights old = previous == null ? EMPTY : of(previous, leg);
            total += of(next, leg).distance(old);
        }
        return total;
    }
}
