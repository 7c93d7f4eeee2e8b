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
        PanelRecord panel = PanelLookup.visible(panels, Requests.requiredText(body, "panel"));
        LocalDate date = Requests.dateField(body, "date");
        JsonNode holdings = body.get("holdings");
        if (holdings == null || !holdings.isArray() || holdings.isEmpty()) {
            throw ApiProblem.badRequest("Field 'holdings' must be a non-empty array of {\"security\": code, \"weight\": number}.");
        }
        List<String> securities = new ArrayList<>();
        double[] weights = new double[holdings.size()];
        Set<String> seen = new HashSet<>();
        for (int h = 0; h < holdings.size(); h++) {
            JsonNode holding = holdings.get(h);
            String where = "holdings[" + h + "]";
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
                throw ApiProblem.badRequest("Security '" + code + "' is held twice; give each security one holding.");
            }
            securities.add(code);
            weights[h] = weight.asDouble();
        }
        return new ExposuresRequest(panel, date != null ? date : panel.lastDate(), securities, weights, LoadingsSettingsForms.ofBody(body));
    }
}
