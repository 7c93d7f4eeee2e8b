package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.DayOfWeek;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Month-ends are the last Monday-to-Friday day of each month, checked against java.time's calendar. */
class DemoScenarioCalendarTest {

    @Test
    void monthEndsAreTheLastWeekdayOfTheirMonth() {
        List<LocalDate> ends = BusinessCalendar.monthEnds(YearMonth.of(2000, 1), 300);
        assertEquals(300, ends.size());
        assertEquals(LocalDate.of(2000, 1, 31), ends.get(0)); // a Monday
        assertEquals(LocalDate.of(2000, 4, 28), ends.get(3)); // 30 April 2000 was a Sunday
        assertEquals(LocalDate.of(2024, 12, 31), ends.get(299));
        for (int i = 0; i < ends.size(); i++) {
            LocalDate end = ends.get(i);
            assertEquals(YearMonth.of(2000, 1).plusMonths(i), YearMonth.from(end));
            assertNotEquals(DayOfWeek.SATURDAY, end.getDayOfWeek());
            assertNotEquals(DayOfWeek.SUNDAY, end.getDayOfWeek());
            assertTrue(YearMonth.from(BusinessCalendar.next(end)).isAfter(YearMonth.from(end)), end.toString());
        }
    }

    @Test
    void nextSkipsTheWeekend() {
        assertEquals(LocalDate.of(2000, 1, 10), BusinessCalendar.next(LocalDate.of(2000, 1, 7)));
        assertEquals(LocalDate.of(2000, 1, 4), BusinessCalendar.next(LocalDate.of(2000, 1, 3)));
    }
}
