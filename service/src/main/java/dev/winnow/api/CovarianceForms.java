package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.research.CovarianceSettings;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.Set;

/** {@link CovarianceSettings} as the query of {@code GET /v1/covariance} and the {@code covariance} object of a risk request give them. */
final class CovarianceForms {
    private CovarianceForms() {
    }

    static CovarianceSettings ofQuery(Context ctx) {
        Double halfLife = Requests.doubleParam(ctx, "half_life");
        checkHalfLife(halfLife, "Query parameter 'half_life'");
        Integer lags = Requests.intParam(ctx, "nw_lags", 0, CovarianceSettings.MAX_LAGS);
        return new CovarianceSettings(Requests.dateParam(ctx, "to"), Requests.intParam(ctx, "window", 2, CovarianceSettings.MAX_WINDOW),
                halfLife, lags == null ? 0 : lags);
    }

    /** The {@code covariance} object of a risk request ({@code to} is the request's date); null means defaults. */
    static CovarianceSettings ofBody(JsonNode node, LocalDate to) {
        if (node == null || node.isNull()) {
            return CovarianceSettings.defaults(to);
        }
        if (!node.isObject()) {
            throw ApiProblem.badRequest("Field 'covariance' must be an object {\"window\", \"half_life\", \"nw_lags\"}.");
        }
        Requests.allowOnly(node, Set.of("window", "half_life", "nw_lags"));
        Double halfLife = null;
        JsonNode h = node.get("half_life");
        if (h != null && !h.isNull()) {
            if (!h.isNumber()) {
                throw ApiProblem.badRequest("Field 'covariance.half_life' must be a positive number of periods, got " + h + ".");
            }
            halfLife = h.asDouble();
            checkHalfLife(halfLife, "Field 'covariance.half_life'");
        }
        Integer lags = Requests.intField(node, "nw_lags", 0, CovarianceSettings.MAX_LAGS);
        return new CovarianceSettings(to, Requests.intField(node, "window", 2, CovarianceSettings.MAX_WINDOW), halfLife,
                lags == null ? 0 : lags);
    }

    /** The problem names the parameter as the client wrote it (the record's own check cannot). */
    private static void checkHalfLife(Double halfLife, String what) {
        if (halfLife != null && !(halfLife > 0 && Double.isFinite(halfLife))) {
            throw ApiProblem.badRequest(what + " must be a positive number of periods, got " + halfLife + ".");
        }
    }
}
