package dev.winnow.api;

import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

/** Finds the panel a request names; a panel whose first upload has not committed yet is not found. */
final class PanelLookup {
    private PanelLookup() {
    }

    /** The panel of the required query parameter {@code panel}; an unknown one is a 400 naming it. */
    static PanelRecord fromQuery(Context ctx, PanelStore panels) {
        String name = ctx.queryParam("panel");
        if (name == null || name.isBlank()) {
            throw ApiProblem.badRequest("Query parameter 'panel' is required; GET /v1/panels lists the panels.");
        }
        return named(panels, name.trim(), "Query parameter 'panel'");
    }

    /** The panel of a request body's required field {@code panel}: unknown is a 400 naming it, as for a query. */
    static PanelRecord fromBody(PanelStore panels, String name) {
        return named(panels, name, "Field 'panel'");
    }

    private static PanelRecord named(PanelStore panels, String name, String where) {
        Names.check("Panel", name);
        return panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.badRequest(where + " names '" + name + "', which is not a panel; GET /v1/panels lists them."));
    }

    /** The panel named in the path; an unknown one is a 404. */
    static PanelRecord visible(PanelStore panels, String name) {
        Names.check("Panel", name);
        return panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.notFound("No panel '" + name + "'; GET /v1/panels lists them."));
    }
}
