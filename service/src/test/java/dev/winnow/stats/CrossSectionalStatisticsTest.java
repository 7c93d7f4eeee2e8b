package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Fama-MacBeth cross-sections and slope summaries, the GRS test with per-asset regressions, and monotonicity, against
 * numpy/scipy/statsmodels (scripts/cross_sectional_fixtures.py).
 */
class CrossSectionalStatisticsTest {

    private static final JsonNode FM = FixtureFiles.read("fama_macbeth.json");
    private static final JsonNode GRS = FixtureFiles.read("grs.json");
    private static final JsonNode MONO = FixtureFiles.read("monotonicity.json");

    // Source: numpy.linalg.lstsq per period (OLS, and WLS on sqrt(w)-scaled rows), r^2 = 1 - SSR/SST (weighted);
    // skipped periods (n <= k + 1, rank deficient) are null there too.
    @Test
    void crossSectionsMatchNumpyLstsq() {
        for (String variant : List.of("equal", "weighted", "standardized")) {
            JsonNode fits = FM.get(variant).get("fits");
            for (int p = 0; p < fits.size(); p++) {
                CrossSectionRegression fit = fitPeriod(p, variant);
                JsonNode expected = fits.get(p);
                String label = variant + " period " + p;
                if (expected.isNull()) {
                    assertNull(fit, label);
                    continue;
                }
                assertNotNull(fit, label);
                double[] g = FixtureFiles.doubles(expected.get("coefficients"));
                for (int j = 0; j < g.length; j++) {
                    assertEquals(g[j], fit.coefficients()[j], 1e-10 * (1 + Math.abs(g[j])), label + " coefficient " + j);
                }
                assertEquals(expected.get("r_squared").asDouble(), fit.rSquared(), 1e-10, label);
            }
        }
    }

    // Source: numpy mean/std(ddof=1); statsmodels OLS on a constant with HAC (Bartlett, use_correction=False) for the
    // Newey-West t; scipy.stats.norm for the two-sided p-value.
    @Test
    void slopeSummariesMatchStatsmodelsHac() {
        for (String variant : List.of("equal", "weighted", "standardized")) {
            List<double[]> slopes = new ArrayList<>();
            for (int p = 0; p < FM.get("periods").size(); p++) {
                CrossSectionRegression fit = fitPeriod(p, variant);
                if (fit != null) {
                    slopes.add(fit.coefficients());
                }
            }
            JsonNode summaries = FM.get(variant).get("summary");
            for (int j = 0; j < summaries.size(); j++) {
                double[] series = new double[slopes.size()];
                for (int t = 0; t < series.length; t++) {
                    series[t] = slopes.get(t)[j];
                }
                EstimateSeries s = EstimateSeries.of(series);
                JsonNode e = summaries.get(j);
                String label = variant + " coefficient " + j;
                assertEquals(e.get("n").asInt(), s.n(), label);
                assertEquals(e.get("mean").asDouble(), s.mean(), 1e-12, label);
                assertEquals(e.get("stdev").asDouble(), s.stdev(), 1e-12, label);
                assertEquals(e.get("t_stat").asDouble(), s.tStat(), 1e-9, label);
                assertEquals(e.get("nw_t_stat").asDouble(), s.nwTStat(), 1e-9, label);
                assertEquals(e.get("nw_lags").asInt(), s.nwLags(), label);
                assertEquals(e.get("p_value").asDouble(), s.pValue(), 1e-9, label);
                assertEquals(e.get("share_positive").asDouble(), s.sharePositive(), 1e-15, label);
            }
        }
    }

    private static CrossSectionRegression fitPeriod(int p, String variant) {
        JsonNode period = FM.get("periods").get(p);
        double[] y = FixtureFiles.doubles(period.get("y"));
        double[][] x = new double[period.get("x").size()][];
        for (int j = 0; j < x.length; j++) {
            x[j] = FixtureFiles.doubles(period.get("x").get(j));
            if (variant.equals("standardized")) {
                x[j] = CrossSectionRegression.standardize(x[j]);
            }
        }
        double[] w = variant.equals("weighted") ? FixtureFiles.doubles(period.get("weights")) : null;
        return CrossSectionRegression.fit(y, x, w);
    }

    // Source: GRS from numpy on the formula of Gibbons, Ross and Shanken (1989) in the form of Campbell, Lo and
    // MacKinlay (1997, ch. 6), p-value scipy.stats.f.sf; alphas, OLS t, betas and R^2 from statsmodels OLS; alpha NW t
    // from statsmodels OLS HAC (use_correction=False).
    @Test
    void grsAndAssetRegressionsMatchTheReferenceScript() {
        double[][] assets = matrix(GRS.get("assets"));
        double[][] factors = matrix(GRS.get("factors"));
        FactorModelTest.Result r = FactorModelTest.of(assets, factors);
        assertEquals(assets[0].length, r.months());
        assertEquals(GRS.get("nw_lags").asInt(), r.nwLags());
        assertEquals(GRS.get("grs").asDouble(), r.grs(), 1e-10);
        assertEquals(GRS.get("p_value").asDouble(), r.pValue(), 1e-10);
        assertEquals(GRS.get("mean_abs_alpha").asDouble(), r.meanAbsAlpha(), 1e-13);
        assertEquals(GRS.get("mean_r_squared").asDouble(), r.meanRSquared(), 1e-12);
        for (int i = 0; i < assets.length; i++) {
            JsonNode e = GRS.get("regressions").get(i);
            FactorModelTest.AssetRegression a = r.regressions().get(i);
            assertEquals(e.get("alpha").asDouble(), a.alpha(), 1e-13, "asset " + i);
            assertEquals(e.get("alpha_t").asDouble(), a.alphaT(), 1e-9, "asset " + i);
            assertEquals(e.get("alpha_nw_t").asDouble(), a.alphaNwT(), 1e-9, "asset " + i);
            assertEquals(e.get("r_squared").asDouble(), a.rSquared(), 1e-12, "asset " + i);
            assertEquals(e.get("residual_vol").asDouble(), a.residualVol(), 1e-13, "asset " + i);
            double[] betas = FixtureFiles.doubles(e.get("betas"));
            for (int j = 0; j < betas.length; j++) {
                assertEquals(betas[j], a.betas()[j], 1e-11, "asset " + i + " beta " + j);
            }
        }
    }

    @Test
    void grsRejectsTooFewMonthsAndASingularFactorCovariance() {
        double[][] factors = matrix(GRS.get("factors"));
        double[][] assets = matrix(GRS.get("assets"));
        double[][] shortAssets = new double[assets.length][];
        double[][] shortFactors = new double[factors.length][];
        for (int i = 0; i < assets.length; i++) {
            shortAssets[i] = java.util.Arrays.copyOf(assets[i], assets.length + factors.length);
        }
        for (int j = 0; j < factors.length; j++) {
            shortFactors[j] = java.util.Arrays.copyOf(factors[j], assets.length + factors.length);
        }
        assertThrows(IllegalArgumentException.class, () -> FactorModelTest.of(shortAssets, shortFactors));
        double[][] collinear = {factors[0], factors[1], factors[0].clone()};
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> FactorModelTest.of(assets, collinear));
        assertTrue(e.getMessage().contains("drop one of"), e.getMessage());
    }

    // Source: step means and statsmodels HAC t on common months, scipy.stats.spearmanr for the rank correlation.
    @Test
    void monotonicityMatchesPandasAndScipy() {
        List<ReturnSeries> buckets = new ArrayList<>();
        for (JsonNode b : MONO.get("buckets")) {
            buckets.add(FixtureFiles.series(b.get("dates"), b.get("values")));
        }
        for (String direction : List.of("high_minus_low", "low_minus_high")) {
            JsonNode e = MONO.get(direction);
            Monotonicity.Result r = Monotonicity.of(buckets, direction.equals("high_minus_low"), 2.5);
            assertEquals(e.get("rank_correlation").asDouble(), r.rankCorrelation(), 1e-12, direction);
            int positive = 0;
            double minT = Double.POSITIVE_INFINITY;
            for (int j = 0; j < 4; j++) {
                JsonNode s = e.get("steps").get(j);
                Monotonicity.Step step = r.steps().get(j);
                assertEquals(s.get("n").asInt(), step.n(), direction + " step " + j);
                assertEquals(s.get("mean").asDouble(), step.mean(), 1e-14, direction + " step " + j);
                assertEquals(s.get("nw_t_stat").asDouble(), step.nwTStat(), 1e-9, direction + " step " + j);
                positive += step.mean() > 0 ? 1 : 0;
                minT = Math.min(minT, step.nwTStat());
            }
            assertEquals(positive, r.stepsInDirection());
            assertEquals(minT, r.minStepT(), 0.0);
            for (int j = 0; j < 5; j++) {
                assertEquals(e.get("bucket_means").get(j).asDouble(), r.buckets().get(j).mean(), 1e-14);
                assertEquals(e.get("bucket_nw_t").get(j).asDouble(), r.buckets().get(j).nwTStat(), 1e-9);
            }
        }
        // verdict rules (hand-checked from the rule text)
        Monotonicity.Result rising = Monotonicity.of(buckets, true, 2.5);
        Verdict expected = rising.stepsInDirection() == 4 ? Verdict.HOLDS
                : rising.rankCorrelation() >= 0.8 ? Verdict.WEAK : Verdict.FAILS;
        assertEquals(expected, rising.verdict().verdict());
        assertEquals(Verdict.FAILS, Monotonicity.of(buckets, false, 2.5).verdict().verdict());
    }

    // Hand-worked: 24 monthly returns, the last 14 after the definition date.
    @Test
    void liveRecordSplitsOnTheDefinitionDate() {
        LocalDate[] dates = new LocalDate[24];
        double[] values = new double[24];
        for (int i = 0; i < 24; i++) {
            dates[i] = LocalDate.of(2020, 1, 1).plusMonths(i + 1).minusDays(1);
            values[i] = i % 2 == 0 ? 0.02 : 0.01;
        }
        ReturnSeries monthly = new ReturnSeries(dates, values);
        LiveRecord.Result r = LiveRecord.of(monthly, LocalDate.of(2020, 10, 31));
        assertEquals(10, r.before().n()); // Jan..Oct 2020: October ends on the definition day, not after it
        assertEquals(9, LiveRecord.of(monthly, LocalDate.of(2020, 10, 15)).before().n()); // October ends after the 15th
        assertEquals(14, r.after().n());
        assertEquals(0.015, r.before().mean(), 1e-15);
        assertEquals(0.015, r.after().mean(), 1e-15);
        assertEquals(1.0, r.meanRatio(), 1e-12);
        double sd = Math.sqrt(14 * 0.005 * 0.005 / 13.0); // alternating +-0.005 about 0.015
        assertEquals(0.015 / sd, r.after().sharpeMonthly(), 1e-12);
        assertEquals(Verdict.HOLDS, r.verdict().verdict());
        assertEquals(Verdict.NOT_ENOUGH_DATA, LiveRecord.of(monthly, LocalDate.of(2021, 2, 1)).verdict().verdict());
    }

    private static double[][] matrix(JsonNode rows) {
        double[][] m = new double[rows.size()][];
        for (int i = 0; i < m.length; i++) {
            m[i] = FixtureFiles.doubles(rows.get(i));
        }
        return m;
    }
}
