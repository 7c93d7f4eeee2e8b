package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;

/**
 * The engine against an independent pandas/numpy implementation of the construction rules
 * (service/src/test/scripts/construction_fixtures.py, Debian python3-pandas and python3-numpy; its breakpoints come
 * from numpy.quantile's default 'linear' method, Hyndman and Fan type 7). The script's seeded panel and its series
 * for 22 definitions (every method, calendar, lag 1 and 2, equal and cap weights, universe and breakpoint options,
 * costs) are committed fixtures; every value must match to 1e-12.
 *
 * <p>Also the resume contract on the same definitions: building on the first k dates, serialising the state and
 * resuming on all dates must equal the build over all dates to the last bit, for every k.
 */
class ConstructionFixtureTest {
    private static final String DIR = "/fixtures/";
    private static final double TOLERANCE = 1e-12;

    private static InMemoryPanel panel;
    private static ReturnSeries riskFree;
    private static final Map<String, FactorDefinition> DEFINITIONS = new LinkedHashMap<>();
    private static final Map<String, List<String[]>> EXPECTED = new LinkedHashMap<>();

    @BeforeAll
    static void load() {
        panel = ConstructionFixtures.panel();
        riskFree = ConstructionFixtures.riskFree();
        DEFINITIONS.putAll(ConstructionFixtures.definitions());
        List<String[]> expected = PanelCsv.readRows(DIR + "construction_expected.csv");
        for (String[] row : expected.subList(1, expected.size())) {
            EXPECTED.computeIfAbsent(row[0], k -> new ArrayList<>()).add(row);
        }
    }

    private static ReturnSeries riskFreeFor(FactorDefinition def) {
        return def.riskFree() == null ? null : riskFree;
    }

    @TestFactory
    Stream<DynamicTest> everyDefinitionMatchesThePandasImplementation() {
        assertEquals(22, DEFINITIONS.size());
        return DEFINITIONS.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            assertTrue(DefinitionValidator.validate(def, null).isEmpty(), e.getKey());
            BuildResult result = FactorEngine.build(def, panel, riskFreeFor(def), null);
            List<String[]> rows = EXPECTED.get(e.getKey());
            List<String[]> obs = rows.stream().filter(r -> r[1].equals("obs")).toList();
            List<String[]> formations = rows.stream().filter(r -> r[1].equals("formation")).toList();
            String[] summary = rows.stream().filter(r -> r[1].equals("summary")).findFirst().orElseThrow();
            assertEquals(obs.size(), result.observations().size(), "number of returns");
            for (int i = 0; i < obs.size(); i++) {
                String[] want = obs.get(i);
                FactorObservation got = result.observations().get(i);
                String where = e.getKey() + " " + want[2];
                assertEquals(LocalDate.parse(want[2]), got.date(), where);
                assertClose(want[3], got.spread(), where + " spread");
                assertClose(want[4], got.longLeg(), where + " long");
                assertClose(want[5], got.shortLeg(), where + " short");
                assertClose(want[6], got.net(), where + " net");
            }
            assertEquals(formations.size(), result.formations().size(), "number of formations");
            for (int i = 0; i < formations.size(); i++) {
                assertEquals(LocalDate.parse(formations.get(i)[2]), result.formations().get(i).date());
                assertClose(formations.get(i)[7], result.formations().get(i).turnover(), e.getKey() + " turnover " + i);
            }
            assertEquals(Integer.parseInt(summary[8]), result.periodsWithoutReturn(), "periods without return");
        }));
    }

    private static void assertClose(String expected, double actual, String what) {
        if (expected.isEmpty()) {
            assertTrue(Double.isNaN(actual), what + ": expected missing, got " + actual);
        } else {
            assertEquals(Double.parseDouble(expected), actual, TOLERANCE, what);
        }
    }

    @TestFactory
    Stream<DynamicTest> appendThenResumeEqualsBuildAtOnceForEverySplit() {
        return DEFINITIONS.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            BuildResult full = FactorEngine.build(def, panel, riskFreeFor(def), null);
            int total = panel.dates().size();
            for (int k = 0; k <= total; k++) {
                BuildResult first = FactorEngine.build(def, panel.prefix(k), riskFreeFor(def), null);
                EngineState state = EngineState.fromBytes(first.endState().toBytes());
                InMemoryPanel extended = panel.prefix(total);
                BuildResult rest = FactorEngine.build(def, extended, riskFreeFor(def), state);
                assertSequential(extended.reads, "resume reads at k=" + k);
                List<FactorObservation> joined = new ArrayList<>(first.observations());
                joined.addAll(rest.observations());
                List<Formation> joinedFormations = new ArrayList<>(first.formations());
                joinedFormations.addAll(rest.formations());
                assertBitwiseEqual(full.observations(), joined, e.getKey() + " split at " + k);
                assertEquals(full.formations(), joinedFormations, e.getKey() + " formations, split at " + k);
                assertEquals(full.periodsWithoutReturn(), first.periodsWithoutReturn() + rest.periodsWithoutReturn());
                assertArrayEquals(full.endState().toBytes(), rest.endState().toBytes(), "end state, split at " + k);
            }
        }));
    }

    @TestFactory
    Stream<DynamicTest> oneDateAtATimeEqualsBuildAtOnce() {
        return DEFINITIONS.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            BuildResult full = FactorEngine.build(def, panel, riskFreeFor(def), null);
            List<FactorObservation> joined = new ArrayList<>();
            EngineState state = null;
            for (int k = 1; k <= panel.dates().size(); k++) {
                BuildResult step = FactorEngine.build(def, panel.prefix(k), riskFreeFor(def),
                        state == null ? null : EngineState.fromBytes(state.toBytes()));
                joined.addAll(step.observations());
                state = step.endState();
            }
            assertBitwiseEqual(full.observations(), joined, e.getKey());
        }));
    }

    /** Reads go strictly forward (a resume first re-reads the last lag dates, then continues). */
    private static void assertSequential(List<Integer> reads, String what) {
        for (int i = 1; i < reads.size(); i++) {
            assertTrue(reads.get(i) > reads.get(i - 1), what + ": " + reads);
        }
    }

    static void assertBitwiseEqual(List<FactorObservation> want, List<FactorObservation> got, String what) {
        assertEquals(want.size(), got.size(), what + ": number of observations");
        for (int i = 0; i < want.size(); i++) {
            FactorObservation a = want.get(i);
            FactorObservation b = got.get(i);
            assertEquals(a.date(), b.date(), what);
            long[] bitsA = bits(a);
            long[] bitsB = bits(b);
            assertArrayEquals(bitsA, bitsB, what + " at " + a.date());
        }
    }

    private static long[] bits(FactorObservation o) {
        return new long[] {Double.doubleToRawLongBits(o.spread()), Double.doubleToRawLongBits(o.longLeg()),
            Double.doubleToRawLongBits(o.shortLeg()), Double.doubleToRawLongBits(o.net())};
    }
}
