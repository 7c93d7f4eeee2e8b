package dev.winnow.api;

import dev.winnow.research.Families;
import io.javalin.http.Context;

import java.util.LinkedHashMap;
import java.util.Map;

/** Variant families: declare, read, list, delete. */
final class FamilyRoutes {
    private final Families families;

    FamilyRoutes(Families families) {
        this.families = families;
    }

    void declare(Context ctx) throws Families.InvalidFamilyException {
        String name = Names.check("Family", ctx.pathParam("family"));
        Families.Declared declared = families.declare(name, Json.readObject(ctx));
        Map<String, Object> body = new LinkedHashMap<>();
        body.put("family", declared.family());
        body.put("variants", declared.variants());
        body.put("new_versions", declared.newVersions());
        body.put("job", declared.job() == null ? null : String.valueOf(declared.job()));
        if (declared.job() == null) {
            Json.respond(ctx, 200, body);
            return;
        }
        ctx.header("Location", "/v1/jobs/" + declared.job());
        Json.respond(ctx, 202, body);
    }

    void get(Context ctx) {
        Json.respond(ctx, families.get(ctx.pathParam("family")));
    }

    void list(Context ctx) {
        Json.respond(ctx, Map.of("families", families.list()));
    }

    void delete(Context ctx) {
        families.delete(ctx.pathParam("family"));
        ctx.status(204);
    }
}
