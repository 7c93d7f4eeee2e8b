package dev.winnow.app.seed;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Iterator;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * seed-data/factors.json uses only the definition fields and values the demo relies on, names columns the demo panel
 * really has and external series that are really committed, and gives every factor a theme and a rationale.
 */
class DemoScenarioFactorsFileTest {

    private static final Set<String> FIELDS = Set.of("panel", "method", "signal", "direction", "buckets", "weighting",
            "lag", "rebalance", "rebalance_month", "output", "risk_free", "cost_bps", "theme", "rationale", "found_on", "role");
    private static final Set<String> METHODS = Set.of("sort", "size_sort", "market", "external");

    @Test
    void everyDefinitionIsConsistentWithTheCommittedData() throws IOException {
        Path seedData = SeedDataFolder.locate();
        JsonNode factors = new ObjectMapper().readTree(seedData.resolve("factors.json").toFile());
        assertTrue(factors.isArray() && factors.size() >= 15, "expected an array of at least 15 factors");
        Set<String> names = new HashSet<>();
        int valueVariants = 0;
        Set<String> inputs = new HashSet<>();
        for (JsonNode factor : factors) {
            String name = factor.path("name").asText();
            assertTrue(names.add(name), "duplicate or missing name: " + name);
            JsonNode definition = factor.path("definition");
            for (Iterator<String> it = definition.fieldNames(); it.hasNext(); ) {
                String field = it.next();
                assertTrue(FIELDS.contains(field), name + " uses unknown field " + field);
            }
            String method = definition.path("method").asText();
            assertTrue(METHODS.contains(method), name + " has method " + method);
            assertFalse(definition.path("theme").asText().isBlank(), name + " needs a theme");
            assertFalse(definition.path("rationale").asText().isBlank(), name + " needs a rationale");
            if (method.equals("external")) {
                assertTrue(Files.isRegularFile(seedData.resolve(factor.path("series_file").asText())), name);
            } else {
                assertEquals("demo-market", definition.path("panel").asText(), name);
            }
            if (method.equals("sort") || method.equals("size_sort")) {
                assertTrue(PanelLayout.CHARACTERISTICS.contains(definition.path("signal").asText()), name);
            }
            if (definition.has("risk_free")) {
                assertTrue(Files.isRegularFile(seedData.resolve(definition.path("risk_free").asText() + ".csv")), name);
            }
            if (definition.path("signal").asText().startsWith("noise_")) {
                assertEquals("noise-check", definition.path("theme").asText(), name);
            }
            if (definition.path("theme").asText().equals("value")) {
                valueVariants++;
            }
            if (definition.path("role").asText().equals("input")) {
                inputs.add(name);
            }
        }
        // the risk-free rate and the inflation surprise are what premia are measured against or regressed on
        assertEquals(Set.of("inflation", "risk_free"), inputs);
        assertTrue(names.containsAll(List.of("market", "size", "value", "momentum", "quality", "investment",
                "term", "credit", "inflation", "risk_free")), names.toString());
        assertTrue(valueVariants >= 3, "value and at least two variants share the theme value");
    }
}
