package dev.winnow.stats;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/**
 * Factor covariance against fixtures/covariance_risk.json, written by service/src/test/scripts/covariance_risk_fixture.py
 * (numpy: numpy.cov for equal weights without lags, the script's own numpy implementation of the weighted and
 * Newey-West formulas otherwise, itself checked against numpy.cov(aweights) where there are no lags).
 */
class FactorCovarianceTest {
    private static final JsonNode FIXTURE = FixtureReader.json("covariance_risk.json");

    @Test
    void everyCaseAgreesWithTheNumpyScript() {
        double[][] x = FixtureReader.matrix(FIXTURE.get("returns"));
        for (JsonNode c : FIXTURE.get("cases")) {
            Double halfLife = c.get("half_life").isNull() ? null : c.get("half_life").asDouble();
            int lags = c.get("nw_lags").asInt();
            String label = "half_life=" + halfLife + " nw_lags=" + lags + " against " + c.get("source").asText();
            assertArrayEquals(FixtureReader.doubles(c.get("weights")), FactorCovariance.weights(x.length, halfLife), 1e-15, label);
            double[][] expected = FixtureReader.matrix(c.get("covariance"));
            FactorCovariance.Estimate e = FactorCovariance.estimate(x, halfLife, lags);
            for (int i = 0; i < expected.length; i++) {
                for (int j = 0; j < expected.length; j++) {
                    assertEquals(expected[i][j], e.covariance()[i][j], 1e-12 * Math.abs(expected[i][i]) + 1e-18, label + " [" + i + "][" + j + "]");
                    assertEquals(e.covariance()[i][j], e.covariance()[j][i], 0.0, "symmetric");
                }
                assertEquals(Math.sqrt(expected[i][i]), e.volatility()[i], 1e-12 * Math.sqrt(expected[i][i]));
                assertEquals(1.0, e.correlation()[i][i], 0.0);
            }
        }
    }

    /** By hand: n = 3, H = 1: raw weights 0.5^2, 0.5^1, 0.5^0 = 0.25, 0.5, 1, sum 1.75: 1/7, 2/7, 4/7. */
    @Test
    void halfLifeWeightsByHand() {
        assertArrayEquals(new double[] {1.0 / 7, 2.0 / 7, 4.0 / 7}, FactorCovariance.weights(3, 1.0), 1e-15);
        assertArrayEquals(new double[] {0.25, 0.25, 0.25, 0.25}, FactorCovariance.weights(4, null), 0.0);
    }

    /**
     * By hand, one factor, x = 1, 2, 3, 6 (mean 3), equal weights: deviations -2, -1, 0, 3; sum of squares 14, divisor
     * n-1 = 3: C0 = 14/3. Lag 1 (c = 4/3, w = 1/4): sum_{t=2..4} d_t d_{t-1} = (-1)(-2) + 0(-1) + 3(0) = 2, so
     * C1 = (4/3)(1/4)(2) = 2/3 and with L = 1 (Bartlett weight 1/2): V = 14/3 + (1/2)(2/3 + 2/3) = 16/3.
     * Annualised monthly: x 12 = 64, volatility 8.
     */
    @Test
    void neweyWestByHand() {
        double[][] x = {{1}, {2}, {3}, {6}};
        assertEquals(14.0 / 3, FactorCovariance.estimate(x, null, 0).covariance()[0][0], 1e-14);
        FactorCovariance.Estimate e = FactorCovariance.estimate(x, null, 1);
        assertEquals(16.0 / 3, e.covariance()[0][0], 1e-14);
        assertEquals(8.0, e.annualized(12).volatility()[0], 1e-14);
    }

    @Test
    void rejectsWhatItCannotEstimate() {
        assertThrows(IllegalArgumentException.class, () -> FactorCovariance.estimate(new double[][] {{1.0}}, null, 0));
        assertThrows(IllegalArgumentException.class, () -> FactorCovariance.estimate(new double[][] {{1.0}, {2.0}}, null, 2));
        assertThrows(IllegalArgumentException.class, () -> FactorCovariance.estimate(new double[][] {{1.0}, {Double.NaN}}, null, 0));
        assertThrows(IllegalArgumentException.class, () -> FactorCovariance.weights(3, 0.0));
    }
}
