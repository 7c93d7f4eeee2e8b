package dev.winnow.stats;

import java.util.List;

/**
 * The monthly basis of the evidence: trials of different frequencies compare only on one frequency. Daily and weekly
 * series are compounded to calendar months with {@link FrequencyConversion#compound} (the product of (1 + r) over the
 * observations dated in a month, minus one); a monthly series is grouped the same way, which leaves one-observation
 * months unchanged to the bit. Every month is then dated by its last calendar day ({@link CalendarPeriods}), so that
 * series whose months end on different days (last business day, last calendar day) share their months. Quarterly and
 * annual series cannot be put on a monthly basis (a month's return is not known from them) and are excluded with a
 * reason.
 *
 * @param monthly         the monthly returns, dated by the last calendar day of the month (empty when excluded)
 * @param nativeFrequency the frequency of the input series, from its dates ({@link Frequency#fromDates})
 * @param excludedReason  null when the series is on the monthly basis; otherwise why it cannot be
 */
public record MonthlyBasis(ReturnSeries monthly, Frequency nativeFrequency, String excludedReason) {

    public MonthlyBasis {
        AnalyticsChecks.notNull(monthly, "monthly");
        AnalyticsChecks.notNull(nativeFrequency, "nativeFrequency");
    }

    /** Puts {@code series} on the monthly basis, or says why it cannot be. */
    public static MonthlyBasis of(ReturnSeries series) {
        AnalyticsChecks.notNull(series, "series");
        Frequency frequency = Frequency.fromDates(List.of(series.dates()));
        if (frequency.compareTo(Frequency.MONTHLY) > 0) {
            return new MonthlyBasis(ReturnSeries.empty(), frequency, "the series is " + frequency.wireName()
                    + "; a " + frequency.wireName() + " series cannot be put on the monthly basis that trials compare on");
        }
        ReturnSeries monthly = FrequencyConversion.compound(series, Frequency.MONTHLY);
        return new MonthlyBasis(CalendarPeriods.labelledByPeriodEnd(monthly, Frequency.MONTHLY), frequency, null);
    }

    public boolean excluded() {
        return excludedReason != null;
    }
}
