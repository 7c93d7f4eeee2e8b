package dev.winnow.api;

import dev.winnow.research.InformationCoefficients;
import dev.winnow.stats.Correlations;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * The query of {@code GET /v1/factors/{factor}/ic} ({@code horizons}, {@code method}, {@code min_securities},
 * {@code from}, {@code to}, {@code version}), read in one place so that the IC chart draws exactly what the JSON
 * answer serves for the same parameters.
 */
record IcRequest(InformationCoefficients.Request study, String method) {

    static IcRequest of(Context ctx, FactorStore factors) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        List<Integer> horizons = horizonsParam(ctx);
        String method = Requests.choiceParam(ctx, "method", List.of("spearman", "pearson"), "spearman");
        Integer min = Requests.intParam(ctx, "min_securities", 3, 1_000_000);
        LocalDate from = Requests.dateParam(ctx, "from");
        LocalDate to = Requests.dateParam(ctx, "to");
        Requests.checkRange(from, to);
        Correlations.Method m = method.equals("pearson") ? Correlations.Method.PEARSON : Correlations.Method.SPEARMAN;
        return new IcRequest(new InformationCoefficients.Request(v, horizons, m, min == null ? 10 : min, from, to), method);
    }

    FactorVersionRecord version() {
        return study.version();
    }

    private static List<Integer> horizonsParam(Context ctx) {
        List<String> items = Requests.listParam(ctx, "horizons");
        if (items == null) {
            return List.of(1);
        }
        if (items.isEmpty() || items.size() > InformationCoefficients.MAX_HORIZONS) {
            throw ApiProblem.badRequest("Query parameter 'horizons' lists 1 to " + InformationCoefficients.MAX_HORIZONS
                    + " horizons separated by commas, as horizons=1,3,12; got " + items.size() + ".");
        }
        List<Integer> out = new ArrayList<>();
        for (String item : items) {
            int h;
            try {
                h = Integer.parseInt(item);
            } catch (NumberFormatException e) {
                throw ApiProblem.badRequest("Query parameter 'horizons' must list whole numbers of grid periods from 1 to "
                        + InformationCoefficients.MAX_HORIZON + "; got '" + item + "'.");
            }
            if (h < 1 || h > InformationCoefficients.MAX_HORIZON) {
                throw ApiProblem.badRequest("Each horizon must be from 1 to " + InformationCoefficients.MAX_HORIZON + " grid periods; got " + h + ".");
            }
            if (out.contains(h)) {
                throw ApiProblem.badRequest("Query parameter 'horizons' lists " + h + " twice; list each horizon once.");
            }
            out.add(h);
        }
        return out;
    }
}
