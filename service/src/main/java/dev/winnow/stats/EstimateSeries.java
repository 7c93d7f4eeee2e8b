package dev.winnow.stats;

/**
 * Summary of a time series of per-period estimates (information coefficients, Fama-MacBeth slopes): inference
 * treats the estimates as one draw per period, as Fama and MacBeth (1973, "Risk, Return, and Equilibrium: Empirical
 * Tests", Journal of Political Economy 81(3), 607-636) do for their monthly slopes.
 * <ul>
 *   <li>mean = sum e_t / n; stdev = sqrt(sum (e_t - mean)^2 / (n - 1));</li>
 *   <li>t_stat = mean / (stdev / sqrt(n));</li>
 *   <li>nw_t_stat: the Newey and West (1987, Econometrica 55(3)) t-statistic of the mean with Bartlett weights, no
 *       small-sample correction and L = floor(4 (n/100)^(2/9)) lags ({@link NeweyWest});</li>
 *   <li>p_value = 2 Phi(-|nw_t_stat|), two-sided from the standard normal;</li>
 *   <li>share_positive = (number of e_t &gt; 0) / n.</li>
 * </ul>
 * Undefined values (n &lt; 2, no variation) are NaN.
 */
public record EstimateSeries(int n, double mean, double stdev, double tStat, double nwTStat, int nwLags, double pValue,
                             double sharePositive) {

    /** Summarises the estimates; every value must be finite (periods without an estimate are left out by the caller). */
    public static EstimateSeries of(double[] estimates) {
        AnalyticsChecks.finiteValues(estimates, "estimates");
        int n = estimates.length;
        int lags = NeweyWest.automaticLags(n);
        if (n == 0) {
            return new EstimateSeries(0, Double.NaN, Double.NaN, Double.NaN, Double.NaN, lags, Double.NaN, Double.NaN);
        }
        double mean = WindowMoments.mean(estimates, 0, n);
        double ss = 0.0;
        int positive = 0;
        for (double e : estimates) {
            ss += (e - mean) * (e - mean);
            positive += e > 0 ? 1 : 0;
        }
        double stdev = n < 2 ? Double.NaN : Math.sqrt(ss / (n - 1));
        double t = stdev > 0 ? mean / (stdev / Math.sqrt(n)) : Double.NaN;
        double nwT = n < 2 ? Double.NaN : NeweyWest.tStat(estimates, lags);
        return new EstimateSeries(n, mean, stdev, t, nwT, lags, NeweyWest.twoSidedPValue(nwT), positive / (double) n);
    }

    /** mean / stdev (the information ratio of an IC series); NaN when undefined. */
    public double meanOverStdev() {
        return stdev > 0 ? mean / stdev : Double.NaN;
    }
}
