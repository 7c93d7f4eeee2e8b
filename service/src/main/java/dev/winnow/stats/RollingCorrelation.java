package dev.winnow.stats;

import java.time.LocalDate;

/**
 * Rolling correlation of two series; see {@link Correlations#rolling}.
 *
 * @param dates  the common date ending each window
 * @param values correlation over the window ending there (NaN when undefined)
 */
public record RollingCorrelation(LocalDate[] dates, double[] values) {

    public RollingCorrelation {
        dates = AnalyticsChecks.notNull(dates, "dates").clone();
        values = AnalyticsChecks.notNull(values, "values").clone();
        if (dates.length != values.length) {
            throw new IllegalArgumentException("dates and values differ in length: " + dates.length + " vs " + values.length);
        }
    }

    @Override
    public LocalDate[] dates() {
        return dates.clone();
    }

    @Override
    public double[] values() {
        return values.clone();
    }

    public int size() {
        return dates.length;
    }
}
