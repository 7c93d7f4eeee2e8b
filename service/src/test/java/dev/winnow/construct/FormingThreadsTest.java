package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import org.junit.jupiter.api.Test;

/**
 * Where a long build makes its formations: on a forming thread when it is given {@link FormingThreads} with threads,
 * on the caller's thread with {@link FormingThreads#NONE} or with a set already closed; the series, formations and
 * end state are the same bits in all three cases, for every fixture definition.
 */
class FormingThreadsTest {
    private static final InMemoryPanel PANEL = ConstructionFixtures.panel();
    private static final ReturnSeries RISK_FREE = ConstructionFixtures.riskFree();

    /** The fixture panel, noting the names of the threads that read it. */
    private static final class Watched implements PanelSource {
        final Set<String> readers = ConcurrentHashMap.newKeySet();

        @Override
        public List<LocalDate> dates() {
            return PANEL.dates();
        }

        @Override
        public CrossSection crossSection(int index) {
            readers.add(Thread.currentThread().getName());
            return PANEL.crossSection(index);
        }
    }

    private static BuildResult build(FactorDefinition def, FormingThreads forming, Set<String> readers) {
        Watched panel = new Watched();
        BuildResult result = FactorEngine.build(def, panel, def.riskFree() == null ? null : RISK_FREE, Map.of(), null, forming);
        readers.addAll(panel.readers);
        return result;
    }

    @Test
    void formsOnAFormingThreadOnlyWhenGivenOneAndGivesTheSameBitsEitherWay() {
        assertTrue(PANEL.dates().size() >= FactorEngine.FORMED_AHEAD_MIN_DATES, "the builds must be long enough to form ahead");
        assumeTrue(Runtime.getRuntime().availableProcessors() >= 2, "forming ahead needs two processors");
        String caller = Thread.currentThread().getName();
        FormingThreads closed = FormingThreads.perProcessor();
        closed.close();
        try (FormingThreads open = FormingThreads.perProcessor()) {
            ConstructionFixtures.definitions().forEach((name, def) -> {
                Set<String> alone = ConcurrentHashMap.newKeySet();
                Set<String> ahead = ConcurrentHashMap.newKeySet();
                Set<String> afterClose = ConcurrentHashMap.newKeySet();
                BuildResult want = build(def, FormingThreads.NONE, alone);
                BuildResult formed = build(def, open, ahead);
                BuildResult refused = build(def, closed, afterClose);
                assertEquals(Set.of(caller), alone, name + ": without threads the caller reads the panel");
                assertEquals(Set.of("factor-forming"), ahead, name + ": with threads a forming thread reads it");
                assertEquals(Set.of(caller), afterClose, name + ": once closed the caller reads it");
                for (BuildResult got : List.of(formed, refused)) {
                    ConstructionFixtureTest.assertBitwiseEqual(want.observations(), got.observations(), name);
                    assertEquals(want.formations(), got.formations(), name);
                    assertEquals(want.periodsWithoutReturn(), got.periodsWithoutReturn(), name);
                    assertArrayEquals(want.endState().toBytes(), got.endState().toBytes(), name);
                }
            });
        }
    }
}
