package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.Arrays;
import org.junit.jupiter.api.Test;

class RollingSignificanceTest {

    private static void assertClose(double expected, double actual, String label) {
        if (Double.isNaN(expected)) {
            assertTrue(Double.isNaN(actual), label + ": expected NaN, got " + actual);
        } else {
            assertEquals(expected, actual, 1e-12, label);
        }
    }

    // Each window must equal SummaryStatistics.of on the same slice; the one-shot statistics are themselves checked
    // against statsmodels and scipy in NeweyWestTest and SummaryStatisticsTest.
    @Test
    void everyWindowEqualsTheOneShotStatistics() {
        ReturnSeries series = CorrelationsTest.randomAligned(1, 700, 5).get(0);
        double[] r = series.values();
        Arrays.fill(r, 300, 340, 0.002); // a flat stretch longer than the window: undefined ratios there
        series = new ReturnSeries(series.dates(), r);
        for (Integer lags : new Integer[] {null, 0, 3}) {
            int window = 30;
            RollingSignificance rolling = RollingSignificance.compute(series, window, 252, lags);
            int expectedLags = lags == null ? NeweyWest.automaticLags(window) : lags;
            assertEquals(expectedLags, rolling.lags());
            assertEquals(window, rolling.window());
            assertEquals(r.length - window + 1, rolling.size());
            assertArrayEquals(Arrays.copyOfRange(series.dates(), window - 1, r.length), rolling.dates());
            double[] mean = rolling.mean();
            double[] t = rolling.tStat();
            double[] nw = rolling.nwTStat();
            double[] p = rolling.pValue();
            double[] sharpe = rolling.sharpeAnnual();
            for (int s = 0; s < rolling.size(); s++) {
                Summary one = SummaryStatistics.of(Arrays.copyOfRange(r, s, s + window), 252, expectedLags);
                String label = "lags " + lags + " window " + s;
                assertClose(one.mean(), mean[s], label);
                assertClose(one.tStat(), t[s], label);
                assertClose(one.nwTStat(), nw[s], label);
                assertClose(one.pValue(), p[s], label);
                assertClose(one.sharpeAnnual(), sharpe[s], label);
            }
            assertTrue(Double.isNaN(nw[305]), "window 305..334 lies inside the flat stretch 300..339");
        }
    }

    @Test
    void shareAboveCountsWindowsOverTheThreshold() {
        // Hand-built record: NW t of 1.0, 2.5, NaN, 3.0 -> two of four windows above 2 (NaN is not above).
        LocalDate d = LocalDate.of(2022, 6, 1);
        double[] any = {0, 0, 0, 0};
        RollingSignificance rolling = new RollingSignificance(5, 1,
                new LocalDate[] {d, d.plusDays(1), d.plusDays(2), d.plusDays(3)},
                any, any, new double[] {1.0, 2.5, Double.NaN, 3.0}, any, any);
        assertEquals(0.5, rolling.shareAbove(2.0), 0.0);
        assertEquals(0.0, rolling.shareAbove(3.0), 0.0);
        RollingSignificance none = RollingSignificance.compute(CorrelationsTest.randomAligned(1, 10, 1).get(0), 20, 252, null);
        assertEquals(0, none.size());
        assertTrue(Double.isNaN(none.shareAbove(2.0)));
    }

    @Test
    void rejectsBadArguments() {
        ReturnSeries s = CorrelationsTest.randomAligned(1, 10, 1).get(0);
        assertThrows(IllegalArgumentException.class, () -> RollingSignificance.compute(s, 1, 252, null));
        assertThrows(IllegalArgumentException.class, () -> RollingSignificance.compute(s, 5, 0, null));
        assertThrows(IllegalArgumentException.class, () -> RollingSignificance.compute(s, 5, 252, -1));
        assertThrows(IllegalArgumentException.class, () -> RollingSignificance.compute(null, 5, 252, null));
    }
}
