package dev.winnow.app;

import dev.winnow.ingest.FactorBuildJob;
import dev.winnow.ingest.FactorBuilds;
import dev.winnow.ingest.JobHandler;
import dev.winnow.ingest.JobKinds;
import dev.winnow.ingest.PanelUploadJob;
import dev.winnow.ingest.SeriesUploadJob;
import dev.winnow.ingest.JobQueue;
import dev.winnow.ingest.UploadSpool;
import dev.winnow.store.FactorStore;
import dev.winnow.store.PanelStore;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** The job handlers by kind. */
final class JobHandlers {
    private JobHandlers() {
    }

    static Map<String, JobHandler> create(PanelStore panels, FactorStore factors, UploadSpool spool, JobQueue queue) {
        Map<String, JobHandler> handlers = new HashMap<>();
        FactorBuilds builds = new FactorBuilds(panels, factors);
        handlers.put(JobKinds.FACTOR_BUILD, new FactorBuildJob(factors, builds));
        handlers.put(JobKinds.PANEL_UPLOAD, new PanelUploadJob(panels, factors, builds, spool, List.of()));
        handlers.put(JobKinds.SERIES_UPLOAD, new SeriesUploadJob(factors, builds, spool));
        return handlers;
    }
}
