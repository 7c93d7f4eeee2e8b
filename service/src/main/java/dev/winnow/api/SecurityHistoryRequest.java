package dev.winnow.api;

import dev.winnow.research.LoadingsSettings;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.time.LocalDate;

/** {@code GET /v1/loadings/{security}}: the panel, the security's code, an optional date range and the regression settings. */
record SecurityHistoryRequest(PanelRecord panel, String security, LocalDate from, LocalDate to, LoadingsSettings regression) {

    static SecurityHistoryRequest of(Context ctx, PanelStore panels) {
        PanelRecord panel = PanelLookup.fromQuery(ctx, panels);
        String security = ctx.pathParam("security");
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        return new SecurityHistoryRequest(panel, security, from, to, LoadingsSettingsForms.ofQuery(ctx));
    }
}
