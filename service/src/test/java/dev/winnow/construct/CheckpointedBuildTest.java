package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.stats.ReturnSeries;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;

/**
 * Consistency checks of segmented builds on the pandas-checked fixture definitions (ConstructionFixtureTest checks
 * the engine against the independent implementation): a build run in segments gives, to the last bit, the one-pass
 * build, each checkpoint equals the end state and counts of a build over that prefix of the grid, and a run resumed
 * from any checkpoint continues to the same end. The one-pass build forms ahead on a second thread (the panel has
 * more than {@link FactorEngine#FORMED_AHEAD_MIN_DATES} dates) while segments of fewer dates run on one thread, so
 * this also compares the two ways of running the engine.
 */
class CheckpointedBuildTest {
    private static final InMemoryPanel PANEL = ConstructionFixtures.panel();
    private static final ReturnSeries RISK_FREE = ConstructionFixtures.riskFree();

    @TestFactory
    Stream<DynamicTest> segmentsAndCheckpointsEqualOnePass() {
        Map<String, FactorDefinition> definitions = ConstructionFixtures.definitions();
        return definitions.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            ReturnSeries rf = def.riskFree() == null ? null : RISK_FREE;
            BuildResult full = FactorEngine.build(def, PANEL, rf, Map.of(), null, ConstructionFixtures.FORMING);
            int total = PANEL.dates().size();
            assertTrue(total >= FactorEngine.FORMED_AHEAD_MIN_DATES, "the one-pass build must form ahead");
            for (int spacing : new int[] {1, 2, 7, 27, total, total + 1}) {
                String where = e.getKey() + " every " + spacing;
                CheckpointedBuild.Result run = CheckpointedBuild.run(def, PANEL, rf, null, 0, 0, spacing, ConstructionFixtures.FORMING);
                assertSameBuild(full, run.build(), where);
                List<CheckpointedBuild.Checkpoint> checkpoints = run.checkpoints();
                assertEquals(total / spacing, checkpoints.size(), where);
                for (CheckpointedBuild.Checkpoint c : checkpoints) {
                    int k = c.state().processedDates();
                    assertEquals(0, k % spacing, where);
                    BuildResult prefix = FactorEngine.build(def, PANEL.prefix(k), rf, null);
                    assertArrayEquals(prefix.endState().toBytes(), c.state().toBytes(), where + " state at " + k);
                    assertEquals(prefix.observations().size(), c.observations(), where + " observations at " + k);
                    assertEquals(prefix.periodsWithoutReturn(), c.periodsWithoutReturn(), where + " missing at " + k);

                    CheckpointedBuild.Result resumed = CheckpointedBuild.run(def, PANEL, rf,
                            EngineState.fromBytes(c.state().toBytes()), c.observations(), c.periodsWithoutReturn(), spacing,
                            ConstructionFixtures.FORMING);
                    assertArrayEquals(full.endState().toBytes(), resumed.build().endState().toBytes(), where + " resumed at " + k);
                    assertEquals(full.observations().size(), c.observations() + resumed.build().observations().size());
                    assertEquals(checkpoints.subList(checkpoints.indexOf(c) + 1, checkpoints.size()).stream()
                                    .map(x -> x.state().processedDates()).toList(),
                            resumed.checkpoints().stream().map(x -> x.state().processedDates()).toList(), where);
                }
            }
        }));
    }

    private static void assertSameBuild(BuildResult want, BuildResult got, String where) {
        ConstructionFixtureTest.assertBitwiseEqual(want.observations(), got.observations(), where);
        assertEquals(want.formations(), got.formations(), where);
        assertEquals(want.periodsWithoutReturn(), got.periodsWithoutReturn(), where);
        assertArrayEquals(want.endState().toBytes(), got.endState().toBytes(), where);
    }
}
