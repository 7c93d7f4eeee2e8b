package dev.winnow.api;

import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

/** Finds the panel a request names; a panel whose first upload has not committed yet is not found. */
final class PanelLookup {
    private PanelLookup() {
    }

    /** The panel of the required query parameter {@code panel}. */
    static PanelRecord fromQuery(Context ctx, PanelStore panels) {
        String name = ctx.queryParam("panel");
        if (name == null || name.isBlank()) {
            throw ApiProblem.badRequest("Query parameter 'panel' is required; GET /v1/panels lists the panels.");
        }
        return visible(panels, name.trim());
    }

    static PanelRecord visible(PanelStore panels, String name) {
        Names.check("Panel", name);
        return panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.notFound("No panel '" + name + "'; GET /v1/panels lists them."));
    }
}
