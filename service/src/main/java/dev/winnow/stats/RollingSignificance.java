package dev.winnow.stats;

import java.time.LocalDate;
import java.util.Arrays;

/**
 * Significance of the mean return over rolling windows: at each date from the window-th observation on, the
 * statistics of the last {@code window} observations, exactly as {@link SummaryStatistics#of} computes them for
 * that slice (mean, t = mean / (stdev / sqrt N), Newey-West t with Bartlett kernel (Newey and West 1987),
 * its two-sided normal p-value, and the annualised Sharpe ratio mean / stdev * sqrt(periodsPerYear)).
 *
 * @param window       observations per window (N)
 * @param lags         Newey-West lags used in every window
 * @param dates        last date of each window
 * @param mean         mean return per window
 * @param tStat        classical t-statistic per window
 * @param nwTStat      Newey-West t-statistic per window
 * @param pValue       two-sided normal p-value of nwTStat per window
 * @param sharpeAnnual annualised Sharpe ratio per window
 */
public record RollingSignificance(
        int window,
        int lags,
        LocalDate[] dates,
        double[] mean,
        double[] tStat,
        double[] nwTStat,
        double[] pValue,
        double[] sharpeAnnual) {

    public RollingSignificance {
        dates = AnalyticsChecks.notNull(dates, "dates").clone();
        mean = sameLength(mean, dates, "mean");
        tStat = sameLength(tStat, dates, "tStat");
        nwTStat = sameLength(nwTStat, dates, "nwTStat");
        pValue = sameLength(pValue, dates, "pValue");
        sharpeAnnual = sameLength(sharpeAnnual, dates, "sharpeAnnual");
    }

    /**
     * Rolling statistics of {@code series} over windows of {@code window} observations; lags fixed, or when null
     * chosen once by {@link NeweyWest#automaticLags(int)} for n = window. Empty when the series is shorter than the
     * window. Cost O(n * window * (lags + 1)) with no allocation per window.
     */
    public static RollingSignificance compute(ReturnSeries series, int window, int periodsPerYear, Integer lagsOrNullForAuto) {
        AnalyticsChecks.notNull(series, "series");
        AnalyticsChecks.atLeast(window, 2, "window");
        AnalyticsChecks.atLeast(periodsPerYear, 1, "periodsPerYear");
        AnalyticsChecks.lagsOrNull(lagsOrNullForAuto);
        int lags = lagsOrNullForAuto != null ? lagsOrNullForAuto : NeweyWest.automaticLags(window);
        double[] r = series.values();
        int count = Math.max(0, r.length - window + 1);
        double[] mean = new double[count];
        double[] tStat = new double[count];
        double[] nwTStat = new double[count];
        double[] pValue = new double[count];
        double[] sharpe = new double[count];
        double[] e = new double[window];
        for (int s = 0; s < count; s++) {
            boolean constant = WindowMoments.isConstant(r, s, window);
            double m = WindowMoments.mean(r, s, window);
            WindowMoments.centre(r, s, window, m, e);
            double stdev = WindowMoments.sampleStdev(WindowMoments.sumOfSquares(e, window), window, constant);
            mean[s] = m;
            tStat[s] = WindowMoments.tStat(m, stdev, window);
            sharpe[s] = WindowMoments.sharpeAnnual(m, stdev, periodsPerYear);
            nwTStat[s] = NeweyWest.tStatOfMean(m, e, window, lags, constant);
            pValue[s] = NeweyWest.twoSidedPValue(nwTStat[s]);
        }
        LocalDate[] dates = count == 0 ? new LocalDate[0] : Arrays.copyOfRange(series.dates(), window - 1, r.length);
        return new RollingSignificance(window, lags, dates, mean, tStat, nwTStat, pValue, sharpe);
    }

    /** Share of all windows whose Newey-West t exceeds {@code threshold} (NaN windows count as not above); NaN when there are no windows. */
    public double shareAbove(double threshold) {
        if (nwTStat.length == 0) {
            return Double.NaN;
        }
        int above = 0;
        for (double t : nwTStat) {
            above += t > threshold ? 1 : 0;
        }
        return (double) above / nwTStat.length;
    }

    public int size() {
        return dates.length;
    }

    @Override
    public LocalDate[] dates() {
        return dates.clone();
    }

    @Override
    public double[] mean() {
        return mean.clone();
    }

    @Override
    public double[] tStat() {
        return tStat.clone();
    }

    @Override
    public double[] nwTStat() {
        return nwTStat.clone();
    }

    @Override
    public double[] pValue() {
        return pValue.clone();
    }

    @Override
    public double[] sharpeAnnual() {
        return sharpeAnnual.clone();
    }

    private static double[] sameLength(double[] values, LocalDate[] dates, String name) {
        AnalyticsChecks.notNull(values, name);
        if (values.length != dates.length) {
            throw new IllegalArgumentException(name + " has " + values.length + " values for " + dates.length + " dates");
        }
        return values.clone();
    }
}
