package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.research.PortfolioRiskStudy;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * {@code POST /v1/risk}: the panel, the as-of date (the panel's last date unless given), the holdings and an
 * optional benchmark, the loadings settings (as {@code /v1/exposures}) and the covariance settings. The active
 * weights are holdings minus benchmark, security by security, a security in one list only counting 0 in the other;
 * {@code securities} lists them holdings first, then benchmark-only securities, each in request order.
 */
final class RiskRequest {
    private RiskRequest() {
    }

    static PortfolioRiskStudy.Query of(Context ctx, PanelStore panels) {
        JsonNode body = Json.readObject(ctx);
        Requests.allowOnly(body, Set.of("panel", "date", "factors", "holdings", "benchmark", "window", "min_obs", "covariance"));
        PanelRecord panel = PanelLookup.visible(panels, Requests.requiredText(body, "panel"));
        LocalDate given = Requests.dateField(body, "date");
        LocalDate date = given != null ? given : panel.lastDate();
        ExposuresRequest.Holdings holdings = ExposuresRequest.Holdings.of(body, "holdings", true);
        ExposuresRequest.Holdings benchmark = ExposuresRequest.Holdings.of(body, "benchmark", false);
        Map<String, Double> active = new LinkedHashMap<>();
        for (int i = 0; i < holdings.securities().size(); i++) {
            active.put(holdings.securities().get(i), holdings.weights()[i]);
        }
        for (int i = 0; i < benchmark.securities().size(); i++) {
            active.merge(benchmark.securities().get(i), -benchmark.weights()[i], Double::sum);
        }
        List<String> securities = new ArrayList<>(active.keySet());
        double[] weights = new double[securities.size()];
        for (int i = 0; i < weights.length; i++) {
            weights[i] = active.get(securities.get(i));
        }
        return new PortfolioRiskStudy.Query(panel, date, securities, weights, LoadingsSettingsForms.ofBody(body),
                CovarianceForms.ofBody(body.get("covariance"), date));
    }
}
