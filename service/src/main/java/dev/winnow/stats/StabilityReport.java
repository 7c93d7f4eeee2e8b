package dev.winnow.stats;

import java.time.LocalDate;
import java.util.List;

/**
 * Whether a factor's premium holds over time; see {@link StabilityReport#of}.
 *
 * @param halves         the first and the second half of the months (the first has the extra month when n is odd)
 * @param decades        each calendar decade with data (2000-2009, 2010-2019, ...), in order
 * @param rollingWindow  months per rolling window
 * @param shareAbove     share of the rolling windows whose Newey-West t exceeds {@code rollingT}; NaN with fewer
 *                       months than the window
 * @param rollingT       the t-statistic a window must exceed
 * @param foundOn        the split at the discovery date, or null when the definition carries none
 */
public record StabilityReport(List<PeriodStatistics> halves, List<PeriodStatistics> decades, int rollingWindow,
                              double shareAbove, double rollingT, DiscoverySplit foundOn) {

    public StabilityReport {
        halves = List.copyOf(halves);
        decades = List.copyOf(decades);
    }

    /**
     * Returns up to and including the discovery date against those after it, and ratio = after mean / before mean
     * (post-discovery decay, as studied by McLean and Pontiff 2016, Journal of Finance 71(1)); NaN when either mean
     * is undefined or the before mean is zero.
     */
    public record DiscoverySplit(LocalDate date, PeriodStatistics before, PeriodStatistics after, double ratio) {
    }

    /**
     * Stability of monthly returns: each half's and each calendar decade's {@link PeriodStatistics} (Newey-West t
     * with automatic lags for the stretch's own n), the share of rolling windows of {@code rollingWindow} months
     * whose Newey-West t (automatic lags for n = window, as {@link RollingSignificance} computes it) is above
     * {@code rollingT}, and the split at {@code foundOn} when given.
     */
    public static StabilityReport of(ReturnSeries monthly, int rollingWindow, double rollingT, LocalDate foundOn) {
        AnalyticsChecks.notNull(monthly, "monthly");
        AnalyticsChecks.atLeast(rollingWindow, 2, "rollingWindow");
        int n = monthly.size();
        int firstHalf = (n + 1) / 2;
        List<PeriodStatistics> halves = List.of(
                PeriodStatistics.of(slice(monthly, 0, firstHalf)),
                PeriodStatistics.of(slice(monthly, firstHalf, n)));
        double share = n < rollingWindow ? Double.NaN
                : RollingSignificance.compute(monthly, rollingWindow, Frequency.MONTHLY.periodsPerYear(), null).shareAbove(rollingT);
        DiscoverySplit split = foundOn == null ? null : split(monthly, foundOn);
        return new StabilityReport(halves, decades(monthly), rollingWindow, share, rollingT, split);
    }

    private static List<PeriodStatistics> decades(ReturnSeries monthly) {
        List<PeriodStatistics> out = new java.util.ArrayList<>();
        int start = 0;
        while (start < monthly.size()) {
            int decade = decadeOf(monthly.date(start));
            int end = start;
            while (end < monthly.size() && decadeOf(monthly.date(end)) == decade) {
                end++;
            }
            out.add(PeriodStatistics.of(slice(monthly, start, end)));
            start = end;
        }
        return out;
    }

    private static int decadeOf(LocalDate date) {
        return Math.floorDiv(date.getYear(), 10);
    }

    private static DiscoverySplit split(ReturnSeries monthly, LocalDate foundOn) {
        PeriodStatistics before = PeriodStatistics.of(monthly.between(null, foundOn));
        PeriodStatistics after = PeriodStatistics.of(monthly.between(foundOn.plusDays(1), null));
        double ratio = before.mean() != 0.0 ? after.mean() / before.mean() : Double.NaN;
        return new DiscoverySplit(foundOn, before, after, ratio);
    }

    private static ReturnSeries slice(ReturnSeries series, int from, int to) {
        if (from >= to) {
            return ReturnSeries.empty();
        }
        return series.between(series.date(from), series.date(to - 1));
    }
}
