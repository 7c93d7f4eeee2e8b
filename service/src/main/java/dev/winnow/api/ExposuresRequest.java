package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.research.LoadingsSettings;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * {@code POST /v1/exposures}: the panel, the as-of date (the panel's last date unless given), the holdings (security
 * codes, each once, with finite weights) and the regression settings.
 */
record ExposuresRequest(PanelRecord panel, LocalDate date, List<String> securities, double[] weights, LoadingsSettings regression) {

    static ExposuresRequest of(Context ctx, PanelStore panels) {
        JsonNode body = Json.readObject(ctx);
        Requests.allowOnly(body, Set.of("panel", "date", "factors", "holdings", "window", "min_obs"));
        PanelRecord panel = PanelLookup.fromBody(panels, Requests.requiredText(body, "panel"));
        LocalDate date = Requests.dateField(body, "date");
        Holdings holdings = Holdings.of(body, "holdings", true);
        return new ExposuresRequest(panel, date != null ? date : panel.lastDate(), holdings.securities(), holdings.weights(),
                LoadingsSettingsForms.ofBody(body));
    }

    /** A list of {@code {"security", "weight"}} objects: codes, each once, with finite weights. */
    record Holdings(List<String> securities, double[] weights) {

        /** The list in {@code field}; absent or null is an empty list unless {@code required}. */
        static Holdings of(JsonNode body, String field, boolean required) {
            JsonNode holdings = body.get(field);
            if ((holdings == null || holdings.isNull()) && !required) {
                return new Holdings(List.of(), new double[0]);
            }
            if (holdings == null || !holdings.isArray() || holdings.isEmpty()) {
                throw ApiProblem.badRequest("Field '" + field + "' must be a non-empty array of {\"security\": code, \"weight\": number}.");
            }
            List<String> securities = new ArrayList<>();
            double[] weights = new double[holdings.size()];
            Set<String> seen = new HashSet<>();
            for (int h = 0; h < holdings.size(); h++) {
                JsonNode holding = holdings.get(h);
                String where = field + "[" + h + "]";
                if (!holding.isObject()) {
                    throw ApiProblem.badRequest(where + " must be an object {\"security\": code, \"weight\": number}.");
                }
                Requests.allowOnly(holding, Set.of("security", "weight"));
                String code = Requests.requiredText(holding, "security");
                JsonNode weight = holding.get("weight");
                if (weight == null || !weight.isNumber() || !Double.isFinite(weight.asDouble())) {
                    throw ApiProblem.badRequest(where + ".weight must be a finite number.");
                }
                if (!seen.add(code)) {
                    throw ApiProblem.badRequest("Security '" + code + "' is listed twice in '" + field + "'; give each security one weight.");
                }
                securities.add(code);
                weights[h] = weight.asDouble();
            }
            return new Holdings(List.copyOf(securities), weights);
        }
    }
}
