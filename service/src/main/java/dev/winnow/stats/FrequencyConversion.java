package dev.winnow.stats;

import java.time.LocalDate;
import java.time.temporal.IsoFields;
import java.util.Arrays;

/** Compounding of simple returns over calendar periods, and the cumulative return path. */
public final class FrequencyConversion {

    private FrequencyConversion() {
    }

    /**
     * Compounds simple returns within each calendar period of {@code target}: R = prod (1 + r_t) - 1 over the
     * observations whose dates fall in that period, labelled with the last observed date in it. Periods are calendar
     * days, ISO 8601 weeks (week-based year and week number, weeks starting on Monday), months, quarters and years.
     * A target as fine as or finer than the series still groups by calendar period (daily to daily keeps every date);
     * a period with one observation keeps its return unchanged.
     */
    public static ReturnSeries compound(ReturnSeries series, Frequency target) {
        AnalyticsChecks.notNull(series, "series");
        AnalyticsChecks.notNull(target, "target");
        int n = series.size();
        LocalDate[] dates = new LocalDate[n];
        double[] returns = new double[n];
        int periods = 0;
        int t = 0;
        while (t < n) {
            long period = periodKey(series.date(t), target);
            int first = t;
            double growth = 1.0;
            while (t < n && periodKey(series.date(t), target) == period) {
                growth *= 1.0 + series.value(t++);
            }
            dates[periods] = series.date(t - 1);
            // a lone observation keeps its value exactly ((1 + r) - 1 can differ from r in the last bit)
            returns[periods++] = t - first == 1 ? series.value(first) : growth - 1.0;
        }
        return new ReturnSeries(Arrays.copyOf(dates, periods), Arrays.copyOf(returns, periods));
    }

    /** Cumulative return at each date: the wealth index minus one, prod_{s<=t} (1 + r_s) - 1. */
    public static ReturnSeries cumulative(ReturnSeries series) {
        AnalyticsChecks.notNull(series, "series");
        double[] cumulative = series.values();
        double wealth = 1.0;
        for (int t = 0; t < cumulative.length; t++) {
            wealth *= 1.0 + cumulative[t];
            cumulative[t] = wealth - 1.0;
        }
        return new ReturnSeries(series.dates(), cumulative);
    }

    /** A number that is equal for two dates exactly when they share the calendar period, and grows with the date. */
    private static long periodKey(LocalDate date, Frequency frequency) {
        return switch (frequency) {
            case DAILY -> date.toEpochDay();
            case WEEKLY -> date.get(IsoFields.WEEK_BASED_YEAR) * 100L + date.get(IsoFields.WEEK_OF_WEEK_BASED_YEAR);
            case MONTHLY -> date.getYear() * 12L + date.getMonthValue();
            case QUARTERLY -> date.getYear() * 4L + date.get(IsoFields.QUARTER_OF_YEAR);
            case ANNUAL -> date.getYear();
        };
    }
}
