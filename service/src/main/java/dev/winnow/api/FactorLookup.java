package dev.winnow.api;

import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

/** Finds the factor version a request names: {@code ?version=} or the current one, from the in-memory catalog. */
final class FactorLookup {
    private FactorLookup() {
    }

    /**
     * The factor named in the path, at {@code ?version=} or its current version; an unknown factor or version of it
     * answers 404 on every endpoint (the name is part of the resource's path).
     */
    static FactorVersionRecord version(Context ctx, FactorStore factors, String name) {
        Integer version = Requests.intParam(ctx, "version", 1, Integer.MAX_VALUE);
        FactorVersionRecord current = factors.catalog().current(name)
                .orElseThrow(() -> ApiProblem.notFound("No factor '" + name + "'; GET /v1/factors lists them."));
        if (version == null || version == current.version()) {
            return current;
        }
        return factors.catalog().version(name, version)
                .orElseThrow(() -> ApiProblem.notFound("Factor '" + name + "' has no version " + version
                        + "; its versions run from 1 to " + current.currentVersion() + "."));
    }
}
