package dev.winnow.api;

import com.fasterxml.jackson.databind.PropertyNamingStrategies;
import com.fasterxml.jackson.databind.annotation.JsonNaming;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.JobParams;
import dev.winnow.jobs.JobQueue;
import dev.winnow.store.PanelStore;
import dev.winnow.store.PanelStore.PanelRecord;
import io.javalin.http.Context;

import java.time.LocalDate;
import java.util.ArrayList;
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
        List<PanelView> out = new ArrayList<>();
        for (PanelRecord p : panels.listVisible()) {
            out.add(view(p, panels.columns(p.id())));
        }
        Json.respond(ctx, new PanelList(out));
    }

    void get(Context ctx) {
        String name = ctx.pathParam("panel");
        PanelRecord p = panels.find(name).filter(PanelRecord::visible)
                .orElseThrow(() -> ApiProblem.notFound("No panel '" + name + "'; GET /v1/panels lists them."));
        Json.respond(ctx, view(p, panels.columns(p.id())));
    }

    record Column(String name, String type) {
    }

    /** A panel: its range, size, frequency and columns (security and return first, then the others as stored). */
    @JsonNaming(PropertyNamingStrategies.SnakeCaseStrategy.class)
    record PanelView(String name, LocalDate firstDate, LocalDate lastDate, int dates, int securities, long rows, String frequency,
                     List<Column> columns, long dataVersion) {
    }

    record PanelList(List<PanelView> panels) {
    }

    private static PanelView view(PanelRecord p, Map<String, String> extraColumns) {
        List<Column> columns = new ArrayList<>();
        columns.add(new Column("security", "label"));
        columns.add(new Column("return", "number"));
        extraColumns.forEach((name, type) -> columns.add(new Column(name, type)));
        return new PanelView(p.name(), p.firstDate(), p.lastDate(), p.dateCount(), p.securityCount(), p.rowCount(), p.frequency(),
                columns, p.dataVersion());
    }
}
