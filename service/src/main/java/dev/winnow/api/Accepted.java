package dev.winnow.api;

import io.javalin.http.Context;

import java.util.Map;

/** The 202 answer for work handed to the job worker. */
final class Accepted {
    private Accepted() {
    }

    static void job(Context ctx, long jobId) {
        ctx.header("Location", "/v1/jobs/" + jobId);
        Json.respond(ctx, 202, Map.of("job", String.valueOf(jobId)));
    }
}
