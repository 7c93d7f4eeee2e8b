package dev.winnow.stats;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/** Portfolio risk and its Euler decomposition: by hand, and against the numpy script covariance_risk_fixture.py. */
class PortfolioRiskTest {

    /**
     * By hand: F = [[0.04, 0.01], [0.01, 0.09]], x = (1, 0.5), specific variance 0.0075.
     * F x = (0.04 + 0.005, 0.01 + 0.045) = (0.045, 0.055); x'Fx = 0.045 + 0.0275 = 0.0725; total variance 0.08,
     * sigma = sqrt(0.08) = 0.282842712474619. Contributions x_k (Fx)_k / sigma = 0.045/sigma and 0.0275/sigma,
     * specific 0.0075/sigma; shares 0.045/0.08 = 0.5625, 0.0275/0.08 = 0.34375, 0.0075/0.08 = 0.09375 (sum 1).
     */
    @Test
    void twoFactorsByHand() {
        PortfolioRisk r = PortfolioRisk.of(new double[] {1.0, 0.5}, new double[][] {{0.04, 0.01}, {0.01, 0.09}}, 0.0075);
        double sigma = Math.sqrt(0.08);
        assertEquals(0.0725, r.factorVariance(), 1e-15);
        assertEquals(sigma, r.totalVolatility(), 1e-15);
        assertArrayEquals(new double[] {0.045 / sigma, 0.055 / sigma}, r.marginal(), 1e-15);
        assertArrayEquals(new double[] {0.045 / sigma, 0.0275 / sigma}, r.contributions(), 1e-15);
        assertArrayEquals(new double[] {0.5625, 0.34375}, r.shares(), 1e-15);
        assertEquals(0.0075 / sigma, r.specificContribution(), 1e-15);
        assertEquals(0.09375, r.specificShare(), 1e-15);
    }

    /**
     * A generated portfolio and benchmark (fixtures/covariance_risk.json, numpy): exposures of the active weights,
     * factor and specific variance, marginal and total contributions; the decomposition adds up to 1e-12.
     */
    @Test
    void generatedPortfolioAgreesWithNumpy() {
        JsonNode risk = FixtureReader.json("covariance_risk.json").get("risk");
        double[][] f = FixtureReader.matrix(risk.get("covariance"));
        double[][] betas = FixtureReader.matrix(risk.get("betas"));
        double[] holdings = FixtureReader.doubles(risk.get("holdings"));
        double[] benchmark = FixtureReader.doubles(risk.get("benchmark"));
        double[] residualVol = FixtureReader.doubles(risk.get("residual_vol"));
        double[] active = new double[holdings.length];
        double[] exposures = new double[f.length];
        for (int i = 0; i < active.length; i++) {
            active[i] = holdings[i] - benchmark[i];
            for (int k = 0; k < exposures.length; k++) {
                exposures[k] += active[i] * betas[i][k];
            }
        }
        assertArrayEquals(FixtureReader.doubles(risk.get("exposures")), exposures, 1e-14);
        double specific = PortfolioRisk.specificVariance(active, residualVol, 12);
        assertEquals(risk.get("specific_variance").asDouble(), specific, 1e-16);
        PortfolioRisk r = PortfolioRisk.of(exposures, f, specific);
        assertEquals(risk.get("factor_variance").asDouble(), r.factorVariance(), 1e-15);
        assertEquals(risk.get("total_volatility").asDouble(), r.totalVolatility(), 1e-14);
        assertArrayEquals(FixtureReader.doubles(risk.get("marginal")), r.marginal(), 1e-13);
        assertArrayEquals(FixtureReader.doubles(risk.get("contributions")), r.contributions(), 1e-14);
        assertEquals(risk.get("specific_contribution").asDouble(), r.specificContribution(), 1e-15);
        assertEulerAddsUp(r);
    }

    static void assertEulerAddsUp(PortfolioRisk r) {
        double sum = r.specificContribution();
        double shares = r.specificShare();
        for (int k = 0; k < r.contributions().length; k++) {
            sum += r.contributions()[k];
            shares += r.shares()[k];
        }
        assertEquals(r.totalVolatility(), sum, 1e-12, "contributions add up to the total volatility");
        assertEquals(1.0, shares, 1e-12, "shares add up to 1");
    }

    @Test
    void nothingToDecompose() {
        assertThrows(IllegalArgumentException.class, () -> PortfolioRisk.of(new double[] {0.0}, new double[][] {{0.04}}, 0.0));
        assertThrows(IllegalArgumentException.class, () -> PortfolioRisk.of(new double[] {1.0}, new double[][] {{0.04, 0.0}}, 0.0));
    }
}
