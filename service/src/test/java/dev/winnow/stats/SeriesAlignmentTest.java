package dev.winnow.stats;

import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/** Outer and inner joins on dates, worked by hand. */
class SeriesAlignmentTest {
    private static LocalDate d(String text) {
        return LocalDate.parse(text);
    }

    /**
     * a on Jan 31, Feb 28, Mar 31; b on Feb 28, Mar 31, Apr 30. Outer: the four month-ends, a missing April and b
     * missing January. Inner: February and March only.
     */
    @Test
    void outerAndInnerByHand() {
        ReturnSeries a = new ReturnSeries(new LocalDate[] {d("2021-01-31"), d("2021-02-28"), d("2021-03-31")}, new double[] {0.01, 0.02, 0.03});
        ReturnSeries b = new ReturnSeries(new LocalDate[] {d("2021-02-28"), d("2021-03-31"), d("2021-04-30")}, new double[] {-0.1, -0.2, -0.3});
        SeriesAlignment.Aligned outer = SeriesAlignment.align(List.of(a, b), SeriesAlignment.Join.OUTER);
        assertArrayEquals(new LocalDate[] {d("2021-01-31"), d("2021-02-28"), d("2021-03-31"), d("2021-04-30")}, outer.dates());
        assertArrayEquals(new double[] {0.01, 0.02, 0.03, Double.NaN}, outer.values()[0]);
        assertArrayEquals(new double[] {Double.NaN, -0.1, -0.2, -0.3}, outer.values()[1]);
        SeriesAlignment.Aligned inner = SeriesAlignment.align(List.of(a, b), SeriesAlignment.Join.INNER);
        assertArrayEquals(new LocalDate[] {d("2021-02-28"), d("2021-03-31")}, inner.dates());
        assertArrayEquals(new double[] {0.02, 0.03}, inner.values()[0]);
        assertArrayEquals(new double[] {-0.1, -0.2}, inner.values()[1]);
        assertEquals(0, SeriesAlignment.align(List.of(a, new ReturnSeries(new LocalDate[] {d("2022-01-31")}, new double[] {0.0})),
                SeriesAlignment.Join.INNER).size());
    }
}
