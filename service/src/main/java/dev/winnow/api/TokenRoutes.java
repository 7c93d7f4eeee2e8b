package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.research.ConflictException;
import dev.winnow.store.TokenStore;
import io.javalin.http.Context;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;

/** POST, GET and DELETE of API tokens (admin scope). */
final class TokenRoutes {
    private static final Pattern NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,99}");

    private final TokenStore tokens;
    private final Authenticator authenticator;

    TokenRoutes(TokenStore tokens, Authenticator authenticator) {
        this.tokens = tokens;
        this.authenticator = authenticator;
    }

    void create(Context ctx) {
        JsonNode body = Json.readObject(ctx);
        Requests.allowOnly(body, Set.of("name", "scope"));
        String name = Requests.requiredText(body, "name");
        if (!NAME.matcher(name).matches()) {
            throw ApiProblem.badRequest("Token name '" + name + "' must be 1-100 characters of letters, digits, '.', '_' or '-', starting with a letter or digit.");
        }
        String scopeText = Requests.requiredText(body, "scope");
        Scope scope = Scope.fromWireName(scopeText);
        if (scope == null) {
            throw ApiProblem.badRequest("Scope '" + scopeText + "' is unknown; use read, write or admin.");
        }
        String token = Authenticator.newToken();
        if (!tokens.insert(name, scope.wireName(), Authenticator.hash(token))) {
            throw new ConflictException("A token named '" + name + "' exists; revoke it first or choose another name.");
        }
        authenticator.refresh();
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("name", name);
        out.put("scope", scope.wireName());
        out.put("token", token);
        out.put("note", "Store this token now: it is shown only once.");
        Json.respond(ctx, 201, out);
    }

    void list(Context ctx) {
        List<Map<String, Object>> out = tokens.all().stream().map(t -> {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("name", t.name());
            m.put("scope", t.scope());
            m.put("created_at", t.createdAt());
            return m;
        }).toList();
        Json.respond(ctx, Map.of("tokens", out));
    }

    void revoke(Context ctx) {
        String name = ctx.pathParam("name");
        if (!tokens.delete(name)) {
            throw ApiProblem.notFound("No token named '" + name + "'; GET /v1/tokens lists them.");
        }
        authenticator.refresh();
        ctx.status(204);
    }
}
