package dev.winnow.api;

import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import io.javalin.http.Context;

/** Finds the factor version a request names: {@code ?version=} or the current one, from the in-memory catalog. */
final class FactorLookup {
    private FactorLookup() {
    }

    static FactorVersionRecord version(Context ctx, FactorStore factors, String name) {
        return version(ctx, factors, name, 404);
    }

    /**
     * As {@link #version(Context, FactorStore, String)}, answering {@code unknownStatus} for an unknown factor or
     * version: the series and analytics endpoints answer 400, as their contract says for unknown factors.
     */
    static FactorVersionRecord version(Context ctx, FactorStore factors, String name, int unknownStatus) {
        Integer version = Requests.intParam(ctx, "version", 1, Integer.MAX_VALUE);
        FactorVersionRecord current = factors.catalog().current(name)
                .orElseThrow(() -> unknown(unknownStatus, "No factor '" + name + "'; GET /v1/factors lists them."));
        if (version == null || version == current.version()) {
            return current;
        }
        return factors.catalog().version(name, version)
                .orElseThrow(() -> unknown(unknownStatus, "Factor '" + name + "' has no version " + version
                        + "; its versions run from 1 to " + current.currentVersion() + "."));
    }

    private static ApiProblem unknown(int status, String detail) {
        return new ApiProblem(status, status == 404 ? "Not found" : "Bad request", detail);
    }
}
