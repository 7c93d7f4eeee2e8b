package dev.winnow.stats;

import java.time.LocalDate;

/**
 * Mean and Newey-West t-statistic of a stretch of returns: n, mean = sum r / n, and the Newey and West (1987,
 * Econometrica 55(3)) t-statistic of the mean with the automatic lag count L = floor(4 (n/100)^(2/9)) for that n
 * (Newey and West 1994), see {@link NeweyWest}. Undefined values are NaN; dates are null for an empty stretch.
 *
 * @param from    first date, null when empty
 * @param to      last date, null when empty
 * @param n       number of returns
 * @param mean    mean return
 * @param nwTStat Newey-West t-statistic of the mean
 */
public record PeriodStatistics(LocalDate from, LocalDate to, int n, double mean, double nwTStat) {

    public static PeriodStatistics of(ReturnSeries series) {
        AnalyticsChecks.notNull(series, "series");
        int n = series.size();
        if (n == 0) {
            return new PeriodStatistics(null, null, 0, Double.NaN, Double.NaN);
        }
        double[] values = series.values();
        return new PeriodStatistics(series.date(0), series.date(n - 1), n, WindowMoments.mean(values, 0, n),
                NeweyWest.tStat(values, NeweyWest.automaticLags(n)));
    }
}
