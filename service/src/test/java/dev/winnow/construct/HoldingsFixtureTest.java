package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * Holdings against the independent pandas implementation (service/src/test/scripts/signal_fixtures.py,
 * holdings_expected.csv): for sort, size_sort, market, a dependent double sort, a within-group sort and rank-weighted
 * factors at several dates, the leg weights of the latest formation at or before the date and their drift through
 * its end, to 1e-12. Starting from a state saved at the latest formation gives the same bits as starting from scratch.
 */
class HoldingsFixtureTest {
    private static final double TOLERANCE = 1e-12;

    private static FactorDefinition definition(String id) {
        FactorDefinition def = SignalFixtures.definitions().get(id);
        return def != null ? def : ConstructionFixtures.definitions().get(id);
    }

    @TestFactory
    Stream<DynamicTest> holdingsMatchThePandasImplementation() {
        InMemoryPanel panel = ConstructionFixtures.panel();
        Map<String, ReturnSeries> factors = SignalFixtures.factors();
        Map<String, List<String[]>> byCase = new LinkedHashMap<>();
        List<String[]> rows = PanelCsv.readRows("/fixtures/holdings_expected.csv");
        java.util.Set<String> ids = new java.util.LinkedHashSet<>();
        java.util.Set<String> dates = new java.util.TreeSet<>();
        for (String[] row : rows.subList(1, rows.size())) {
            ids.add(row[0]);
            dates.add(row[1]);
        }
        for (String id : ids) {
            for (String date : dates) {
                byCase.put(id + " " + date, new ArrayList<>());
            }
        }
        for (String[] row : rows.subList(1, rows.size())) {
            byCase.get(row[0] + " " + row[1]).add(row);
        }
        assertEquals(9, ids.size());
        assertEquals(7, dates.size());
        return byCase.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            String[] key = e.getKey().split(" ");
            FactorDefinition def = definition(key[0]);
            int index = panel.dates().indexOf(LocalDate.parse(key[1]));
            ReturnSeries rf = def.riskFree() == null ? null : ConstructionFixtures.riskFree();
            Holdings got = FactorEngine.holdings(def, panel, rf, factors, null, index);
            assertNotNull(got);
            assertEquals(LocalDate.parse(key[1]), got.date());
            if (!e.getValue().isEmpty()) {
                assertEquals(LocalDate.parse(e.getValue().get(0)[2]), got.formationDate());
            }
            List<String[]> wantLong = e.getValue().stream().filter(r -> r[3].equals("long")).toList();
            List<String[]> wantShort = e.getValue().stream().filter(r -> r[3].equals("short")).toList();
            assertLeg(wantLong, got.longLeg(), e.getKey() + " long");
            assertLeg(wantShort, got.shortLeg(), e.getKey() + " short");

            int formation = FactorEngine.latestFormation(def, panel.dates(), index);
            EngineState state = FactorEngine.build(def, panel.prefix(formation + 1), rf, factors, null).endState();
            assertEquals(got, FactorEngine.holdings(def, panel, rf, factors, EngineState.fromBytes(state.toBytes()), index),
                    "from the state at the formation");
        }));
    }

    private static void assertLeg(List<String[]> want, List<Holdings.Position> got, String what) {
        assertEquals(want.size(), got.size(), what + ": securities");
        for (int i = 0; i < want.size(); i++) {
            assertEquals(Integer.parseInt(want.get(i)[4]), got.get(i).securityId(), what);
            assertEquals(Double.parseDouble(want.get(i)[5]), got.get(i).weight(), TOLERANCE, what + " weight " + want.get(i)[4]);
            assertEquals(Double.parseDouble(want.get(i)[6]), got.get(i).driftedWeight(), TOLERANCE, what + " drifted " + want.get(i)[4]);
        }
    }

    @Test
    void beforeTheFirstFormationThereAreNoHoldings() {
        InMemoryPanel panel = ConstructionFixtures.panel();
        FactorDefinition monthly = ConstructionFixtures.definitions().get("sort_bm_b3_cap_monthly");
        assertEquals(-1, FactorEngine.latestFormation(monthly, panel.dates(), 3));
        assertNull(FactorEngine.holdings(monthly, panel, null, Map.of(), null, 3));
    }
}
