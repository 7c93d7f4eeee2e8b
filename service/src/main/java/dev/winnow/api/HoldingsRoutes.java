package dev.winnow.api;

import dev.winnow.research.FactorHoldings;
import dev.winnow.research.FactorHoldings.Position;
import dev.winnow.research.FactorHoldings.View;
import dev.winnow.store.FactorStore;
import io.javalin.http.Context;

import java.util.List;

/** {@code GET /v1/factors/{factor}/holdings}: what a factor holds at a date. */
final class HoldingsRoutes {
    private final FactorStore factors;
    private final FactorHoldings holdings;

    HoldingsRoutes(FactorStore factors, FactorHoldings holdings) {
        this.factors = factors;
        this.holdings = holdings;
    }

    void get(Context ctx) {
        boolean csv = Responses.wantsCsv(ctx);
        View view = holdings.at(FactorLookup.version(ctx, factors, ctx.pathParam("factor")), Requests.dateParam(ctx, "date"));
        if (!csv) {
            Json.respond(ctx, view);
            return;
        }
        StringBuilder sb = new StringBuilder("leg,security,weight,drifted_weight\n");
        append(sb, "long", view.legs().longLeg());
        append(sb, "short", view.legs().shortLeg());
        Responses.csv(ctx, sb.toString());
    }

    private static void append(StringBuilder sb, String leg, List<Position> positions) {
        for (Position p : positions) {
            sb.append(leg).append(',').append(Responses.csvText(p.security())).append(',')
                    .append(Responses.csvNumber(p.weight())).append(',').append(Responses.csvNumber(p.driftedWeight())).append('\n');
        }
    }
}
