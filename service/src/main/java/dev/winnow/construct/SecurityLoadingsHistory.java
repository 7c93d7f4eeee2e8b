package dev.winnow.construct;

import dev.winnow.stats.RegressionResult;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * One security's loadings over time: entry t belongs to {@code dates.get(t)}, a grid date where the security has a row.
 * {@code betas[j][t]} is the slope on factor j. Statistics are NaN where the security had fewer than min_obs usable
 * dates. Arrays are shared, not copied.
 */
public record SecurityLoadingsHistory(List<LocalDate> dates, int[] usable, double[] alpha, double[][] betas,
                                      double[] rSquared, double[] residualVol) {

    public int size() {
        return dates.size();
    }

    /** Fills the columns one date at a time. */
    static final class Builder {
        private final List<LocalDate> dates = new ArrayList<>();
        private final int[] usable;
        private final double[] alpha;
        private final double[][] betas;
        private final double[] rSquared;
        private final double[] residualVol;

        Builder(int capacity, int factorCount) {
            usable = new int[capacity];
            alpha = new double[capacity];
            betas = new double[factorCount][capacity];
            rSquared = new double[capacity];
            residualVol = new double[capacity];
        }

        /** Adds a date; {@code fit} null means too few usable dates. */
        void add(LocalDate date, int n, RegressionResult fit) {
            int t = dates.size();
            dates.add(date);
            usable[t] = n;
            alpha[t] = fit != null ? fit.alpha() : Double.NaN;
            for (int j = 0; j < betas.length; j++) {
                betas[j][t] = fit != null ? fit.beta(j) : Double.NaN;
            }
            rSquared[t] = fit != null ? fit.rSquared() : Double.NaN;
            residualVol[t] = fit != null ? fit.residualStdev() : Double.NaN;
        }

        SecurityLoadingsHistory build() {
            if (dates.size() != usable.length) {
                throw new IllegalStateException("filled " + dates.size() + " of " + usable.length + " dates");
            }
            return new SecurityLoadingsHistory(List.copyOf(dates), usable, alpha, betas, rSquared, residualVol);
        }
    }
}
