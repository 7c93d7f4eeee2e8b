package dev.winnow.api;

import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;
import io.javalin.http.Context;

import java.time.OffsetDateTime;
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

    /** The body of {@code GET /v1/jobs/{id}}; the id is a string, as in every answer that names a job. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record JobView(String id, String kind, String state, double progress, long rowsRead, long rowsAccepted, long rowsRejected,
                   List<Map<String, Object>> errors, Map<String, Object> report, OffsetDateTime createdAt,
                   OffsetDateTime startedAt, OffsetDateTime finishedAt) {
    }

    static JobView view(JobRecord job) {
        return new JobView(String.valueOf(job.id()), job.kind().wireName(), job.state().wireName(), job.progress(), job.rowsRead(),
                job.rowsAccepted(), job.rowsRejected(), job.errors() == null ? List.of() : JsonText.readList(job.errors()),
                job.report() == null ? Map.of() : JsonText.readMap(job.report()), job.createdAt(), job.startedAt(), job.finishedAt());
    }
}
