package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.FactorDefinition.Method;
import java.time.LocalDate;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;

class EngineStateTest {
    private static final int[] IDS = {3, 8};
    private static final double[] CAPS = {1, 1};

    private static InMemoryPanel panel() {
        return new InMemoryPanel(List.of(
                Sections.of("2024-01-02", IDS, new double[] {.01, .02}, CAPS, new double[] {1, 2}),
                Sections.of("2024-01-03", IDS, new double[] {.03, -.01}, CAPS, new double[] {2, 1}),
                Sections.of("2024-01-04", IDS, new double[] {.0, .05}, CAPS, new double[] {1, 2})));
    }

    private static FactorDefinition sort() {
        return FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(2).build();
    }

    @Test
    void roundTripKeepsEveryBit() {
        EngineState state = FactorEngine.build(sort(), panel(), null, null).endState();
        byte[] bytes = state.toBytes();
        EngineState back = EngineState.fromBytes(bytes);
        assertArrayEquals(bytes, back.toBytes());
        assertEquals(state, back);
        assertEquals(3, back.processedDates());
        assertEquals(LocalDate.parse("2024-01-04"), back.lastProcessedDate());
        assertTrue(back.hasHoldings());
    }

    @Test
    void emptyPanelGivesAStateToStartFrom() {
        EngineState state = FactorEngine.build(sort(), panel().prefix(0), null, null).endState();
        assertEquals(0, state.processedDates());
        assertFalse(state.hasHoldings());
        BuildResult rest = FactorEngine.build(sort(), panel(), null, EngineState.fromBytes(state.toBytes()));
        assertEquals(FactorEngine.build(sort(), panel(), null, null).observations(), rest.observations());
    }

    @Test
    void corruptBytesAreRejectedWithAHint() {
        byte[] bytes = FactorEngine.build(sort(), panel(), null, null).endState().toBytes();
        byte[] badMagic = bytes.clone();
        badMagic[0] = 'X';
        assertTrue(assertThrows(IllegalArgumentException.class, () -> EngineState.fromBytes(badMagic))
                .getMessage().contains("bad header"));
        byte[] newerVersion = bytes.clone();
        newerVersion[7] = 9;
        assertTrue(assertThrows(IllegalArgumentException.class, () -> EngineState.fromBytes(newerVersion))
                .getMessage().contains("version 9"));
        assertThrows(IllegalArgumentException.class, () -> EngineState.fromBytes(Arrays.copyOf(bytes, bytes.length - 3)));
        assertThrows(IllegalArgumentException.class, () -> EngineState.fromBytes(new byte[0]));
    }

    @Test
    void resumeRefusesAnotherDefinitionOrAChangedGrid() {
        EngineState state = FactorEngine.build(sort(), panel().prefix(2), null, null).endState();
        FactorDefinition other = FactorDefinition.builder(Method.SORT).panel("p").signal("signal").buckets(3).build();
        assertThrows(IllegalArgumentException.class, () -> FactorEngine.build(other, panel(), null, state));
        InMemoryPanel shifted = new InMemoryPanel(List.of(
                Sections.of("2024-01-01", IDS, new double[] {0, 0}, CAPS, new double[] {1, 2}),
                Sections.of("2024-01-02", IDS, new double[] {.01, .02}, CAPS, new double[] {1, 2}),
                Sections.of("2024-01-03", IDS, new double[] {.03, -.01}, CAPS, new double[] {2, 1})));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> FactorEngine.build(sort(), shifted, null, state));
        assertTrue(e.getMessage().contains("rebuild from scratch"), e.getMessage());
    }

    @Test
    void riskFreeArgumentMustMatchTheDefinition() {
        FactorDefinition market = FactorDefinition.builder(Method.MARKET).panel("p").riskFree("cash").build();
        assertThrows(IllegalArgumentException.class, () -> FactorEngine.build(market, panel(), null, null));
    }
}
