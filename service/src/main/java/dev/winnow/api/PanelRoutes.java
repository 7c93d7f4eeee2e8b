package dev.winnow.api;

import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobParams;
import dev.winnow.jobs.JobQueue;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Panel uploads and panel descriptions. */
final class PanelRoutes {
    private final PanelStore panels;
    private final JobQueue queue;
    private final UploadSpool spool;

    PanelRoutes(PanelStore panels, JobQueue queue, UploadSpool spool) {
        this.panels = panels;
        this.queue = queue;
        this.spool = spool;
    }

    void upload(Context ctx) {
        String panel = Names.check("Panel", ctx.pathParam("panel"));
        String mode = Requests.choiceParam(ctx, "mode", List.of("append", "revise"), "append");
        if (mode.equals("revise") && panels.find(panel).filter(PanelRecord::visible).isEmpty()) {
            throw ApiProblem.notFound("Panel '" + panel + "' has no data to revise; upload it first without mode=revise.");
        }
        Uploads.Received received = Uploads.receive(ctx, spool);
        Accepted.job(ctx, queue.enqueue(new JobParams.PanelUpload(panel, received.mode(), received.spoolPath(), received.gzip())));
    }

    void list(Context ctx) {
        List<Map<String, Object>> out = new ArrayList<>();
        for (PanelRecord p : panels.listVisible()) {
            out.add(view(p, panels.columns(p.id())));
        }
        Json.respond(ctx, Map.of("panels", out));
    }

    void get(Context ctx) {
        String name = ctx.pathParam("panel");
        PanelRecord p = panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.notFound("No panel '" + name + "'; GET /v1/panels lists them."));
        Json.respond(ctx, view(p, panels.columns(p.id())));
    }

    private static Map<String, Object> view(PanelRecord p, Map<String, String> extraColumns) {
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("name", p.name());
        out.put("first_date", p.firstDate());
        out.put("last_date", p.lastDate());
        out.put("dates", p.dateCount());
        out.put("securities", p.securityCount());
        out.put("rows", p.rowCount());
        out.put("frequency", p.frequency());
        List<Map<String, String>> columns = new ArrayList<>();
        columns.add(column("security", "label"));
        columns.add(column("return", "number"));
        extraColumns.forEach((name, type) -> columns.add(column(name, type)));
        out.put("columns", columns);
        out.put("data_version", p.dataVersion());
        return out;
    }

    private static Map<String, String> column(String name, String type) {
        Map<String, String> c = new LinkedHashMap<>();
        c.put("name", name);
        c.put("type", type);
        return c;
    }
}
