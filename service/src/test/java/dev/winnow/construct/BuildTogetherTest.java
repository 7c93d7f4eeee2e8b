package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.winnow.stats.ReturnSeries;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * A shared pass over the panel ({@link FactorEngine#buildTogether}, what a variant family's build uses) gives every
 * factor the bits of its own checkpointed build: series, formations, end state and every checkpoint, for all the
 * construction and recipe fixture definitions at once (every method, recipes shared by several definitions, lags 1
 * and 2, risk-free and signal factors).
 */
class BuildTogetherTest {

    @Test
    void aSharedPassEqualsEachFactorBuiltAlone() {
        InMemoryPanel panel = ConstructionFixtures.panel();
        Map<String, ReturnSeries> factors = SignalFixtures.factors();
        ReturnSeries rf = ConstructionFixtures.riskFree();
        List<FactorDefinition> defs = new ArrayList<>(ConstructionFixtures.definitions().values());
        defs.addAll(SignalFixtures.definitions().values());
        defs.addAll(SignalFixtures.definitions().values()); // the same recipes twice: shared evaluators
        List<FactorEngine.Member> members = new ArrayList<>();
        for (FactorDefinition d : defs) {
            members.add(new FactorEngine.Member(d, d.riskFree() == null ? null : rf, d.signal() == null ? Map.of() : factors));
        }
        for (int spacing : new int[] {7, 80, 1000}) {
            int[] progress = {0};
            List<CheckpointedBuild.Result> together = FactorEngine.buildTogether(members, panel, spacing, t -> progress[0] = t);
            assertEquals(panel.dates().size(), progress[0]);
            for (int i = 0; i < defs.size(); i++) {
                FactorEngine.Member m = members.get(i);
                CheckpointedBuild.Result alone = CheckpointedBuild.run(m.definition(), panel, m.riskFree(), m.signalFactors(),
                        null, 0, 0, spacing, ConstructionFixtures.FORMING);
                String what = "definition " + i + " every " + spacing;
                ConstructionFixtureTest.assertBitwiseEqual(alone.build().observations(), together.get(i).build().observations(), what);
                assertEquals(alone.build().formations(), together.get(i).build().formations(), what);
                assertEquals(alone.build().periodsWithoutReturn(), together.get(i).build().periodsWithoutReturn(), what);
                assertArrayEquals(alone.build().endState().toBytes(), together.get(i).build().endState().toBytes(), what);
                assertEquals(alone.checkpoints().size(), together.get(i).checkpoints().size(), what);
                for (int c = 0; c < alone.checkpoints().size(); c++) {
                    assertArrayEquals(alone.checkpoints().get(c).state().toBytes(), together.get(i).checkpoints().get(c).state().toBytes());
                    assertEquals(alone.checkpoints().get(c).observations(), together.get(i).checkpoints().get(c).observations());
                    assertEquals(alone.checkpoints().get(c).periodsWithoutReturn(),
                            together.get(i).checkpoints().get(c).periodsWithoutReturn());
                }
            }
        }
    }
}
