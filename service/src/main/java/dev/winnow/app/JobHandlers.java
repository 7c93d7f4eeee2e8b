package dev.winnow.app;

import dev.winnow.ingest.FactorBuildJob;
import dev.winnow.ingest.FactorBuilds;
import dev.winnow.ingest.JobHandler;
import dev.winnow.ingest.JobKinds;
import dev.winnow.ingest.PanelUploadJob;
import dev.winnow.ingest.SeriesUploadJob;
import dev.winnow.ingest.LoadingsJobs;
import dev.winnow.ingest.LoadingsRefresh;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.store.FactorStore;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.PanelStore;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** The job handlers by kind. */
final class JobHandlers {
    private JobHandlers() {
    }

    static Map<String, JobHandler> create(PanelStore panels, FactorStore factors, LoadingsStore loadings, UploadSpool spool) {
        Map<String, JobHandler> handlers = new HashMap<>();
        FactorBuilds builds = new FactorBuilds(panels, factors);
        handlers.put(JobKinds.FACTOR_BUILD, new FactorBuildJob(factors, builds));
        LoadingsRefresh loadingsRefresh = new LoadingsRefresh(panels, factors, loadings);
        handlers.put(JobKinds.PANEL_UPLOAD, new PanelUploadJob(panels, factors, builds, spool,
                List.of((panelId, dates, revision) -> Map.of("loadings", loadingsRefresh.afterUpload(panelId, dates, revision)))));
        handlers.put(LoadingsJobs.KIND, new LoadingsJobs(panels, factors, loadings).handler());
        handlers.put(JobKinds.SERIES_UPLOAD, new SeriesUploadJob(factors, builds, spool));
        return handlers;
    }
}
