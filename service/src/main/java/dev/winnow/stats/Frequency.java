package dev.winnow.stats;

import java.time.LocalDate;
import java.time.temporal.ChronoUnit;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

/**
 * Observation frequency of a return series, with the periods per year used to annualise
 * (daily 252, weekly 52, monthly 12, quarterly 4, annual 1: common practice).
 */
public enum Frequency {
    DAILY(252),
    WEEKLY(52),
    MONTHLY(12),
    QUARTERLY(4),
    ANNUAL(1);

    private final int periodsPerYear;

    Frequency(int periodsPerYear) {
        this.periodsPerYear = periodsPerYear;
    }

    public int periodsPerYear() {
        return periodsPerYear;
    }

    /** Lower-case name used on the wire ({@code daily}, {@code monthly}, ...). */
    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** Parses a wire name; returns null when the text names no frequency. */
    public static Frequency fromWireName(String text) {
        for (Frequency f : values()) {
            if (f.wireName().equals(text)) {
                return f;
            }
        }
        return null;
    }

    /**
     * Frequency from the median spacing in calendar days between consecutive sorted dates:
     * up to 4 days daily, up to 10 weekly, up to 45 monthly, up to 135 quarterly, else annual
     * (thresholds are common practice: they sit between the nominal spacings 1, 7, 30.4, 91.3, 365.25
     * with room for weekends and holidays). Fewer than two dates count as daily.
     */
    public static Frequency fromDates(List<LocalDate> sortedDates) {
        int n = sortedDates.size();
        if (n < 2) {
            return DAILY;
        }
        long[] gaps = new long[n - 1];
        for (int i = 1; i < n; i++) {
            gaps[i - 1] = ChronoUnit.DAYS.between(sortedDates.get(i - 1), sortedDates.get(i));
        }
        Arrays.sort(gaps);
        int m = gaps.length;
        double median = (m % 2 == 1) ? gaps[m / 2] : (gaps[m / 2 - 1] + gaps[m / 2]) / 2.0;
        if (median <= 4) {
            return DAILY;
        } else if (median <= 10) {
            return WEEKLY;
        } else if (median <= 45) {
            return MONTHLY;
        } else if (median <= 135) {
            return QUARTERLY;
        }
        return ANNUAL;
    }
}
