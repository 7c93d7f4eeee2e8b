package dev.winnow.construct;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.stats.ReturnSeries;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * Signal recipes against an independent pandas/numpy/scipy implementation of the recipe rules
 * (service/src/test/scripts/signal_fixtures.py): ranks from scipy.stats.rankdata (average method), trailing betas
 * from numpy.polyfit, winsorising from numpy.quantile (linear, Hyndman and Fan type 7), standard deviations from
 * numpy.std(ddof=1). Every operation, nested ones included, at every second grid date of the seeded panel, to 1e-12;
 * the canonical form of each recipe as the script writes it; factors built on recipes to 1e-12; and
 * append-equals-rebuild, bit for bit, at every split point for each recipe factor.
 */
class SignalRecipeFixtureTest {
    private static final double TOLERANCE = 1e-12;

    private static InMemoryPanel panel;
    private static Map<String, ReturnSeries> factors;

    @BeforeAll
    static void load() {
        panel = ConstructionFixtures.panel();
        factors = SignalFixtures.factors();
    }

    private static Recipe parse(JsonNode signal) {
        List<String> problems = new ArrayList<>();
        Recipe recipe = RecipeJson.read(signal, "signal", problems);
        assertEquals(List.of(), problems);
        return recipe;
    }

    @TestFactory
    Stream<DynamicTest> everyRecipeMatchesThePandasImplementation() {
        Map<String, Map<LocalDate, Map<Integer, String>>> expected = SignalFixtures.expectedValues();
        Map<String, JsonNode> recipes = SignalFixtures.recipes();
        assertEquals(32, recipes.size());
        return recipes.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            Recipe recipe = parse(e.getValue().get("signal"));
            assertEquals(e.getValue().get("canonical").toString(), RecipeJson.canonical(recipe), "canonical form");
            assertEquals(RecipeJson.canonical(recipe), RecipeJson.canonical(parse(RecipeJson.toJson(recipe))),
                    "the canonical form reads back to itself");
            SignalEvaluator evaluator = new SignalEvaluator(recipe, factors, 0);
            Map<LocalDate, Map<Integer, String>> want = expected.get(e.getKey());
            assertNotNull(want, "fixture values for " + e.getKey());
            int compared = 0;
            for (int k = 0; k < panel.dates().size(); k++) {
                CrossSection rows = panel.crossSection(k);
                evaluator.offer(k, rows);
                double[] got = evaluator.valueAt(k);
                Map<Integer, String> atDate = want.get(rows.date());
                if (atDate == null) {
                    continue;
                }
                assertEquals(atDate.size(), rows.size(), "rows at " + rows.date());
                for (int i = 0; i < rows.size(); i++) {
                    String cell = atDate.get(rows.securityIds()[i]);
                    String where = e.getKey() + " at " + rows.date() + " security " + rows.securityIds()[i];
                    if (cell.isEmpty()) {
                        assertTrue(Double.isNaN(got[i]), where + ": expected missing, got " + got[i]);
                    } else {
                        assertEquals(Double.parseDouble(cell), got[i], TOLERANCE, where);
                        compared++;
                    }
                }
            }
            assertTrue(compared > 500, "compared only " + compared + " values");
        }));
    }

    @TestFactory
    Stream<DynamicTest> aOneOffEvaluationEqualsTheStreamingOneBitForBit() {
        return SignalFixtures.recipes().entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            Recipe recipe = parse(e.getValue().get("signal"));
            SignalEvaluator evaluator = new SignalEvaluator(recipe, factors, 0);
            for (int k = 0; k < panel.dates().size(); k++) {
                evaluator.offer(k, panel.crossSection(k));
                if (k % 7 == 3 || k == panel.dates().size() - 1) {
                    assertArrayEquals(evaluator.valueAt(k), SignalEvaluator.evaluate(recipe, panel, factors, k), "k=" + k);
                }
            }
        }));
    }

    @TestFactory
    Stream<DynamicTest> factorsOnRecipesMatchThePandasImplementation() {
        Map<String, List<String[]>> expected = SignalFixtures.expectedSeries();
        Map<String, FactorDefinition> definitions = SignalFixtures.definitions();
        assertEquals(14, definitions.size());
        return definitions.entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            assertTrue(DefinitionValidator.validate(def, null).isEmpty(), e.getKey());
            BuildResult result = FactorEngine.build(def, panel, null, factors, null);
            FixtureSeries.assertMatches(expected.get(e.getKey()), result, e.getKey());
        }));
    }

    @TestFactory
    Stream<DynamicTest> recipeFactorsResumeToTheSameBitsAtEverySplit() {
        return SignalFixtures.definitions().entrySet().stream().map(e -> DynamicTest.dynamicTest(e.getKey(), () -> {
            FactorDefinition def = e.getValue();
            BuildResult full = FactorEngine.build(def, panel, null, factors, null);
            int total = panel.dates().size();
            for (int k = 0; k <= total; k++) {
                BuildResult first = FactorEngine.build(def, panel.prefix(k), null, factors, null);
                EngineState state = EngineState.fromBytes(first.endState().toBytes());
                BuildResult rest = FactorEngine.build(def, panel.prefix(total), null, factors, state);
                List<FactorObservation> joined = new ArrayList<>(first.observations());
                joined.addAll(rest.observations());
                List<Formation> formations = new ArrayList<>(first.formations());
                formations.addAll(rest.formations());
                ConstructionFixtureTest.assertBitwiseEqual(full.observations(), joined, e.getKey() + " split at " + k);
                assertEquals(full.formations(), formations, e.getKey() + " formations, split at " + k);
                assertArrayEquals(full.endState().toBytes(), rest.endState().toBytes(), "end state, split at " + k);
            }
            for (int spacing : new int[] {1, 7, 30}) {
                CheckpointedBuild.Result run = CheckpointedBuild.run(def, panel, null, factors, null, 0, 0, spacing,
                        ConstructionFixtures.FORMING);
                ConstructionFixtureTest.assertBitwiseEqual(full.observations(), run.build().observations(),
                        e.getKey() + " checkpointed every " + spacing);
            }
        }));
    }

    @Test
    void theSameRecipeSpelledDifferentlyHasOneConstructionKey() {
        FactorDefinition a = SignalFixtures.definitions().get("sort_momentum_monthly");
        JsonNode spelled = SignalFixtures.json("signal_definitions.json").get(0).get("definition").deepCopy();
        ((com.fasterxml.jackson.databind.node.ObjectNode) spelled).set("signal",
                RecipeJson.toJson(a.signal()));
        FactorDefinition b = DefinitionJson.read(spelled).definition();
        assertEquals(a.constructionKey(), b.constructionKey());
        FactorDefinition column = FactorDefinition.builder(FactorDefinition.Method.SORT).panel("p").signal("bm").build();
        FactorDefinition object = FactorDefinition.builder(FactorDefinition.Method.SORT).panel("p")
                .signal(parse(SignalFixtures.MAPPER.createObjectNode().put("column", "bm"))).build();
        assertEquals(column.constructionKey(), object.constructionKey());
        assertTrue(column.constructionKey().contains("signal=bm;"), "a plain column keys as before recipes");
    }
}
