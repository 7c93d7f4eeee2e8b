package dev.winnow.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.ToDoubleFunction;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

class TrialTableTest {
    private static final double TOLERANCE = 1e-10;

    /**
     * The whole table path (monthly basis, per-trial statistics, adjustments, PSR, deflated Sharpe) against an
     * independent computation with statsmodels (HAC t, multipletests), scipy.stats (norm, skew, kurtosis), numpy and
     * pandas (compounding a daily trial to months): service/src/test/scripts/evidence_fixture.py,
     * fixture fixtures/evidence.json, section trial_table.
     */
    @Test
    void matchesTheLibraryComputedWithStatsmodelsAndScipy() {
        JsonNode fixture = FixtureFiles.read("evidence.json").get("trial_table");
        List<TrialStatistics> statistics = new ArrayList<>();
        for (JsonNode trial : fixture.get("trials")) {
            MonthlyBasis basis = MonthlyBasis.of(FixtureFiles.series(trial.get("dates"), trial.get("returns")));
            assertEquals(trial.path("excluded").asBoolean(false), basis.excluded(), trial.get("name").asText());
            if (!basis.excluded()) {
                assertEquals(trial.get("monthly_n").asInt(), basis.monthly().size(), trial.get("name").asText());
                statistics.add(TrialStatistics.of(basis.monthly().values()));
            }
        }
        TrialTable table = TrialTable.of(statistics);
        assertEquals(fixture.get("N").asInt(), table.trials());
        assertEquals(fixture.get("V").asDouble(), table.sharpeVariance(), TOLERANCE);
        assertEquals(fixture.get("SR0").asDouble(), table.expectedMaxSharpe(), TOLERANCE);
        JsonNode rows = fixture.get("rows");
        assertEquals(rows.size(), table.rows().size());
        for (int i = 0; i < rows.size(); i++) {
            JsonNode want = rows.get(i);
            TrialRow got = table.rows().get(i);
            String name = want.get("name").asText();
            assertEquals(want.get("n").asInt(), got.statistics().n(), name);
            if (!want.has("p")) {
                assertFalse(got.statistics().defined(), name);
                assertTrue(Double.isNaN(got.pBh()) && Double.isNaN(got.deflatedSharpe()), name);
                assertNull(got.passesT3(), name);
                continue;
            }
            assertEquals(want.get("mean").asDouble(), got.statistics().mean(), TOLERANCE, name + " mean");
            assertEquals(want.get("nw_t").asDouble(), got.statistics().nwTStat(), TOLERANCE, name + " nw_t");
            assertEquals(want.get("p").asDouble(), got.statistics().pValue(), TOLERANCE, name + " p");
            assertEquals(want.get("sharpe").asDouble(), got.statistics().sharpe(), TOLERANCE, name + " sharpe");
            assertEquals(want.get("skew").asDouble(), got.statistics().skewness(), TOLERANCE, name + " skew");
            assertEquals(want.get("kurt").asDouble(), got.statistics().kurtosis(), TOLERANCE, name + " kurtosis");
            assertEquals(want.get("p_bonferroni").asDouble(), got.pBonferroni(), TOLERANCE, name + " bonferroni");
            assertEquals(want.get("p_holm").asDouble(), got.pHolm(), TOLERANCE, name + " holm");
            assertEquals(want.get("p_bh").asDouble(), got.pBh(), TOLERANCE, name + " bh");
            assertEquals(want.get("p_by").asDouble(), got.pBy(), TOLERANCE, name + " by");
            assertEquals(want.get("passes_t3").asBoolean(), got.passesT3(), name + " passes_t3");
            assertEquals(want.get("psr").asDouble(), got.psr(), TOLERANCE, name + " psr");
            assertEquals(want.get("deflated_sharpe").asDouble(), got.deflatedSharpe(), TOLERANCE, name + " dsr");
        }
    }

    /**
     * The 15 p-values of the worked example in Benjamini and Hochberg (1995, JRSS B 57(1), section 4), quoted FROM
     * MEMORY (as in MultipleTestingTest): at q = 0.05 the step-up procedure rejects 4, Bonferroni 3. Here they go
     * through the trial table (as trials whose p-values are given), and all four adjustments are compared with
     * statsmodels multipletests (fixture bh_example from evidence_fixture.py).
     */
    @Test
    void benjaminiHochbergPaperExampleThroughTheTable() {
        JsonNode fixture = FixtureFiles.read("evidence.json").get("bh_example");
        double[] p = FixtureFiles.doubles(fixture.get("p"));
        NormalDistribution normal = new NormalDistribution(null, 0, 1);
        List<TrialStatistics> trials = new ArrayList<>();
        for (double value : p) {
            double t = normal.inverseCumulativeProbability(1 - value / 2);
            trials.add(new TrialStatistics(120, 0.01, t, value, 0.1, 0.0, 3.0));
        }
        TrialTable table = TrialTable.of(trials);
        assertEquals(15, table.trials());
        assertEquals(4, rejected(table, TrialRow::pBh, 0.05));
        assertEquals(3, rejected(table, TrialRow::pBonferroni, 0.05));
        assertAdjusted(fixture.get("p_bonferroni"), table, TrialRow::pBonferroni);
        assertAdjusted(fixture.get("p_holm"), table, TrialRow::pHolm);
        assertAdjusted(fixture.get("p_bh"), table, TrialRow::pBh);
        assertAdjusted(fixture.get("p_by"), table, TrialRow::pBy);
    }

    /**
     * The numerical example of Bailey and Lopez de Prado (2014, Journal of Portfolio Management 40(5)), inputs and
     * outputs quoted FROM MEMORY as in SharpeRatiosTest: N = 100 trials whose Sharpe ratios have variance 0.5
     * (annualised; 0.5/250 in daily units), the selected one with annualised SR 2.5 (2.5/sqrt(250) daily) over
     * T = 1250 days, skewness -3, kurtosis 10; published SR0 ~ 0.1132 (daily) and DSR ~ 0.9004. Here V and N come out
     * of the table: the other 99 Sharpe ratios are a + c z with z = -49..49 and c chosen so that the sample variance
     * of all 100 is exactly 0.5/250.
     */
    @Test
    void deflatedSharpePaperExampleThroughTheTable() {
        double selected = 2.5 / Math.sqrt(250);
        double variance = 0.5 / 250;
        double sumZ2 = 0;
        for (int z = -49; z <= 49; z++) {
            sumZ2 += z * z;
        }
        double c = Math.sqrt(variance * 99 / sumZ2);
        List<TrialStatistics> trials = new ArrayList<>();
        trials.add(new TrialStatistics(1250, 0.001, 2.0, 0.05, selected, -3.0, 10.0));
        for (int z = -49; z <= 49; z++) {
            trials.add(new TrialStatistics(1250, 0.001, 1.0, 0.3, selected + c * z, 0.0, 3.0));
        }
        TrialTable table = TrialTable.of(trials);
        assertEquals(100, table.trials());
        assertEquals(variance, table.sharpeVariance(), 1e-15);
        assertEquals(0.1132, table.expectedMaxSharpe(), 0.00005);
        assertEquals(0.9004, table.rows().get(0).deflatedSharpe(), 0.00005);
    }

    @Test
    void oneDefinedTrialHasNoDeflationAndUndefinedTrialsStayOutOfN() {
        // Bailey and Lopez de Prado (2014): with a single trial SR0 = 0, so the deflated Sharpe equals the PSR.
        double[] returns = {0.01, -0.02, 0.03, 0.015, -0.005, 0.02};
        TrialTable table = TrialTable.of(List.of(TrialStatistics.of(returns), TrialStatistics.of(new double[] {0.01, 0.02}),
                TrialStatistics.undefined(0)));
        assertEquals(1, table.trials());
        assertEquals(0.0, table.expectedMaxSharpe(), 0.0);
        assertTrue(Double.isNaN(table.sharpeVariance()));
        TrialRow row = table.rows().get(0);
        assertEquals(row.psr(), row.deflatedSharpe(), 0.0);
        // with N = 1 every adjustment is the raw p-value
        assertEquals(row.statistics().pValue(), row.pBonferroni(), 0.0);
        assertEquals(row.statistics().pValue(), row.pBy(), 0.0);
        assertNull(table.rows().get(1).passesT3());
        assertEquals(2, table.rows().get(1).statistics().n());
    }

    private static long rejected(TrialTable table, ToDoubleFunction<TrialRow> adjusted, double q) {
        return table.rows().stream().mapToDouble(adjusted).filter(a -> a <= q).count();
    }

    private static void assertAdjusted(JsonNode expected, TrialTable table, ToDoubleFunction<TrialRow> adjusted) {
        double[] got = table.rows().stream().mapToDouble(adjusted).toArray();
        double[] want = FixtureFiles.doubles(expected);
        for (int i = 0; i < want.length; i++) {
            assertEquals(want[i], got[i], 1e-12, "p-value #" + (i + 1) + " of " + Arrays.toString(want));
        }
    }
}
