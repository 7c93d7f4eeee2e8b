package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.List;
import org.junit.jupiter.api.Test;

class DrawdownsTest {

    private static LocalDate day(int d) {
        return LocalDate.of(2023, 3, d);
    }

    private static ReturnSeries series(double... returns) {
        LocalDate[] dates = new LocalDate[returns.length];
        for (int i = 0; i < returns.length; i++) {
            dates[i] = day(i + 1);
        }
        return new ReturnSeries(dates, returns);
    }

    /*
     * Worked by hand (dates 2023-03-01 .. 2023-03-09, wealth starting at 1):
     *   date  r      wealth     peak       underwater
     *   d1   -10%    0.9        1          -0.10   run A starts at the first date
     *   d2   -10%    0.81       1          -0.19   trough of A
     *   d3   +25%    1.0125     1.0125      0      A recovered
     *   d4    -4%    0.972      1.0125     -0.04   run B
     *   d5    +5%    1.0206     1.0206      0      B recovered
     *   d6   -20%    0.81648    1.0206     -0.20   run C
     *   d7   +10%    0.898128   1.0206     -0.12
     *   d8   -25%    0.673596   1.0206     -0.34   trough of C (0.8 * 1.1 * 0.75 = 0.66)
     *   d9   +50%    1.010394   1.0206     -0.01   C not recovered (0.66 * 1.5 = 0.99)
     * Episodes deepest first: C (peak d5, trough d8, no recovery, -0.34, 4 dates),
     * A (no peak date, trough d2, recovery d3, -0.19, 2 dates), B (peak d3, trough d4, recovery d5, -0.04, 1 date).
     */
    @Test
    void threeEpisodesWorkedByHand() {
        DrawdownReport report = Drawdowns.analyze(series(-0.10, -0.10, 0.25, -0.04, 0.05, -0.20, 0.10, -0.25, 0.50), 5);
        assertEquals(-0.34, report.maxDrawdown(), 1e-12);
        assertArrayEquals(new double[] {-0.10, -0.19, 0, -0.04, 0, -0.20, -0.12, -0.34, -0.01}, report.underwater(), 1e-12);
        assertEquals(9, report.underwaterDates().length);
        List<DrawdownReport.Episode> episodes = report.episodes();
        assertEquals(3, episodes.size());

        DrawdownReport.Episode c = episodes.get(0);
        assertEquals(day(5), c.peak());
        assertEquals(day(8), c.trough());
        assertNull(c.recovery());
        assertEquals(-0.34, c.depth(), 1e-12);
        assertEquals(4, c.duration());

        DrawdownReport.Episode a = episodes.get(1);
        assertNull(a.peak());
        assertEquals(day(2), a.trough());
        assertEquals(day(3), a.recovery());
        assertEquals(-0.19, a.depth(), 1e-12);
        assertEquals(2, a.duration());

        DrawdownReport.Episode b = episodes.get(2);
        assertEquals(new DrawdownReport.Episode(day(3), day(4), day(5), b.depth(), 1), b);
        assertEquals(-0.04, b.depth(), 1e-12);
    }

    @Test
    void topLimitsTheEpisodesAndTiesGoEarlierFirst() {
        // Worked by hand: -50%, 0%, +100% leaves wealth 0.5, 0.5, 1: underwater -0.5, -0.5, 0 (trough is the first of
        // the tied dates); then -50%, +100% repeats the same depth later. Equal depths: the earlier episode first.
        DrawdownReport report = Drawdowns.analyze(series(-0.5, 0.0, 1.0, -0.5, 1.0), 1);
        assertEquals(1, report.episodes().size());
        DrawdownReport.Episode first = report.episodes().get(0);
        assertEquals(new DrawdownReport.Episode(null, day(1), day(3), -0.5, 2), first);
        assertEquals(2, Drawdowns.analyze(series(-0.5, 0.0, 1.0, -0.5, 1.0), 10).episodes().size());
        assertEquals(day(4), Drawdowns.analyze(series(-0.5, 0.0, 1.0, -0.5, 1.0), 10).episodes().get(1).trough());
        assertTrue(Drawdowns.analyze(series(-0.5, 0.0, 1.0), 0).episodes().isEmpty());
    }

    @Test
    void neverUnderWaterOrEmpty() {
        DrawdownReport rising = Drawdowns.analyze(series(0.01, 0.0, 0.02), 3);
        assertEquals(0.0, rising.maxDrawdown(), 0.0);
        assertTrue(rising.episodes().isEmpty());
        DrawdownReport empty = Drawdowns.analyze(ReturnSeries.empty(), 3);
        assertEquals(0.0, empty.maxDrawdown(), 0.0);
        assertEquals(0, empty.underwater().length);
        assertEquals(0.0, Drawdowns.maxDrawdown(new double[0]), 0.0);
    }

    @Test
    void rejectsBadArguments() {
        assertThrows(IllegalArgumentException.class, () -> Drawdowns.analyze(null, 3));
        assertThrows(IllegalArgumentException.class, () -> Drawdowns.analyze(series(0.01), -1));
    }
}
