package dev.winnow.stats;

/** One-shot summary statistics of a return series. */
public final class SummaryStatistics {

    private SummaryStatistics() {
    }

    /**
     * Summary of {@code returns} (simple returns in date order) with p = periodsPerYear:
     * <ul>
     *   <li>mean = sum r / n; stdev = sqrt(sum (r - mean)^2 / (n-1)), exactly 0 when all returns are equal;</li>
     *   <li>annualMean = mean * p; annualVolatility = stdev * sqrt p; sharpeAnnual = mean / stdev * sqrt p
     *       (annualisation by the square-root-of-time rule, common practice);</li>
     *   <li>skewness = m3 / m2^1.5 and kurtosis = m4 / m2^2 with central moments m_k = sum (r - mean)^k / n
     *       (population moment ratios, kurtosis not excess: g1 and g2 + 3 in Joanes and Gill 1998,
     *       "Comparing measures of sample skewness and kurtosis", The Statistician 47(1), 183-189);</li>
     *   <li>hitRate = share of r > 0; best/worst = max/min r;</li>
     *   <li>tStat = mean / (stdev / sqrt n); nwTStat and nwLags from {@link NeweyWest}
     *       (Newey and West 1987; automatic L = floor(4 (n/100)^(2/9)), Newey and West 1994);
     *       pValue = 2 Phi(-|nwTStat|);</li>
     *   <li>maxDrawdown from {@link Drawdowns#maxDrawdown(double[])}.</li>
     * </ul>
     * With n = 0 every statistic is NaN; with n = 1 or all-equal returns the dispersion-based ones are NaN.
     *
     * @param lagsOrNullForAuto Newey-West lag count, or null for the automatic rule
     */
    public static Summary of(double[] returns, int periodsPerYear, Integer lagsOrNullForAuto) {
        AnalyticsChecks.finiteValues(returns, "returns");
        AnalyticsChecks.atLeast(periodsPerYear, 1, "periodsPerYear");
        AnalyticsChecks.lagsOrNull(lagsOrNullForAuto);
        int n = returns.length;
        int lags = lagsOrNullForAuto != null ? lagsOrNullForAuto : NeweyWest.automaticLags(n);
        if (n == 0) {
            double nan = Double.NaN;
            return new Summary(0, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, lags, nan, nan);
        }
        boolean constant = WindowMoments.isConstant(returns, 0, n);
        double mean = WindowMoments.mean(returns, 0, n);
        double[] e = new double[n];
        WindowMoments.centre(returns, 0, n, mean, e);

        double best = Double.NEGATIVE_INFINITY;
        double worst = Double.POSITIVE_INFINITY;
        int positives = 0;
        double m3 = 0.0;
        double m4 = 0.0;
        for (int i = 0; i < n; i++) {
            best = Math.max(best, returns[i]);
            worst = Math.min(worst, returns[i]);
            positives += returns[i] > 0.0 ? 1 : 0;
            double e2 = e[i] * e[i];
            m3 += e2 * e[i];
            m4 += e2 * e2;
        }
        double sumOfSquares = WindowMoments.sumOfSquares(e, n);
        double m2 = sumOfSquares / n;
        m3 /= n;
        m4 /= n;
        double stdev = WindowMoments.sampleStdev(sumOfSquares, n, constant);
        double skewness = constant ? Double.NaN : m3 / Math.pow(m2, 1.5);
        double kurtosis = constant ? Double.NaN : m4 / (m2 * m2);
        double nwTStat = NeweyWest.tStatOfMean(mean, e, n, lags, constant);

        return new Summary(
                n,
                mean,
                stdev,
                mean * periodsPerYear,
                stdev * Math.sqrt(periodsPerYear),
                WindowMoments.sharpeAnnual(mean, stdev, periodsPerYear),
                skewness,
                kurtosis,
                best,
                worst,
                (double) positives / n,
                WindowMoments.tStat(mean, stdev, n),
                nwTStat,
                lags,
                NeweyWest.twoSidedPValue(nwTStat),
                Drawdowns.maxDrawdown(returns));
    }
}
