package dev.winnow.construct;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import dev.winnow.stats.ReturnSeries;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The committed fixtures of service/src/test/scripts/signal_fixtures.py (an independent pandas/numpy/scipy
 * implementation of the recipe rules): the factor series {@code f}, the recipes with their canonical forms, their
 * values, and factor definitions on recipes with their series.
 */
final class SignalFixtures {
    static final ObjectMapper MAPPER = new ObjectMapper();
    private static final String DIR = "/fixtures/";

    private SignalFixtures() {
    }

    static ReturnSeries factor() {
        List<String[]> rows = PanelCsv.readRows(DIR + "signal_factor.csv");
        LocalDate[] dates = new LocalDate[rows.size() - 1];
        double[] values = new double[rows.size() - 1];
        for (int i = 1; i < rows.size(); i++) {
            dates[i - 1] = LocalDate.parse(rows.get(i)[0]);
            values[i - 1] = Double.parseDouble(rows.get(i)[1]);
        }
        return new ReturnSeries(dates, values);
    }

    static Map<String, ReturnSeries> factors() {
        return Map.of("f", factor());
    }

    static JsonNode json(String name) {
        try (InputStream in = SignalFixtures.class.getResourceAsStream(DIR + name)) {
            return MAPPER.readTree(in);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** id -> the fixture object {id, signal, canonical}. */
    static Map<String, JsonNode> recipes() {
        Map<String, JsonNode> out = new LinkedHashMap<>();
        for (JsonNode r : json("signal_recipes.json")) {
            out.put(r.get("id").asText(), r);
        }
        return out;
    }

    /** id -> definition read through the wire format. */
    static Map<String, FactorDefinition> definitions() {
        Map<String, FactorDefinition> out = new LinkedHashMap<>();
        for (JsonNode d : json("signal_definitions.json")) {
            DefinitionJson.Parsed parsed = DefinitionJson.read(d.get("definition"));
            if (!parsed.ok()) {
                throw new IllegalStateException(d.get("id") + ": " + parsed.problems());
            }
            out.put(d.get("id").asText(), parsed.definition());
        }
        return out;
    }

    /** id -> expected rows (the construction_expected.csv layout). */
    static Map<String, List<String[]>> expectedSeries() {
        Map<String, List<String[]>> out = new LinkedHashMap<>();
        List<String[]> rows = PanelCsv.readRows(DIR + "signal_expected.csv");
        for (String[] row : rows.subList(1, rows.size())) {
            out.computeIfAbsent(row[0], k -> new ArrayList<>()).add(row);
        }
        return out;
    }

    /** id -> date -> security id -> expected value text (empty = missing). */
    static Map<String, Map<LocalDate, Map<Integer, String>>> expectedValues() {
        Map<String, Map<LocalDate, Map<Integer, String>>> out = new LinkedHashMap<>();
        List<String[]> rows = PanelCsv.readRows(DIR + "signal_values.csv");
        for (String[] row : rows.subList(1, rows.size())) {
            out.computeIfAbsent(row[0], k -> new LinkedHashMap<>())
                    .computeIfAbsent(LocalDate.parse(row[1]), k -> new LinkedHashMap<>())
                    .put(Integer.parseInt(row[2]), row.length > 3 ? row[3] : "");
        }
        return out;
    }
}
