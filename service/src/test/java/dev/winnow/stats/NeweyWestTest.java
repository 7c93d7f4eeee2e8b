package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

class NeweyWestTest {

    private static final JsonNode FIXTURE = FixtureFiles.read("newey_west.json");

    private static Map<String, double[]> seriesByName() {
        Map<String, double[]> series = new HashMap<>();
        for (JsonNode s : FIXTURE.get("series")) {
            series.put(s.get("name").asText(), FixtureFiles.doubles(s.get("values")));
        }
        return series;
    }

    // Source: statsmodels OLS of r on a constant, cov_type="HAC", use_correction=False, normal p-values
    // (scripts/newey_west_fixtures.py; its header shows why that is the same Bartlett-kernel formula).
    @Test
    void tStatisticsMatchStatsmodelsHacWithFixedLags() {
        Map<String, double[]> series = seriesByName();
        int checked = 0;
        for (JsonNode c : FIXTURE.get("cases")) {
            if (c.get("lags").isNull()) {
                continue;
            }
            double[] r = series.get(c.get("series").asText());
            int lags = c.get("lags").asInt();
            String label = c.get("series").asText() + " L=" + lags;
            assertEquals(c.get("t").asDouble(), NeweyWest.tStat(r, lags), 1e-10, label);
            Summary summary = SummaryStatistics.of(r, 252, lags);
            assertEquals(c.get("t").asDouble(), summary.nwTStat(), 1e-10, label);
            assertEquals(lags, summary.nwLags(), label);
            assertEquals(c.get("mean").asDouble(), summary.mean(), 1e-15, label);
            assertEquals(c.get("p").asDouble(), summary.pValue(), 1e-10, label);
            checked++;
        }
        assertEquals(9, checked);
    }

    // Source: statsmodels sandwich_covariance.cov_hac with nlags=None, whose default is floor(4 (T/100)^(2/9))
    // (Newey and West 1994 rule of thumb, common practice).
    @Test
    void automaticLagsMatchStatsmodelsDefault() {
        Map<String, double[]> series = seriesByName();
        int checked = 0;
        for (JsonNode c : FIXTURE.get("cases")) {
            if (!c.get("lags").isNull()) {
                continue;
            }
            double[] r = series.get(c.get("series").asText());
            Summary summary = SummaryStatistics.of(r, 252, null);
            assertEquals(c.get("statsmodels_default_lags").asInt(), summary.nwLags(), c.get("series").asText());
            assertEquals(c.get("t").asDouble(), summary.nwTStat(), 1e-10, c.get("series").asText());
            assertEquals(c.get("p").asDouble(), summary.pValue(), 1e-10, c.get("series").asText());
            checked++;
        }
        assertEquals(3, checked);
    }

    @Test
    void automaticLagsFollowTheRuleOfThumb() {
        // Worked by hand from L = floor(4 (n/100)^(2/9)): n = 100 gives exactly 4; 100^(2/9) = 2.78 so n = 10,000
        // gives floor(11.13) = 11; n = 1 gives floor(4 * 0.01^(2/9)) = floor(1.436) = 1; n = 0 gives 0.
        assertEquals(4, NeweyWest.automaticLags(100));
        assertEquals(11, NeweyWest.automaticLags(10_000));
        assertEquals(1, NeweyWest.automaticLags(1));
        assertEquals(0, NeweyWest.automaticLags(0));
    }

    @Test
    void longRunVarianceWorkedByHand() {
        // Worked by hand for e = (1, -1, 2, -2): sum e^2 = 10; lag-1 products sum to -1 - 2 - 4 = -7;
        // lag-2 products sum to 2*1 + (-2)(-1) = 4.
        // L = 0: S = 10/4 = 2.5.  L = 1 (weight 1/2): S = (10 - 7)/4 = 0.75.
        // L = 2 (weights 2/3, 1/3): S = (10 - 28/3 + 8/3)/4 = 5/6.
        double[] e = {1, -1, 2, -2};
        assertEquals(2.5, NeweyWest.longRunVariance(e, 0), 1e-15);
        assertEquals(0.75, NeweyWest.longRunVariance(e, 1), 1e-15);
        assertEquals(5.0 / 6.0, NeweyWest.longRunVariance(e, 2), 1e-15);
        // lags beyond n - 1 add nothing, but their count still sets the weights: L = 9 weighs lags 1..3 by 0.9, 0.8, 0.7;
        // lag-3 product is (-2)(1) = -2, so S = (10 + 2(0.9(-7) + 0.8(4) + 0.7(-2)))/4 = (10 - 9)/4 = 0.25.
        assertEquals(0.25, NeweyWest.longRunVariance(e, 9), 1e-14);
    }

    // Source: scipy.stats.norm.sf (2 * sf(|t|)), including tails far below 1e-16 where 1 - cdf would cancel to 0.
    @Test
    void pValuesKeepPrecisionInTheFarTail() {
        for (JsonNode c : FIXTURE.get("p_values")) {
            double expected = c.get("p").asDouble();
            double actual = NeweyWest.twoSidedPValue(c.get("t").asDouble());
            assertEquals(expected, actual, 1e-12 * expected, "t=" + c.get("t").asDouble());
        }
        assertTrue(Double.isNaN(NeweyWest.twoSidedPValue(Double.NaN)));
    }

    @Test
    void undefinedCasesAreNaN() {
        assertTrue(Double.isNaN(NeweyWest.tStat(new double[0], 3)));
        assertTrue(Double.isNaN(NeweyWest.tStat(new double[] {0.01, 0.01, 0.01}, 1)));
        assertTrue(Double.isNaN(NeweyWest.longRunVariance(new double[0], 0)));
    }

    @Test
    void rejectsBadArguments() {
        assertThrows(IllegalArgumentException.class, () -> NeweyWest.tStat(new double[] {0.1, 0.2}, -1));
        assertThrows(IllegalArgumentException.class, () -> NeweyWest.longRunVariance(null, 1));
        assertThrows(IllegalArgumentException.class, () -> NeweyWest.tStat(new double[] {0.1, Double.NaN}, 1));
        assertThrows(IllegalArgumentException.class, () -> NeweyWest.automaticLags(-1));
    }
}
