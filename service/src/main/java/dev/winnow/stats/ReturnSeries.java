package dev.winnow.stats;

import java.time.LocalDate;
import java.util.Arrays;
import java.util.Objects;

/**
 * A return series: strictly increasing dates with one finite simple return each (0.01 is 1%).
 * Missing periods are absent, never NaN. Arrays are defensively copied; the record is immutable.
 */
public record ReturnSeries(LocalDate[] dates, double[] values) {

    public ReturnSeries {
        Objects.requireNonNull(dates, "dates");
        Objects.requireNonNull(values, "values");
        if (dates.length != values.length) {
            throw new IllegalArgumentException("dates and values differ in length: " + dates.length + " vs " + values.length);
        }
        dates = dates.clone();
        values = values.clone();
        for (int i = 0; i < dates.length; i++) {
            if (i > 0 && !dates[i].isAfter(dates[i - 1])) {
                throw new IllegalArgumentException("dates must increase strictly; " + dates[i] + " follows " + dates[i - 1]);
            }
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("value at " + dates[i] + " is not finite");
            }
        }
    }

    public static ReturnSeries empty() {
        return new ReturnSeries(new LocalDate[0], new double[0]);
    }

    public int size() {
        return dates.length;
    }

    @Override
    public LocalDate[] dates() {
        return dates.clone();
    }

    @Override
    public double[] values() {
        return values.clone();
    }

    public LocalDate date(int i) {
        return dates[i];
    }

    public double value(int i) {
        return values[i];
    }

    /** The observations with from <= date <= to; either bound may be null for open. */
    public ReturnSeries between(LocalDate from, LocalDate to) {
        int start = 0;
        int end = dates.length;
        if (from != null) {
            int i = Arrays.binarySearch(dates, from);
            start = i >= 0 ? i : -i - 1;
        }
        if (to != null) {
            int i = Arrays.binarySearch(dates, to);
            end = i >= 0 ? i + 1 : -i - 1;
        }
        if (start >= end) {
            return empty();
        }
        return new ReturnSeries(Arrays.copyOfRange(dates, start, end), Arrays.copyOfRange(values, start, end));
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof ReturnSeries other && Arrays.equals(dates, other.dates) && Arrays.equals(values, other.values);
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(dates) + Arrays.hashCode(values);
    }

    @Override
    public String toString() {
        return "ReturnSeries[n=" + dates.length + (dates.length > 0 ? ", " + dates[0] + ".." + dates[dates.length - 1] : "") + "]";
    }
}
