package dev.winnow.construct;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.stats.ReturnSeries;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Rolling loadings on a generated panel with missing returns, late entries, early exits and factor series with
 * missing dates, against numpy.linalg.lstsq (R^2 and residual vol cross-checked with statsmodels OLS) in
 * fixtures/loadings_rolling.json, written by src/test/scripts/loadings_fixture.py (window 40, min_obs 20).
 */
class SecurityLoadingsFixtureTest {
    private static JsonNode fixture;
    private static List<LocalDate> dates;
    private static LoadingsTestPanel panel;
    private static List<ReturnSeries> factors;
    private static int window;
    private static int minObs;

    @BeforeAll
    static void read() throws IOException {
        fixture = new ObjectMapper().readTree(LoadingsTestPanel.fixture("loadings_rolling.json"));
        window = fixture.get("window").asInt();
        minObs = fixture.get("min_obs").asInt();
        dates = new ArrayList<>();
        fixture.get("dates").forEach(d -> dates.add(LocalDate.parse(d.asText())));
        LoadingsTestPanel.Builder builder = LoadingsTestPanel.builder(dates);
        for (JsonNode row : fixture.get("rows")) {
            builder.row(row.get(0).asInt(), row.get(1).asInt() + 1, row.get(2).isNull() ? Double.NaN : row.get(2).asDouble());
        }
        panel = builder.build();
        factors = new ArrayList<>();
        for (JsonNode f : fixture.get("factors")) {
            LocalDate[] d = new LocalDate[f.get("dates").size()];
            double[] v = new double[d.length];
            for (int i = 0; i < d.length; i++) {
                d[i] = LocalDate.parse(f.get("dates").get(i).asText());
                v[i] = f.get("values").get(i).asDouble();
            }
            factors.add(new ReturnSeries(d, v));
        }
    }

    @Test
    void matchesNumpyLstsqAtEveryDate() {
        Map<Integer, LoadingsTable> tables = new HashMap<>();
        SecurityLoadings.slide(panel, FactorGrid.align(factors, dates), 0, dates.size() - 1, window, minObs,
                t -> tables.put(dates.indexOf(t.date()), t));
        Map<Integer, Integer> listed = new HashMap<>();
        int fitted = 0;
        for (JsonNode e : fixture.get("expected")) {
            int d = e.get("date_index").asInt();
            int id = Integer.parseInt(e.get("security").asText().substring(3));
            LoadingsTable table = tables.get(d);
            int row = table.rowOf(id);
            String where = e.get("security").asText() + " at " + dates.get(d);
            assertTrue(row >= 0, where + " is listed");
            listed.merge(d, 1, Integer::sum);
            assertEquals(e.get("n").asInt(), table.usable()[row], where + " usable dates");
            if (e.get("alpha").isNull()) {
                assertTrue(Double.isNaN(table.alpha()[row]) && Double.isNaN(table.residualVol()[row]), where + " has no loadings");
                assertEquals(table.usable()[row] + " usable dates, fewer than min_obs " + minObs, table.reason(row));
                continue;
            }
            fitted++;
            assertNull(table.reason(row), where);
            assertEquals(e.get("alpha").asDouble(), table.alpha()[row], 1e-12, where + " alpha");
            for (int j = 0; j < 3; j++) {
                assertEquals(e.get("betas").get(j).asDouble(), table.betas()[j][row], 1e-9, where + " beta " + j);
            }
            assertEquals(e.get("r_squared").asDouble(), table.rSquared()[row], 1e-11, where + " R^2");
            double vol = e.get("residual_vol").asDouble();
            assertEquals(vol, table.residualVol()[row], vol * 1e-10, where + " residual vol");
        }
        for (int d = 0; d < dates.size(); d++) {
            assertEquals(listed.getOrDefault(d, 0), tables.get(d).size(), "only securities with a row at " + dates.get(d));
        }
        assertTrue(fitted > 300, "the fixture exercises many fits, got " + fitted);
    }

    @Test
    void slidingWindowEqualsPerDateComputationBitForBit() {
        FactorGrid grid = FactorGrid.align(factors, dates);
        List<LoadingsTable> slid = new ArrayList<>();
        SecurityLoadings.slide(panel, grid, 0, dates.size() - 1, window, minObs, slid::add);
        for (int d = 0; d < dates.size(); d++) {
            assertEquals(SecurityLoadings.at(panel, factors, d, window, minObs), slid.get(d), "date " + dates.get(d));
        }
        List<LoadingsTable> middle = new ArrayList<>();
        SecurityLoadings.slide(panel, grid, 45, 52, window, minObs, middle::add);
        for (int i = 0; i < middle.size(); i++) {
            assertEquals(slid.get(45 + i), middle.get(i), "a slide starting mid-panel refills its window");
        }
    }

    @Test
    void securityHistoryEqualsPanelRowsBitForBit() {
        FactorGrid grid = FactorGrid.align(factors, dates);
        for (int id : new int[] {3, 5, 7, 9}) {
            SecurityLoadingsHistory history = SecurityLoadings.history(panel, grid, id, 10, dates.size() - 1, window, minObs);
            int t = 0;
            for (int d = 10; d < dates.size(); d++) {
                LoadingsTable table = SecurityLoadings.at(panel, grid, d, window, minObs);
                int row = table.rowOf(id);
                if (row < 0) {
                    continue;
                }
                assertEquals(dates.get(d), history.dates().get(t));
                assertEquals(table.usable()[row], history.usable()[t]);
                assertEquals(Double.doubleToLongBits(table.alpha()[row]), Double.doubleToLongBits(history.alpha()[t]));
                for (int j = 0; j < 3; j++) {
                    assertEquals(Double.doubleToLongBits(table.betas()[j][row]), Double.doubleToLongBits(history.betas()[j][t]));
                }
                assertEquals(Double.doubleToLongBits(table.rSquared()[row]), Double.doubleToLongBits(history.rSquared()[t]));
                assertEquals(Double.doubleToLongBits(table.residualVol()[row]), Double.doubleToLongBits(history.residualVol()[t]));
                t++;
            }
            assertEquals(history.size(), t, "history lists exactly the dates with a row");
        }
    }
}
