package dev.winnow.api;

import dev.winnow.research.LoadingsService;
import dev.winnow.research.LoadingsService.Characteristic;
import dev.winnow.research.LoadingsService.Table;
import dev.winnow.research.LoadingsSettings;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

/**
 * Security loadings for the risk system: regression loadings of securities on factor returns (served from the store
 * when the panel's loadings config matches and the date is stored, else computed on the fly), characteristic
 * exposures, portfolio exposures, the per-panel loadings config and its history job.
 */
public final class LoadingsRoutes {
    static final String SOURCE_HEADER = "Winnow-Loadings-Source";

    private final PanelStore panels;
    private final LoadingsService service;

    public LoadingsRoutes(PanelStore panels, LoadingsService service) {
        this.panels = panels;
        this.service = service;
    }

    /** {@code GET /v1/loadings}: regression loadings (default) or, with kind=characteristic, characteristic exposures. */
    public void get(Context ctx) {
        LoadingsRequest request = LoadingsRequest.of(ctx, panels);
        if (request.characteristic()) {
            Characteristic answer = service.characteristic(request.panel(), request.date(), request.columns());
            if (request.csv()) {
                Responses.csv(ctx, LoadingsCsv.characteristic(answer));
            } else {
                Json.respond(ctx, LoadingsJson.characteristic(answer));
            }
            return;
        }
        Table answer = service.table(request.panel(), request.date(), request.regression(), source -> ctx.header(SOURCE_HEADER, source));
        if (request.csv()) {
            Responses.csv(ctx, LoadingsCsv.table(answer));
        } else {
            Responses.json(ctx, LoadingsJson.table(answer));
        }
    }

    /** {@code GET /v1/loadings/{security}}: one security's loadings at every grid date in range where it has a row. */
    public void securityHistory(Context ctx) {
        SecurityHistoryRequest request = SecurityHistoryRequest.of(ctx, panels);
        Json.respond(ctx, LoadingsJson.history(service.history(request.panel(), request.security(), request.from(), request.to(),
                request.regression())));
    }

    /** {@code POST /v1/exposures}: a portfolio's exposures to the factors from its holdings' loadings. */
    public void exposures(Context ctx) {
        ExposuresRequest request = ExposuresRequest.of(ctx, panels);
        Json.respond(ctx, LoadingsJson.exposures(service.exposures(request.panel(), request.date(), request.securities(),
                request.weights(), request.regression(), source -> ctx.header(SOURCE_HEADER, source))));
    }

    /** {@code PUT /v1/panels/{panel}/loadings-config}: sets the panel's default factor set (write scope). */
    public void putConfig(Context ctx) {
        PanelRecord panel = PanelLookup.visible(panels, ctx.pathParam("panel"));
        LoadingsSettings settings = LoadingsSettingsForms.ofConfig(Json.readObject(ctx));
        Json.respond(ctx, LoadingsJson.config(panel, service.saveConfig(panel, settings)));
    }

    /** {@code GET /v1/panels/{panel}/loadings-config}. */
    public void getConfig(Context ctx) {
        PanelRecord panel = PanelLookup.visible(panels, ctx.pathParam("panel"));
        Json.respond(ctx, LoadingsJson.config(panel, service.config(panel)));
    }

    /** {@code POST /v1/panels/{panel}/loadings-config/history}: 202 with the job computing every date's loadings. */
    public void history(Context ctx) {
        PanelRecord panel = PanelLookup.visible(panels, ctx.pathParam("panel"));
        Accepted.job(ctx, service.startHistory(panel));
    }
}
