package dev.winnow.stats;

/**
 * One trial's own statistics on its monthly returns, before anything is compared across trials; see {@link #of}.
 * Undefined values are NaN.
 *
 * @param n        number of monthly returns
 * @param mean     mean monthly return
 * @param nwTStat  Newey-West t-statistic of the mean, automatic lags
 * @param pValue   two-sided standard normal p-value of nwTStat
 * @param sharpe   monthly Sharpe ratio mean / stdev (n-1), not annualised
 * @param skewness population moment ratio m3 / m2^1.5
 * @param kurtosis population moment ratio m4 / m2^2, not in excess (3 for a normal)
 */
public record TrialStatistics(int n, double mean, double nwTStat, double pValue, double sharpe, double skewness,
                              double kurtosis) {

    /** Fewest monthly returns for which a trial's statistics are computed; shorter trials stay undefined. */
    public static final int MIN_OBSERVATIONS = 3;

    public TrialStatistics {
        AnalyticsChecks.atLeast(n, 0, "n");
        if (!Double.isNaN(pValue) && !(pValue >= 0.0 && pValue <= 1.0)) {
            throw new IllegalArgumentException("pValue must lie in [0, 1] or be NaN (undefined), got " + pValue);
        }
    }

    /**
     * Statistics of monthly returns as {@link SummaryStatistics#of} computes them with 12 periods a year and
     * automatic Newey-West lags: nwTStat = mean / sqrt(S/n) with S the Bartlett long-run variance (Newey and West
     * 1987, Econometrica 55(3); L = floor(4 (n/100)^(2/9)), Newey and West 1994), pValue = 2 Phi(-|nwTStat|),
     * sharpe = mean / stdev with the n-1 standard deviation, skewness m3 / m2^1.5 and kurtosis m4 / m2^2 from the
     * central moments m_k = sum (r - mean)^k / n. Fewer than {@value #MIN_OBSERVATIONS} returns leave everything
     * but n undefined.
     */
    public static TrialStatistics of(double[] monthlyReturns) {
        AnalyticsChecks.finiteValues(monthlyReturns, "monthlyReturns");
        int n = monthlyReturns.length;
        if (n < MIN_OBSERVATIONS) {
            return undefined(n);
        }
        Summary s = SummaryStatistics.of(monthlyReturns, Frequency.MONTHLY.periodsPerYear(), null);
        double sharpe = s.stdev() > 0.0 ? s.mean() / s.stdev() : Double.NaN;
        return new TrialStatistics(n, s.mean(), s.nwTStat(), s.pValue(), sharpe, s.skewness(), s.kurtosis());
    }

    /** A trial listed without statistics (not built, too short, or not on the monthly basis). */
    public static TrialStatistics undefined(int n) {
        double nan = Double.NaN;
        return new TrialStatistics(n, nan, nan, nan, nan, nan, nan);
    }

    /** True when the trial counts towards N: its p-value and Sharpe ratio are defined. */
    public boolean defined() {
        return !Double.isNaN(pValue) && Double.isFinite(sharpe);
    }
}
