package dev.winnow.stats;

import java.util.List;

/** The equal-weight composite of several return series, the return of a theme's members held in equal parts. */
public final class EqualWeightComposite {

    private EqualWeightComposite() {
    }

    /**
     * On each date that every series has: the mean (1/K) sum_k r_k of the K series' returns there (rebalanced to
     * equal weights each period). Dates missing from any series are left out. Empty when the list is empty.
     */
    public static ReturnSeries of(List<ReturnSeries> series) {
        AnalyticsChecks.notNull(series, "series");
        for (int i = 0; i < series.size(); i++) {
            AnalyticsChecks.notNull(series.get(i), "series[" + i + "]");
        }
        if (series.isEmpty()) {
            return ReturnSeries.empty();
        }
        CommonDates common = CommonDates.of(series);
        double[] values = new double[common.size()];
        for (int t = 0; t < values.length; t++) {
            double sum = 0.0;
            for (double[] column : common.values()) {
                sum += column[t];
            }
            values[t] = sum / series.size();
        }
        return new ReturnSeries(common.dates(), values);
    }
}
