package dev.winnow.app;

import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.FactorBuildJob;
import dev.winnow.jobs.FamilyBuildJob;
import dev.winnow.jobs.JobHandler;
import dev.winnow.jobs.JobKinds;
import dev.winnow.jobs.LoadingsJobs;
import dev.winnow.jobs.PanelUploadJob;
import dev.winnow.jobs.SeriesUploadJob;
import dev.winnow.research.FactorBuilds;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.jobs.StoreCompactionJob;
import dev.winnow.store.Database;
import dev.winnow.store.FactorStore;
import dev.winnow.store.PanelStore;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** The job handlers by kind. */
final class JobHandlers {
    private JobHandlers() {
    }

    static Map<String, JobHandler> create(PanelStore panels, FactorStore factors, FactorBuilds builds, LoadingsRefresh loadingsRefresh,
                                          UploadSpool spool, Database database) {
        Map<String, JobHandler> handlers = new HashMap<>();
        handlers.put(JobKinds.COMPACT_STORE, new StoreCompactionJob(database));
        handlers.put(JobKinds.FACTOR_BUILD, new FactorBuildJob(factors, builds));
        handlers.put(JobKinds.FAMILY_BUILD, new FamilyBuildJob(factors, builds));
        handlers.put(JobKinds.PANEL_UPLOAD, new PanelUploadJob(panels, factors, builds, spool,
                List.of((panelId, dates, revision) -> Map.of("loadings", loadingsRefresh.afterUpload(panelId, dates, revision)))));
        handlers.put(LoadingsJobs.KIND, new LoadingsJobs(loadingsRefresh).handler());
        handlers.put(JobKinds.SERIES_UPLOAD, new SeriesUploadJob(factors, builds, spool));
        return handlers;
    }
}
