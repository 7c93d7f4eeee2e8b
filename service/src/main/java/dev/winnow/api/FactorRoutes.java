package dev.winnow.api;

import dev.winnow.construct.FactorDefinition;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobParams;
import dev.winnow.jobs.JobQueue;
import dev.winnow.research.ConflictException;
import dev.winnow.research.FactorDefinitions;
import dev.winnow.research.FactorRoles;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.SeriesSummary;
import dev.winnow.store.FactorStore.StoredTurnover;
import dev.winnow.store.JsonText;
import io.javalin.http.Context;

import java.util.ArrayList;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.util.List;
import java.util.Map;

/** Factor definitions, versions, series and turnover. */
final class FactorRoutes {
    private final FactorStore factors;
    private final FactorDefinitions definitions;
    private final JobQueue queue;
    private final UploadSpool spool;
    private final ServedResponses served;

    FactorRoutes(FactorStore factors, FactorDefinitions definitions, JobQueue queue, UploadSpool spool, ServedResponses served) {
        this.factors = factors;
        this.definitions = definitions;
        this.served = served;
        this.queue = queue;
        this.spool = spool;
    }

    void define(Context ctx) {
        String name = Names.check("Factor", ctx.pathParam("factor"));
        FactorDefinitions.Defined defined;
        try {
            defined = definitions.define(name, Json.readObject(ctx));
        } catch (FactorDefinitions.InvalidDefinitionException e) {
            List<Map<String, Object>> errors = new ArrayList<>();
            for (String p : e.problems()) {
                errors.add(Map.of("message", p));
            }
            throw new ApiProblem(400, "Invalid factor definition", e.getMessage(), errors);
        }
        if (defined.buildJob() == null) {
            Json.respond(ctx, defined.created() ? 201 : 200, view(defined.version(), roles()));
            return;
        }
        ctx.header("Location", "/v1/jobs/" + defined.buildJob());
        Json.respond(ctx, 202, new BuildAccepted(String.valueOf(defined.buildJob()), name, defined.version().version()));
    }

    /** The 202 answer of a definition that queued a build. */
    record BuildAccepted(String job, String factor, int version) {
    }

    void uploadSeries(Context ctx) {
        String name = ctx.pathParam("factor");
        FactorVersionRecord v = factors.current(name)
                .orElseThrow(() -> ApiProblem.notFound("No factor '" + name + "'; define it first with PUT /v1/factors/" + name
                        + " {\"method\":\"external\"}."));
        if (v.method() != FactorDefinition.Method.EXTERNAL) {
            throw new ConflictException("Factor '" + name + "' is built from panel data (method " + DefinitionJson.wire(v.method())
                    + "); only method external takes uploaded returns.");
        }
        Uploads.Received received = Uploads.receive(ctx, spool);
        Accepted.job(ctx, queue.enqueue(new JobParams.SeriesUpload(name, v.version(), received.mode(), received.spoolPath(), received.gzip())));
    }

    void list(Context ctx) {
        boolean includeRetired = Requests.choiceParam(ctx, "include", List.of("retired"), "").equals("retired");
        List<FactorView> out = new ArrayList<>();
        FactorRoles roles = roles();
        for (FactorVersionRecord v : factors.catalog().listCurrent(includeRetired)) {
            out.add(view(v, roles));
        }
        Json.respond(ctx, new FactorList(out));
    }

    void get(Context ctx) {
        Json.respond(ctx, view(FactorLookup.version(ctx, factors, ctx.pathParam("factor")), roles()));
    }

    void retire(Context ctx) {
        String name = ctx.pathParam("factor");
        if (factors.current(name).isEmpty()) {
            throw ApiProblem.notFound("No factor '" + name + "'.");
        }
        factors.retire(name);
        ctx.status(204);
    }

    void returns(Context ctx) {
        SeriesRequest request = SeriesRequest.of(ctx, factors, ctx.pathParam("factor"));
        String form = Requests.choiceParam(ctx, "form", List.of("period", "cumulative"), "period");
        boolean csv = Responses.wantsCsv(ctx);
        served.respond(ctx, Responses.dataKey(request.version()), csv, () -> {
            SeriesRequest.Resolved resolved = request.load(factors);
            ReturnSeries series = form.equals("cumulative") ? dev.winnow.stats.FrequencyConversion.cumulative(resolved.series()) : resolved.series();
            if (csv) {
                return Responses.csvBody(Responses.csvSeries("date,return", series.dates(), series.values()));
            }
            return Responses.jsonBody(new Returns(request.version().name(), request.version().version(), resolved.frequency().wireName(),
                    request.leg().name().toLowerCase(java.util.Locale.ROOT), form, series.dates(), series.values()));
        });
    }

    void turnover(Context ctx) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        if (Responses.notModified(ctx, v, false)) {
            return;
        }
        List<StoredTurnover> rows = factors.turnover(v.factorId(), v.version());
        Json.respond(ctx, new Turnover(v.name(), v.version(), rows.stream().map(StoredTurnover::formationDate).toList(),
                rows.stream().mapToDouble(StoredTurnover::turnover).toArray()));
    }

    /** A factor's series: {@code dates} and {@code returns} side by side. */
    record Returns(String factor, int version, String frequency, String leg, String form, LocalDate[] dates, double[] returns) {
    }

    /** The turnover of each formation. */
    record Turnover(String factor, int version, List<LocalDate> dates, double[] turnover) {
    }

    /** One version of a factor, as {@code GET /v1/factors/{f}} answers it. */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record FactorView(String name, int version, int currentVersion, JsonNode definition, String role, String status, boolean retired,
                      LocalDate firstDate, LocalDate lastDate, int observations, long dataVersion, Map<String, Object> buildReport,
                      OffsetDateTime createdAt, OffsetDateTime builtAt) {
    }

    record FactorList(List<FactorView> factors) {
    }

    /** The roles of the current definitions, retired factors included (their declared role still holds). */
    private FactorRoles roles() {
        return FactorRoles.of(factors.catalog().listCurrent(true));
    }

    FactorView view(FactorVersionRecord v, FactorRoles roles) {
        SeriesSummary s = factors.seriesSummary(v.factorId(), v.version());
        return new FactorView(v.name(), v.version(), v.currentVersion(), Json.MAPPER.valueToTree(JsonText.readMap(v.definitionJson())),
                DefinitionJson.wire(roles.role(v.name())), v.status().wireName(), v.retired(), s.firstDate(), s.lastDate(),
                s.observations(), v.dataVersion(), v.buildReport() == null ? null : JsonText.readMap(v.buildReport()),
                v.createdAt(), v.builtAt());
    }
}
