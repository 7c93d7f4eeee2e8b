package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.research.LoadingsSettings;
import io.javalin.http.Context;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;

import static dev.winnow.research.LoadingsSettings.MAX_WINDOW;

/** {@link LoadingsSettings} read from query parameters or a JSON body. */
final class LoadingsSettingsForms {
    private LoadingsSettingsForms() {
    }

    /** From the query parameters {@code factors} (comma-separated), {@code window} and {@code min_obs}. */
    static LoadingsSettings ofQuery(Context ctx) {
        return new LoadingsSettings(Requests.listParam(ctx, "factors"),
                Requests.intParam(ctx, "window", 1, MAX_WINDOW), Requests.intParam(ctx, "min_obs", 1, MAX_WINDOW));
    }

    /** From the body fields {@code factors} (an array of names), {@code window} and {@code min_obs}. */
    static LoadingsSettings ofBody(JsonNode body) {
        return new LoadingsSettings(factorNames(body), window(body), minObs(body));
    }

    /** The body of {@code PUT /v1/panels/{panel}/loadings-config}: these three fields only, factors required. */
    static LoadingsSettings ofConfig(JsonNode body) {
        Requests.allowOnly(body, Set.of("factors", "window", "min_obs"));
        List<String> names = factorNames(body);
        if (names == null) {
            throw ApiProblem.badRequest("Field 'factors' is required: an array of factor names, in regression order.");
        }
        return new LoadingsSettings(names, window(body), minObs(body));
    }

    private static Integer window(JsonNode body) {
        return Requests.intField(body, "window", 1, MAX_WINDOW);
    }

    private static Integer minObs(JsonNode body) {
        return Requests.intField(body, "min_obs", 1, MAX_WINDOW);
    }

    private static List<String> factorNames(JsonNode body) {
        JsonNode node = body.get("factors");
        if (node == null || node.isNull()) {
            return null;
        }
        if (!node.isArray()) {
            throw ApiProblem.badRequest("Field 'factors' must be an array of factor names.");
        }
        List<String> names = new ArrayList<>();
        for (JsonNode n : node) {
            if (!n.isTextual() || n.asText().isBlank()) {
                throw ApiProblem.badRequest("Field 'factors' must hold factor names (non-empty strings), got " + n + ".");
            }
            names.add(n.asText());
        }
        return names;
    }
}
