package dev.winnow.stats;

/**
 * Summary statistics of one return series; see {@link SummaryStatistics#of(double[], int, Integer)} for the formulas.
 * Undefined values are NaN.
 *
 * @param n                number of returns
 * @param mean             arithmetic mean per period
 * @param stdev            sample standard deviation (divisor n-1)
 * @param annualMean       mean * periodsPerYear
 * @param annualVolatility stdev * sqrt(periodsPerYear)
 * @param sharpeAnnual     mean / stdev * sqrt(periodsPerYear)
 * @param skewness         population moment ratio m3 / m2^1.5
 * @param kurtosis         population moment ratio m4 / m2^2 (not excess: 3 for a normal)
 * @param best             largest return
 * @param worst            smallest return
 * @param hitRate          share of returns above zero
 * @param tStat            mean / (stdev / sqrt n)
 * @param nwTStat          Newey-West t-statistic of the mean
 * @param nwLags           lags used for nwTStat
 * @param pValue           two-sided normal p-value of nwTStat
 * @param maxDrawdown      deepest fall of the wealth index below its running peak (0 or negative)
 */
public record Summary(
        int n,
        double mean,
        double stdev,
        double annualMean,
        double annualVolatility,
        double sharpeAnnual,
        double skewness,
        double kurtosis,
        double best,
        double worst,
        double hitRate,
        double tStat,
        double nwTStat,
        int nwLags,
        double pValue,
        double maxDrawdown) {
}
