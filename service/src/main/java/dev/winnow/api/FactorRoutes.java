package dev.winnow.api;

import dev.winnow.construct.FactorDefinition;
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
import java.util.LinkedHashMap;
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
        Json.respond(ctx, 202, Map.of("job", String.valueOf(defined.buildJob()), "factor", name, "version", defined.version().version()));
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
        List<Map<String, Object>> out = new ArrayList<>();
        FactorRoles roles = roles();
        for (FactorVersionRecord v : factors.catalog().listCurrent(includeRetired)) {
            out.add(view(v, roles));
        }
        Json.respond(ctx, Map.of("factors", out));
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
            Map<String, Object> out = new LinkedHashMap<>();
            out.put("factor", request.version().name());
            out.put("version", request.version().version());
            out.put("frequency", resolved.frequency().wireName());
            out.put("leg", request.leg().name().toLowerCase(java.util.Locale.ROOT));
            out.put("form", form);
            out.put("dates", series.dates());
            out.put("returns", series.values());
            return Responses.jsonBody(out);
        });
    }

    void turnover(Context ctx) {
        FactorVersionRecord v = FactorLookup.version(ctx, factors, ctx.pathParam("factor"));
        if (Responses.notModified(ctx, v, false)) {
            return;
        }
        List<StoredTurnover> rows = factors.turnover(v.factorId(), v.version());
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("factor", v.name());
        out.put("version", v.version());
        out.put("dates", rows.stream().map(StoredTurnover::formationDate).toList());
        out.put("turnover", rows.stream().mapToDouble(StoredTurnover::turnover).toArray());
        Json.respond(ctx, out);
    }

    /** The roles of the current definitions, retired factors included (their declared role still holds). */
    private FactorRoles roles() {
        return FactorRoles.of(factors.catalog().listCurrent(true));
    }

    Map<String, Object> view(FactorVersionRecord v, FactorRoles roles) {
        SeriesSummary s = factors.seriesSummary(v.factorId(), v.version());
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("name", v.name());
        out.put("version", v.version());
        out.put("current_version", v.currentVersion());
        out.put("definition", Json.MAPPER.valueToTree(JsonText.readMap(v.definitionJson())));
        out.put("role", DefinitionJson.wire(roles.role(v.name())));
        out.put("status", v.status().wireName());
        out.put("retired", v.retired());
        out.put("first_date", s.firstDate());
        out.put("last_date", s.lastDate());
        out.put("observations", s.observations());
        out.put("data_version", v.dataVersion());
        out.put("build_report", v.buildReport() == null ? null : JsonText.readMap(v.buildReport()));
        out.put("created_at", v.createdAt());
        out.put("built_at", v.builtAt());
        return out;
    }
}
