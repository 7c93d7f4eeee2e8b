package dev.winnow.api;

import dev.winnow.research.LoadingsSettings;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * {@code GET /v1/loadings}: the panel, the as-of date (the panel's last date unless given), CSV or JSON, and either
 * regression settings ({@code kind=regression}, the default) or characteristic columns ({@code kind=characteristic});
 * the other of the two is null.
 */
record LoadingsRequest(PanelRecord panel, LocalDate date, boolean csv, LoadingsSettings regression, List<String> columns) {

    static LoadingsRequest of(Context ctx, PanelStore panels) {
        PanelRecord panel = PanelLookup.fromQuery(ctx, panels);
        String kind = Requests.choiceParam(ctx, "kind", List.of("regression", "characteristic"), "regression");
        LocalDate date = Requests.dateParam(ctx, "date");
        LocalDate asOf = date != null ? date : panel.lastDate();
        boolean csv = Responses.wantsCsv(ctx);
        if (kind.equals("characteristic")) {
            Requests.rejectParams(ctx, "kind=characteristic", "factors", "window", "min_obs");
            return new LoadingsRequest(panel, asOf, csv, null, columns(ctx, panel, panels));
        }
        Requests.rejectParams(ctx, "regression loadings", "columns");
        return new LoadingsRequest(panel, asOf, csv, LoadingsSettingsForms.ofQuery(ctx), null);
    }

    boolean characteristic() {
        return columns != null;
    }

    /** The required {@code columns}: numeric columns of the panel, each once. */
    private static List<String> columns(Context ctx, PanelRecord panel, PanelStore panels) {
        List<String> columns = Requests.listParam(ctx, "columns");
        if (columns == null || columns.isEmpty()) {
            throw ApiProblem.badRequest("Query parameter 'columns' is required with kind=characteristic: numeric columns, comma-separated.");
        }
        Map<String, String> types = new LinkedHashMap<>();
        types.put("return", "number");
        types.put("market_cap", "number");
        types.putAll(panels.columns(panel.id()));
        Set<String> seen = new HashSet<>();
        for (String c : columns) {
            String type = types.get(c);
            if (type == null) {
                throw ApiProblem.badRequest("Panel '" + panel.name() + "' has no column '" + c + "'; its numeric columns are "
                        + numericColumns(types) + ".");
            }
            if (!type.equals("number")) {
                throw ApiProblem.badRequest("Column '" + c + "' holds labels; exposures need numeric columns: " + numericColumns(types) + ".");
            }
            if (!seen.add(c)) {
                throw ApiProblem.badRequest("Column '" + c + "' is listed twice.");
            }
        }
        return columns;
    }

    private static List<String> numericColumns(Map<String, String> types) {
        return types.entrySet().stream().filter(e -> e.getValue().equals("number")).map(Map.Entry::getKey).toList();
    }
}
