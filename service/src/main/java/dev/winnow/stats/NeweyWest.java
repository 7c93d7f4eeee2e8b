package dev.winnow.stats;

import org.apache.commons.math3.special.Erf;

/**
 * Heteroskedasticity- and autocorrelation-consistent (HAC) t-statistic of a mean with the Bartlett kernel,
 * after Newey and West (1987), "A Simple, Positive Semi-Definite, Heteroskedasticity and Autocorrelation
 * Consistent Covariance Matrix", Econometrica 55(3), 703-708.
 *
 * <p>With residuals e_t = r_t - mean and L lags:
 * S = (1/n) [ sum_t e_t^2 + 2 sum_{l=1..L} (1 - l/(L+1)) sum_{t=l+1..n} e_t e_{t-l} ],
 * nw_t = mean / sqrt(S/n), with no small-sample (degrees-of-freedom) correction.
 */
public final class NeweyWest {

    private static final double SQRT2 = Math.sqrt(2.0);

    private NeweyWest() {
    }

    /**
     * Automatic lag count L = floor(4 (n/100)^(2/9)), the rule of thumb of Newey and West (1994),
     * "Automatic Lag Selection in Covariance Matrix Estimation", Review of Economic Studies 61(4), 631-653
     * (common practice).
     */
    public static int automaticLags(int n) {
        AnalyticsChecks.atLeast(n, 0, "n");
        return (int) Math.floor(4.0 * Math.pow(n / 100.0, 2.0 / 9.0));
    }

    /**
     * Bartlett-kernel long-run variance of residuals that the caller has already centred (or that are regression
     * residuals): S = (1/n) [ sum_t e_t^2 + 2 sum_{l=1..L} (1 - l/(L+1)) sum_{t=l+1..n} e_t e_{t-l} ]
     * (Newey and West 1987). Lags beyond n-1 contribute nothing. NaN for an empty array.
     */
    public static double longRunVariance(double[] residuals, int lags) {
        AnalyticsChecks.finiteValues(residuals, "residuals");
        AnalyticsChecks.atLeast(lags, 0, "lags");
        if (residuals.length == 0) {
            return Double.NaN;
        }
        return bartlettSum(residuals, residuals.length, lags) / residuals.length;
    }

    /**
     * Newey-West t-statistic of the mean of {@code returns}: mean / sqrt(S/n) with S from
     * {@link #longRunVariance(double[], int)} on r - mean. NaN when n is 0 or all returns are equal.
     */
    public static double tStat(double[] returns, int lags) {
        AnalyticsChecks.finiteValues(returns, "returns");
        AnalyticsChecks.atLeast(lags, 0, "lags");
        int n = returns.length;
        if (n == 0 || WindowMoments.isConstant(returns, 0, n)) {
            return Double.NaN;
        }
        double mean = WindowMoments.mean(returns, 0, n);
        double[] residuals = new double[n];
        WindowMoments.centre(returns, 0, n, mean, residuals);
        return tStatOfMean(mean, residuals, n, lags, false);
    }

    /**
     * Two-sided p-value of a statistic that is standard normal under the null: 2 Phi(-|t|) = erfc(|t|/sqrt 2).
     * Computed from the upper tail directly so that tiny p-values do not cancel to 0. NaN for NaN.
     */
    public static double twoSidedPValue(double t) {
        if (Double.isNaN(t)) {
            return Double.NaN;
        }
        return Erf.erfc(Math.abs(t) / SQRT2);
    }

    /** n times S: sum_t e_t^2 + 2 sum_{l=1..L} (1 - l/(L+1)) sum_{t>l} e_t e_{t-l}, over e[0..n). */
    static double bartlettSum(double[] e, int n, int lags) {
        double sum = WindowMoments.sumOfSquares(e, n);
        int usableLags = Math.min(lags, n - 1);
        for (int l = 1; l <= usableLags; l++) {
            double autocovariance = 0.0;
            for (int t = l; t < n; t++) {
                autocovariance += e[t] * e[t - l];
            }
            sum += 2.0 * (1.0 - l / (lags + 1.0)) * autocovariance;
        }
        return sum;
    }

    /**
     * mean / sqrt(S/n) from the centred returns e[0..n); NaN for a constant sample (whose residuals are only rounding
     * noise) or unless S is positive.
     */
    static double tStatOfMean(double mean, double[] e, int n, int lags, boolean constant) {
        if (constant) {
            return Double.NaN;
        }
        double varianceOfMean = bartlettSum(e, n, lags) / n / n;
        return varianceOfMean > 0.0 ? mean / Math.sqrt(varianceOfMean) : Double.NaN;
    }
}
