package dev.winnow.charts;

import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Date and value ticks, worked by hand in the comments, and the contrast of cell text (WCAG 2.1). */
class AxesTest {

    private static List<String> labels(List<TimeAxis.Tick> ticks) {
        return ticks.stream().map(TimeAxis.Tick::label).toList();
    }

    @Test
    void dateTicksTakeTheFinestCalendarStepThatFits() {
        LocalDate from = LocalDate.parse("2000-01-31");
        LocalDate to = LocalDate.parse("2024-12-31");
        // 24 first-of-Januaries (2001..2024) are more than 10; every 2 years 12; every 5 years 2005, 2010, 2015, 2020
        assertEquals(List.of("2005", "2010", "2015", "2020"), labels(TimeAxis.ticks(from, to, 10)));
        assertEquals(24, TimeAxis.ticks(from, to, 30).size());
        assertEquals(List.of("2002", "2004", "2006", "2008", "2010", "2012", "2014", "2016", "2018", "2020", "2022", "2024"),
                labels(TimeAxis.ticks(from, to, 12)));
        // 2020-01-15 to 2020-12-31: month starts Feb..Dec are 11; quarter starts after the 15th of January: Apr, Jul, Oct
        assertEquals(List.of("2020-04", "2020-07", "2020-10"),
                labels(TimeAxis.ticks(LocalDate.parse("2020-01-15"), LocalDate.parse("2020-12-31"), 6)));
        // 46 days are too many for 10 ticks; the Mondays 6, 13, 20, 27 January and 3, 10 February are not
        assertEquals(List.of("2020-01-06", "2020-01-13", "2020-01-20", "2020-01-27", "2020-02-03", "2020-02-10"),
                labels(TimeAxis.ticks(LocalDate.parse("2020-01-01"), LocalDate.parse("2020-02-15"), 10)));
        assertEquals(5, TimeAxis.ticks(LocalDate.parse("2020-01-01"), LocalDate.parse("2020-01-05"), 10).size());
    }

    @Test
    void linearTicksStepByOneTwoOrFiveAndCoverTheValues() {
        // -15.3% to 0 in about 6 ticks: 15.3 / 5 = 3.06 points, rounded up to a step of 5
        ValueAxis axis = ValueAxis.linear(-0.153, 0.0, 6, ValueAxis.Format.PERCENT);
        assertEquals(List.of("\u221220%", "\u221215%", "\u221210%", "\u22125%", "0%"), axis.ticks().stream().map(ValueAxis.Tick::label).toList());
        assertEquals(-0.20, axis.min(), 1e-12);
        assertEquals(0.0, axis.max(), 1e-12);
        assertEquals(0.5, ValueAxis.niceStep(0.3).doubleValue());
        assertEquals(2.5, ValueAxis.niceStep(2.1).doubleValue());
        assertEquals(10.0, ValueAxis.niceStep(5.01).doubleValue());
        ValueAxis flat = ValueAxis.linear(3.0, 3.0, 5, ValueAxis.Format.NUMBER);
        assertTrue(flat.min() < 3.0 && flat.max() > 3.0, "a constant series still gets a range");
    }

    @Test
    void logTicksAtOneTwoAndFiveTimesPowersOfTen() {
        // 0.9 to 17: 0.5, 1, 2, 5, 10, 20 (the domain widened to the ticks either side)
        ValueAxis axis = ValueAxis.log10(0.9, 17);
        assertEquals(List.of("0.5", "1", "2", "5", "10", "20"), axis.ticks().stream().map(ValueAxis.Tick::label).toList());
        assertEquals(0.5, axis.min(), 1e-12);
        assertEquals(20, axis.max(), 1e-12);
        assertEquals(0.0, axis.fraction(0.5), 1e-12);
        assertEquals(Math.log10(2) / Math.log10(40), axis.fraction(1.0), 1e-12);
        // 1.1 to 1.6: 1 and 2 only, so every whole multiple: 1, 2 around a narrow range gives 1..2 with no 3
        ValueAxis narrow = ValueAxis.log10(1.1, 1.6);
        assertTrue(narrow.ticks().size() >= 2);
    }

    @Test
    void cellTextMeetsTheWcagContrastMinimumOnEveryFill() {
        // WCAG 2.1 success criterion 1.4.3: at least 4.5:1 for normal text
        for (int k = -100; k <= 100; k++) {
            String fill = Palette.diverging(k / 100.0);
            String text = Palette.textOn(fill);
            double a = Palette.luminance(fill);
            double b = Palette.luminance(text);
            double ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
            assertTrue(ratio >= 4.5, fill + " with " + text + " has contrast " + ratio);
        }
        assertEquals("#FFFFFF", Palette.diverging(0));
        assertEquals("#0072B2", Palette.diverging(-1));
        assertEquals("#D55E00", Palette.diverging(1));
        // relative luminance of pure white is 1 and of black 0 (WCAG 2.1 definition)
        assertEquals(1.0, Palette.luminance("#FFFFFF"), 1e-12);
        assertEquals(0.0, Palette.luminance("#000000"), 1e-12);
    }
}
