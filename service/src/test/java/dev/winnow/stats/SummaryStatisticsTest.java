package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.Test;

class SummaryStatisticsTest {

    // Source: scipy.stats.skew(bias=True), scipy.stats.kurtosis(fisher=False, bias=True), numpy mean and
    // std(ddof=1) (scripts/moment_fixtures.py).
    @Test
    void momentsMatchScipy() {
        for (JsonNode sample : FixtureFiles.read("moments.json").get("samples")) {
            String name = sample.get("name").asText();
            Summary s = SummaryStatistics.of(FixtureFiles.doubles(sample.get("values")), 12, null);
            assertEquals(sample.get("mean").asDouble(), s.mean(), 1e-15, name);
            assertEquals(sample.get("stdev").asDouble(), s.stdev(), 1e-14, name);
            assertEquals(sample.get("skewness").asDouble(), s.skewness(), 1e-10, name);
            assertEquals(sample.get("kurtosis").asDouble(), s.kurtosis(), 1e-10, name);
        }
    }

    // Source: Commons Math DescriptiveStatistics (sample standard deviation with n - 1, max, min).
    @Test
    void dispersionMatchesCommonsMath() {
        double[] r = FixtureFiles.doubles(FixtureFiles.read("moments.json").get("samples").get(0).get("values"));
        DescriptiveStatistics reference = new DescriptiveStatistics(r);
        Summary s = SummaryStatistics.of(r, 252, null);
        assertEquals(reference.getStandardDeviation(), s.stdev(), 1e-15);
        assertEquals(reference.getMax(), s.best(), 0.0);
        assertEquals(reference.getMin(), s.worst(), 0.0);
        assertEquals(reference.getN(), s.n());
    }

    @Test
    void fiveMonthlyReturnsWorkedByHand() {
        // Worked by hand: r = 2%, -1%, 3.5%, 0%, -4.2% (monthly, p = 12).
        // mean = 0.003/5 = 0.0006; deviations 0.0194, -0.0106, 0.0344, -0.0006, -0.0426;
        // sum of squares = 0.00037636 + 0.00011236 + 0.00118336 + 0.00000036 + 0.00181476 = 0.0034872;
        // stdev = sqrt(0.0034872 / 4) = sqrt(0.0008718).
        // Hit rate: 2 of 5 above zero (0% is not). Best 3.5%, worst -4.2%.
        // Wealth 1.02, 1.0098, 1.045143, 1.045143, 1.001247...: the last date is 4.2% below the peak of date 3,
        // the earlier dip only 1%, so the max drawdown is -0.042.
        double[] r = {0.02, -0.01, 0.035, 0.0, -0.042};
        Summary s = SummaryStatistics.of(r, 12, 1);
        double stdev = Math.sqrt(0.0008718);
        assertEquals(5, s.n());
        assertEquals(0.0006, s.mean(), 1e-16);
        assertEquals(stdev, s.stdev(), 1e-15);
        assertEquals(0.0072, s.annualMean(), 1e-15);
        assertEquals(stdev * Math.sqrt(12), s.annualVolatility(), 1e-15);
        assertEquals(0.0006 / stdev * Math.sqrt(12), s.sharpeAnnual(), 1e-13);
        assertEquals(0.0006 / (stdev / Math.sqrt(5)), s.tStat(), 1e-13);
        assertEquals(0.4, s.hitRate(), 0.0);
        assertEquals(0.035, s.best(), 0.0);
        assertEquals(-0.042, s.worst(), 0.0);
        assertEquals(-0.042, s.maxDrawdown(), 1e-15);
        assertEquals(1, s.nwLags());
    }

    @Test
    void emptySampleIsAllNaN() {
        Summary s = SummaryStatistics.of(new double[0], 252, null);
        assertEquals(0, s.n());
        for (double v : new double[] {s.mean(), s.stdev(), s.annualMean(), s.sharpeAnnual(), s.skewness(), s.kurtosis(),
                s.best(), s.worst(), s.hitRate(), s.tStat(), s.nwTStat(), s.pValue(), s.maxDrawdown()}) {
            assertTrue(Double.isNaN(v));
        }
    }

    @Test
    void singleReturnHasMeanButNoDispersion() {
        Summary s = SummaryStatistics.of(new double[] {0.03}, 252, null);
        assertEquals(0.03, s.mean(), 0.0);
        assertEquals(1.0, s.hitRate(), 0.0);
        assertTrue(Double.isNaN(s.stdev()));
        assertTrue(Double.isNaN(s.tStat()));
        assertTrue(Double.isNaN(s.nwTStat()));
        assertTrue(Double.isNaN(s.skewness()));
    }

    @Test
    void constantReturnsHaveZeroVolatilityAndUndefinedRatios() {
        // 0.1 is not exactly representable, so a naive mean leaves rounding residue; all-equal input must still give
        // exactly zero dispersion and NaN ratios rather than huge numbers.
        Summary s = SummaryStatistics.of(new double[] {0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1}, 252, 2);
        assertEquals(0.0, s.stdev(), 0.0);
        assertEquals(0.0, s.annualVolatility(), 0.0);
        assertEquals(0.0, s.maxDrawdown(), 0.0);
        for (double v : new double[] {s.sharpeAnnual(), s.tStat(), s.nwTStat(), s.pValue(), s.skewness(), s.kurtosis()}) {
            assertTrue(Double.isNaN(v));
        }
    }

    @Test
    void rejectsBadArguments() {
        assertThrows(IllegalArgumentException.class, () -> SummaryStatistics.of(null, 12, null));
        assertThrows(IllegalArgumentException.class, () -> SummaryStatistics.of(new double[] {0.1}, 0, null));
        assertThrows(IllegalArgumentException.class, () -> SummaryStatistics.of(new double[] {0.1}, 12, -2));
        assertThrows(IllegalArgumentException.class, () -> SummaryStatistics.of(new double[] {Double.POSITIVE_INFINITY}, 12, null));
    }
}
