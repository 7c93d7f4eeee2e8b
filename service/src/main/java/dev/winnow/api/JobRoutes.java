package dev.winnow.api;

import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;
import io.javalin.http.Context;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** GET /v1/jobs/{id}. */
final class JobRoutes {
    private final JobStore jobs;

    JobRoutes(JobStore jobs) {
        this.jobs = jobs;
    }

    void get(Context ctx) {
        String idText = ctx.pathParam("id");
        long id;
        try {
            id = Long.parseLong(idText);
        } catch (NumberFormatException e) {
            throw ApiProblem.notFound("No job '" + idText + "'; job ids are the numbers returned by uploads and definitions.");
        }
        JobRecord job = jobs.find(id).orElseThrow(() -> ApiProblem.notFound("No job " + id + "."));
        Json.respond(ctx, view(job));
    }

    static Map<String, Object> view(JobRecord job) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("id", String.valueOf(job.id()));
        out.put("kind", job.kind().wireName());
        out.put("state", job.state().wireName());
        out.put("progress", job.progress());
        out.put("rows_read", job.rowsRead());
        out.put("rows_accepted", job.rowsAccepted());
        out.put("rows_rejected", job.rowsRejected());
        out.put("errors", job.errors() == null ? List.of() : JsonText.readList(job.errors()));
        out.put("report", job.report() == null ? Map.of() : JsonText.readMap(job.report()));
        out.put("created_at", job.createdAt());
        out.put("started_at", job.startedAt());
        out.put("finished_at", job.finishedAt());
        return out;
    }
}
