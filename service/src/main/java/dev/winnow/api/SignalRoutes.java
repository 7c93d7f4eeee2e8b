package dev.winnow.api;

import dev.winnow.research.SignalPreview;
import dev.winnow.research.SignalPreview.SecurityValue;
import dev.winnow.research.SignalPreview.Values;
import io.javalin.http.Context;

/** {@code GET /v1/panels/{panel}/signals}: what a signal computes at one date. */
final class SignalRoutes {
    private final SignalPreview preview;

    SignalRoutes(SignalPreview preview) {
        this.preview = preview;
    }

    void values(Context ctx) throws SignalPreview.InvalidSignalException, SignalPreview.PanelNotFoundException {
        String panel = Names.check("Panel", ctx.pathParam("panel"));
        boolean csv = Responses.wantsCsv(ctx);
        Values values = preview.evaluate(panel, ctx.queryParam("signal"), Requests.dateParam(ctx, "date"));
        if (csv) {
            StringBuilder sb = new StringBuilder("security,value\n");
            for (SecurityValue v : values.securities()) {
                sb.append(Responses.csvText(v.security())).append(',')
                        .append(v.value() == null ? "" : Responses.csvNumber(v.value())).append('\n');
            }
            Responses.csv(ctx, sb.toString());
            return;
        }
        Json.respond(ctx, values);
    }
}
