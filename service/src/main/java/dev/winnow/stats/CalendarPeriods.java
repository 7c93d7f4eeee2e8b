package dev.winnow.stats;

import java.time.DayOfWeek;
import java.time.LocalDate;
import java.time.YearMonth;

/**
 * Labels of calendar periods by their last calendar day, so that series whose periods end on different days (the last
 * business day against the last calendar day of a month, a Friday against a Wednesday week) line up period by period.
 */
public final class CalendarPeriods {

    private CalendarPeriods() {
    }

    /**
     * The last day of the calendar period of {@code frequency} that contains {@code date}: the date itself (daily),
     * the Sunday of its ISO 8601 week (weekly, weeks running Monday to Sunday), the last day of its month, of its
     * quarter (March, June, September, December) or of its year.
     */
    public static LocalDate periodEnd(LocalDate date, Frequency frequency) {
        AnalyticsChecks.notNull(date, "date");
        AnalyticsChecks.notNull(frequency, "frequency");
        return switch (frequency) {
            case DAILY -> date;
            case WEEKLY -> date.with(DayOfWeek.SUNDAY);
            case MONTHLY -> YearMonth.from(date).atEndOfMonth();
            case QUARTERLY -> YearMonth.of(date.getYear(), (date.getMonthValue() - 1) / 3 * 3 + 3).atEndOfMonth();
            case ANNUAL -> LocalDate.of(date.getYear(), 12, 31);
        };
    }

    /**
     * The same returns, each dated by the end of its calendar period ({@link #periodEnd}).
     *
     * @throws IllegalArgumentException when two observations fall in one period; compound them first
     *                                  ({@link FrequencyConversion#compound})
     */
    public static ReturnSeries labelledByPeriodEnd(ReturnSeries series, Frequency frequency) {
        AnalyticsChecks.notNull(series, "series");
        LocalDate[] dates = new LocalDate[series.size()];
        for (int i = 0; i < dates.length; i++) {
            dates[i] = periodEnd(series.date(i), frequency);
            if (i > 0 && dates[i].equals(dates[i - 1])) {
                throw new IllegalArgumentException(series.date(i - 1) + " and " + series.date(i) + " fall in the same "
                        + frequency.wireName() + " period; compound the series to that frequency first");
            }
        }
        return new ReturnSeries(dates, series.values());
    }
}
