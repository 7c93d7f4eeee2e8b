package dev.winnow.api;

import io.javalin.http.Context;

/** The 202 answer for work handed to the job worker. */
final class Accepted {
    private Accepted() {
    }

    static void job(Context ctx, long jobId) {
        ctx.header("Location", "/v1/jobs/" + jobId);
        Json.respond(ctx, 202, new Job(String.valueOf(jobId)));
    }

    /** The job's id, a string as in every answer that names a job. */
    record Job(String job) {
    }
}
