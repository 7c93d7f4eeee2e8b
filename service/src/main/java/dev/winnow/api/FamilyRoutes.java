package dev.winnow.api;

import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.research.Families;
import io.javalin.http.Context;


/** Variant families: declare, read, list, delete. */
final class FamilyRoutes {
    private final Families families;

    FamilyRoutes(Families families) {
        this.families = families;
    }

    void declare(Context ctx) throws Families.InvalidFamilyException {
        String name = Names.check("Family", ctx.pathParam("family"));
        Families.Declared declared = families.declare(name, Json.readObject(ctx));
        DeclaredView body = new DeclaredView(declared.family(), declared.variants(), declared.newVersions(),
                declared.job() == null ? null : String.valueOf(declared.job()));
        if (declared.job() == null) {
            Json.respond(ctx, 200, body);
            return;
        }
        ctx.header("Location", "/v1/jobs/" + declared.job());
        Json.respond(ctx, 202, body);
    }

    /** A declared family: its variants, how many new versions it recorded, and their build job (null when none). */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record DeclaredView(String family, int variants, int newVersions, String job) {
    }

    void get(Context ctx) {
        Json.respond(ctx, families.get(ctx.pathParam("family")));
    }

    void list(Context ctx) {
        Json.respond(ctx, new FamilyList(families.list()));
    }

    record FamilyList(java.util.List<Families.Listed> families) {
    }

    void delete(Context ctx) {
        families.delete(ctx.pathParam("family"));
        ctx.status(204);
    }
}
