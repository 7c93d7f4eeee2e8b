package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.construct.FactorDefinition.Output;
import dev.winnow.construct.FactorDefinition.Rebalance;
import dev.winnow.construct.FactorDefinition.Weighting;
import dev.winnow.construct.PanelSchema.ColumnType;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

class DefinitionValidatorTest {
    private static final PanelSchema ACME = new PanelSchema(
            Map.of("bm", ColumnType.NUMBER, "momentum", ColumnType.NUMBER, "sector", ColumnType.LABEL), true);

    private static FactorDefinition.Builder sort() {
        return FactorDefinition.builder(Method.SORT).panel("acme").signal("bm");
    }

    @Test
    void aPlainSortIsValid() {
        assertEquals(List.of(), DefinitionValidator.validate(sort().build(), ACME));
    }

    @Test
    void unknownSignalListsTheNumericColumns() {
        List<String> problems = DefinitionValidator.validate(sort().signal("sector").build(), ACME);
        assertEquals(List.of("signal: column 'sector' of panel acme holds labels, not numbers; numeric columns are "
                + "return, market_cap, bm, momentum"), problems);
    }

    @Test
    void methodSpecificFieldsAreMisuseElsewhere() {
        FactorDefinition market = FactorDefinition.builder(Method.MARKET).panel("acme").buckets(5)
                .output(Output.SIZE).breakpoints(new LabelEquals("sector", "tech")).build();
        List<String> problems = DefinitionValidator.validate(market, ACME);
        assertTrue(problems.contains("'buckets' applies to method sort only"), problems.toString());
        assertTrue(problems.contains("'output' applies to method size_sort only"), problems.toString());
        assertTrue(problems.contains("'breakpoints' applies to methods sort and size_sort only"), problems.toString());
        assertTrue(DefinitionValidator.validate(sort().riskFree("cash").build(), ACME)
                .contains("'risk_free' applies to method market only"));
        assertTrue(DefinitionValidator.validate(FactorDefinition.builder(Method.SIZE_SORT).panel("acme").signal("bm")
                        .output(Output.SIZE).direction(FactorDefinition.Direction.LOW_MINUS_HIGH).build(), ACME)
                .contains("'direction' does not apply to output size (it is always small minus big)"));
    }

    @Test
    void rangesAndCalendar() {
        List<String> problems = DefinitionValidator.validate(sort().buckets(21).lag(0).costBps(-1.0)
                .rebalance(Rebalance.ANNUAL).build(), ACME);
        assertEquals(List.of("buckets must be between 2 and 20, got 21",
                "lag must be at least 1 (1 forms on the rows of the rebalance date), got 0",
                "rebalance annual needs rebalance_month (1 = January ... 12 = December)",
                "cost_bps must be a finite number >= 0, got -1.0"), problems);
        assertEquals(List.of("'rebalance_month' applies to rebalance annual only"),
                DefinitionValidator.validate(sort().rebalance(Rebalance.MONTHLY).rebalanceMonth(6).build(), ACME));
    }

    @Test
    void columnsOfUniverseAndBreakpointsMustBeLabels() {
        Universe universe = Universe.ALL.withLabelFilter("momentum", LabelFilter.include("x"))
                .withSegment(new LabelEquals("country", "nowhere"));
        List<String> problems = DefinitionValidator.validate(sort().universe(universe)
                .breakpoints(new LabelEquals("sector", "tech")).build(), ACME);
        assertEquals(List.of(
                "universe filter column 'momentum' is not a label column of panel 'acme'; label columns are: sector",
                "universe segment column 'country' is not a label column of panel 'acme'; label columns are: sector"),
                problems);
    }

    @Test
    void marketCapNeeds() {
        PanelSchema noCap = new PanelSchema(Map.of("bm", ColumnType.NUMBER), false);
        assertEquals(List.of("market_cap is needed for cap weighting, but panel 'acme' has no market_cap column"),
                DefinitionValidator.validate(sort().weighting(Weighting.CAP).build(), noCap));
        assertEquals(List.of("market_cap is needed for method market, but panel 'acme' has no market_cap column"),
                DefinitionValidator.validate(FactorDefinition.builder(Method.MARKET).panel("acme").build(), noCap));
    }

    @Test
    void externalNeedsNoPanelAndTakesNoConstructionFields() {
        FactorDefinition external = FactorDefinition.builder(Method.EXTERNAL).theme("value").build();
        assertEquals(List.of(), DefinitionValidator.validate(external, null));
        assertEquals(List.of("'panel' does not apply to method external (its returns are uploaded, not built)"),
                DefinitionValidator.validate(FactorDefinition.builder(Method.EXTERNAL).panel("acme").build(), ACME));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> DefinitionValidator.requireBuildable(external));
        assertTrue(e.getMessage().contains("uploaded, not built"));
    }

    @Test
    void missingMethodAndSignal() {
        assertEquals(List.of("method is required: one of sort, size_sort, market, rank_weighted, external"),
                DefinitionValidator.validate(FactorDefinition.builder(null).build(), ACME));
        assertEquals(List.of("signal is required for method size_sort: name a numeric column of the panel"),
                DefinitionValidator.validate(FactorDefinition.builder(Method.SIZE_SORT).panel("acme").build(), ACME));
    }

    @Test
    void defaultsDependOnMethod() {
        assertEquals(Weighting.EQUAL, sort().build().effectiveWeighting());
        assertEquals(Weighting.CAP, FactorDefinition.builder(Method.SIZE_SORT).build().effectiveWeighting());
        assertEquals(Weighting.CAP, FactorDefinition.builder(Method.MARKET).build().effectiveWeighting());
        assertEquals(5, sort().build().effectiveBuckets());
        assertEquals(1, sort().build().effectiveLag());
        assertEquals(sort().build().constructionKey(), sort().buckets(5).lag(1).theme("other text").build().constructionKey());
    }
}
