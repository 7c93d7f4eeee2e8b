package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.Set;

/**
 * How a factor covariance is estimated: the sample's last date ({@code to}, null for the last common date), its
 * length ({@code window}, null for every common date), the half-life of exponential weights (null for equal
 * weights) and the Newey-West lags.
 */
record CovarianceSettings(LocalDate to, Integer window, Double halfLife, int nwLags) {
    static final int MAX_LAGS = 1000;

    static CovarianceSettings ofQuery(Context ctx) {
        Double halfLife = Requests.doubleParam(ctx, "half_life");
        Integer lags = Requests.intParam(ctx, "nw_lags", 0, MAX_LAGS);
        return new CovarianceSettings(Requests.dateParam(ctx, "to"), Requests.intParam(ctx, "window", 2, 1_000_000),
                checkedHalfLife(halfLife, "Query parameter 'half_life'"), lags == null ? 0 : lags);
    }

    /** The {@code covariance} object of a risk request ({@code to} is the request's date); null means defaults. */
    static CovarianceSettings ofBody(JsonNode node, LocalDate to) {
        if (node == null || node.isNull()) {
            return new CovarianceSettings(to, null, null, 0);
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
            halfLife = checkedHalfLife(h.asDouble(), "Field 'covariance.half_life'");
        }
        Integer lags = Requests.intField(node, "nw_lags", 0, MAX_LAGS);
        return new CovarianceSettings(to, Requests.intField(node, "window", 2, 1_000_000), halfLife, lags == null ? 0 : lags);
    }

    private static Double checkedHalfLife(Double halfLife, String what) {
        if (halfLife != null && !(halfLife > 0 && Double.isFinite(halfLife))) {
            throw ApiProblem.badRequest(what + " must be a positive number of periods, got " + halfLife + ".");
        }
        return halfLife;
    }
}
