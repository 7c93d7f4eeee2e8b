package dev.winnow.research;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.TextNode;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.PanelSchema;
import dev.winnow.construct.Recipe;
import dev.winnow.construct.RecipeJson;
import dev.winnow.construct.SignalEvaluator;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import dev.winnow.store.StorePanelSource;

import java.io.IOException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * What a signal (a column or a recipe) computes on a panel at one grid date, so that an analyst can look before
 * building on it: {@code GET /v1/panels/{panel}/signals}.
 */
public final class SignalPreview {
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private final PanelStore panels;
    private final FactorStore factors;

    public SignalPreview(PanelStore panels, FactorStore factors) {
        this.panels = panels;
        this.factors = factors;
    }

    /** One security's value; null where the signal is missing. */
    public record SecurityValue(String security, Double value) {
    }

    /** The answer: the panel, the grid date, the canonical recipe and the values of the securities with a row there. */
    public record Values(String panel, LocalDate date, JsonNode signal, List<SecurityValue> securities) {
    }

    /** The signal cannot be evaluated as given; every problem is listed. */
    public static final class InvalidSignalException extends Exception {
        private final List<String> problems;

        public InvalidSignalException(List<String> problems) {
            super(String.join("; ", problems));
            this.problems = List.copyOf(problems);
        }

        public List<String> problems() {
            return problems;
        }
    }

    /** No visible panel of that name. */
    public static final class PanelNotFoundException extends Exception {
        public PanelNotFoundException(String panel) {
            super("No panel '" + panel + "'");
        }
    }

    /**
     * @param signalText a column name, or a recipe as JSON text (starting with '{')
     * @param date       a grid date of the panel, or null for its last date
     */
    public Values evaluate(String panelName, String signalText, LocalDate date) throws InvalidSignalException, PanelNotFoundException {
        PanelRecord panel = panels.find(panelName).filter(PanelRecord::visible)
                .orElseThrow(() -> new PanelNotFoundException(panelName));
        if (signalText == null || signalText.isBlank()) {
            throw new InvalidSignalException(List.of("signal: query parameter 'signal' is required: a column name or a recipe"
                    + " as URL-encoded JSON"));
        }
        JsonNode node;
        String text = signalText.trim();
        if (text.startsWith("{")) {
            try {
                node = MAPPER.readTree(text);
            } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
                throw new InvalidSignalException(List.of("signal: not valid JSON (" + e.getOriginalMessage() + ")"));
            } catch (IOException e) {
                throw new InvalidSignalException(List.of("signal: not valid JSON"));
            }
        } else {
            node = TextNode.valueOf(text);
        }
        List<String> problems = new ArrayList<>();
        Recipe recipe = RecipeJson.read(node, "signal", problems);
        if (recipe != null) {
            PanelSchema schema = FactorDefinitions.schemaOf(panels.columns(panel.id()));
            RecipeJson.check(recipe, schema, panelName, "signal", problems);
        }
        Map<String, ReturnSeries> series = new LinkedHashMap<>();
        if (recipe != null) {
            for (String f : recipe.factors()) {
                FactorVersionRecord v = factors.current(f).orElse(null);
                if (v == null) {
                    problems.add("signal: no factor '" + f + "' (trailing_beta against); define it first");
                } else {
                    series.put(f, factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD));
                }
            }
        }
        StorePanelSource source = panels.source(panel.id());
        List<LocalDate> grid = source.dates();
        int k = grid.size() - 1;
        if (date != null) {
            k = Collections.binarySearch(grid, date);
            if (k < 0) {
                problems.add("date: " + date + " is not a date of panel '" + panelName + "' (its dates run from "
                        + grid.get(0) + " to " + grid.get(grid.size() - 1) + ")");
            }
        }
        if (!problems.isEmpty()) {
            throw new InvalidSignalException(problems);
        }
        double[] values = SignalEvaluator.evaluate(recipe, source, series, k);
        CrossSection rows = source.crossSection(k);
        Map<Integer, String> codes = panels.securityCodes(panel.id());
        List<SecurityValue> out = new ArrayList<>(rows.size());
        for (int i = 0; i < rows.size(); i++) {
            out.add(new SecurityValue(codes.get(rows.securityIds()[i]), Double.isFinite(values[i]) ? values[i] : null));
        }
        out.sort(java.util.Comparator.comparing(SecurityValue::security));
        return new Values(panelName, grid.get(k), RecipeJson.toJson(recipe), out);
    }
}
