package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.time.LocalDate;
import org.junit.jupiter.api.Test;

class FrequencyConversionTest {

    /*
     * Worked by hand. ISO 8601 weeks start on Monday and week 1 holds the year's first Thursday, so 2020 has 53 weeks:
     * Mon 2020-12-28 .. Sun 2021-01-03 is 2020-W53, Mon 2021-01-04 starts 2021-W01, and 2021-03-29 .. 04-04 is 2021-W13.
     *   2020-12-28  +10%     2020-W53  Dec  Q4 2020
     *   2020-12-31   -5%     2020-W53  Dec  Q4 2020
     *   2021-01-01   +2%     2020-W53  Jan  Q1 2021
     *   2021-01-03   +1%     2020-W53  Jan  Q1 2021
     *   2021-01-04   -2%     2021-W01  Jan  Q1 2021
     *   2021-01-05   +3%     2021-W01  Jan  Q1 2021
     *   2021-03-31   +4%     2021-W13  Mar  Q1 2021
     *   2021-04-01  -10%     2021-W13  Apr  Q2 2021
     */
    private static final ReturnSeries DAILY = new ReturnSeries(
            dates("2020-12-28", "2020-12-31", "2021-01-01", "2021-01-03", "2021-01-04", "2021-01-05", "2021-03-31", "2021-04-01"),
            new double[] {0.10, -0.05, 0.02, 0.01, -0.02, 0.03, 0.04, -0.10});

    private static LocalDate[] dates(String... iso) {
        LocalDate[] dates = new LocalDate[iso.length];
        for (int i = 0; i < iso.length; i++) {
            dates[i] = LocalDate.parse(iso[i]);
        }
        return dates;
    }

    private static void assertSeries(LocalDate[] expectedDates, double[] expectedValues, ReturnSeries actual) {
        assertArrayEquals(expectedDates, actual.dates());
        assertArrayEquals(expectedValues, actual.values(), 1e-12);
    }

    @Test
    void weeklyFollowsIsoWeeksAcrossTheYearEnd() {
        // W53: 1.10 * 0.95 * 1.02 * 1.01 - 1 = 0.076559; W01: 0.98 * 1.03 - 1 = 0.0094; W13: 1.04 * 0.90 - 1 = -0.064.
        assertSeries(dates("2021-01-03", "2021-01-05", "2021-04-01"),
                new double[] {0.076559, 0.0094, -0.064},
                FrequencyConversion.compound(DAILY, Frequency.WEEKLY));
    }

    @Test
    void weekOneCanStartInDecember() {
        // Worked by hand: 2025-01-02 is the first Thursday of 2025, so 2025-W01 runs Mon 2024-12-30 .. Sun 2025-01-05;
        // Fri 2024-12-27 is in 2024-W52. W01: 1.01 * 1.02 * 0.97 - 1 = 0.999294 - 1 = -0.000706.
        ReturnSeries s = new ReturnSeries(dates("2024-12-27", "2024-12-30", "2024-12-31", "2025-01-02"),
                new double[] {0.05, 0.01, 0.02, -0.03});
        assertSeries(dates("2024-12-27", "2025-01-02"), new double[] {0.05, -0.000706},
                FrequencyConversion.compound(s, Frequency.WEEKLY));
    }

    @Test
    void monthlyQuarterlyAnnualCompoundCalendarPeriods() {
        // Dec 2020: 1.10 * 0.95 - 1 = 0.045. Jan 2021: 1.02 * 1.01 * 0.98 * 1.03 - 1 = 0.03988388.
        // Q1 2021: 1.03988388 * 1.04 - 1 = 0.0814792352. 2021: 1.0814792352 * 0.90 - 1 = -0.02666868832.
        assertSeries(dates("2020-12-31", "2021-01-05", "2021-03-31", "2021-04-01"),
                new double[] {0.045, 0.03988388, 0.04, -0.10},
                FrequencyConversion.compound(DAILY, Frequency.MONTHLY));
        assertSeries(dates("2020-12-31", "2021-03-31", "2021-04-01"),
                new double[] {0.045, 0.0814792352, -0.10},
                FrequencyConversion.compound(DAILY, Frequency.QUARTERLY));
        assertSeries(dates("2020-12-31", "2021-04-01"),
                new double[] {0.045, -0.02666868832},
                FrequencyConversion.compound(DAILY, Frequency.ANNUAL));
    }

    @Test
    void sameOrFinerFrequencyStillGroupsByCalendarPeriod() {
        assertEquals(DAILY, FrequencyConversion.compound(DAILY, Frequency.DAILY));
        ReturnSeries monthly = FrequencyConversion.compound(DAILY, Frequency.MONTHLY);
        assertEquals(monthly, FrequencyConversion.compound(monthly, Frequency.MONTHLY));
        // "weekly" of the monthly series is still by ISO week: 2021-03-31 and 2021-04-01 share 2021-W13 and compound
        // to 1.04 * 0.90 - 1 = -0.064, although they are month ends of different months.
        assertSeries(dates("2020-12-31", "2021-01-05", "2021-04-01"),
                new double[] {0.045, 0.03988388, -0.064},
                FrequencyConversion.compound(monthly, Frequency.WEEKLY));
        assertEquals(ReturnSeries.empty(), FrequencyConversion.compound(ReturnSeries.empty(), Frequency.ANNUAL));
    }

    @Test
    void cumulativeIsTheWealthIndexMinusOne() {
        // Running products of (1 + r) minus one, by hand: 0.1, 0.045, 0.0659, 0.076559, 0.05502782, 0.0866786546,
        // 0.130145800784, 0.0171312207056.
        assertSeries(DAILY.dates(),
                new double[] {0.1, 0.045, 0.0659, 0.076559, 0.05502782, 0.0866786546, 0.130145800784, 0.0171312207056},
                FrequencyConversion.cumulative(DAILY));
    }

    @Test
    void rejectsBadArguments() {
        assertThrows(IllegalArgumentException.class, () -> FrequencyConversion.compound(DAILY, null));
        assertThrows(IllegalArgumentException.class, () -> FrequencyConversion.cumulative(null));
    }
}
