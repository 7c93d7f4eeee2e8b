package dev.winnow.app.seed;

import java.time.DayOfWeek;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.ArrayList;
import java.util.List;

/** Business dates of the invented market: Monday to Friday, no holidays. */
final class BusinessCalendar {

    private BusinessCalendar() {
    }

    static boolean isBusinessDay(LocalDate date) {
        DayOfWeek day = date.getDayOfWeek();
        return day != DayOfWeek.SATURDAY && day != DayOfWeek.SUNDAY;
    }

    /** The last Monday-to-Friday date of the month. */
    static LocalDate lastBusinessDay(YearMonth month) {
        LocalDate date = month.atEndOfMonth();
        while (!isBusinessDay(date)) {
            date = date.minusDays(1);
        }
        return date;
    }

    /** Last business days of {@code count} consecutive months starting with {@code first}. */
    static List<LocalDate> monthEnds(YearMonth first, int count) {
        List<LocalDate> dates = new ArrayList<>(count);
        for (int i = 0; i < count; i++) {
            dates.add(lastBusinessDay(first.plusMonths(i)));
        }
        return dates;
    }

    /** The first business day on or after {@code date}. */
    static LocalDate onOrAfter(LocalDate date) {
        LocalDate d = date;
        while (!isBusinessDay(d)) {
            d = d.plusDays(1);
        }
        return d;
    }

    /** The next business day after {@code date}. */
    static LocalDate next(LocalDate date) {
        return onOrAfter(date.plusDays(1));
    }
}
