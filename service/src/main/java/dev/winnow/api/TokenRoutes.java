package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.research.ConflictException;
import dev.winnow.store.TokenStore;
import io.javalin.http.Context;

import java.util.List;
import java.util.Set;
import java.util.regex.Pattern;

/** POST, GET and DELETE of API tokens (admin scope). */
final class TokenRoutes {
    private static final Pattern NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,99}");

    private final TokenStore tokens;

    TokenRoutes(TokenStore tokens) {
        this.tokens = tokens;
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
        Json.respond(ctx, 201, new Created(name, scope.wireName(), token, "Store this token now: it is shown only once."));
    }

    /** A new token: the only answer that shows its secret. */
    record Created(String name, String scope, String token, String note) {
    }

    /** A token in the list: never its secret. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record Listed(String name, String scope, java.time.OffsetDateTime createdAt) {
    }

    record TokenList(List<Listed> tokens) {
    }

    void list(Context ctx) {
        Json.respond(ctx, new TokenList(tokens.all().stream().map(t -> new Listed(t.name(), t.scope(), t.createdAt())).toList()));
    }

    void revoke(Context ctx) {
        String name = ctx.pathParam("name");
        switch (tokens.revoke(name)) {
            case NOT_FOUND -> throw ApiProblem.notFound("No token named '" + name + "'; GET /v1/tokens lists them.");
            case LAST_ADMIN -> throw new ApiProblem(409, "Conflict", "Token '" + name + "' is the last admin token; "
                    + "revoking it would leave no one able to manage tokens. Create another admin token first "
                    + "(POST /v1/tokens with scope admin), then revoke this one.");
            case REVOKED -> {
            }
        }
        ctx.status(204);
    }
}
