package dev.winnow.app;

import dev.winnow.ingest.UploadSpool;
import dev.winnow.jobs.FactorBuildJob;
import dev.winnow.jobs.FamilyBuildJob;
import dev.winnow.jobs.JobHandler;
import dev.winnow.jobs.LoadingsJobs;
import dev.winnow.jobs.PanelUploadJob;
import dev.winnow.jobs.SeriesUploadJob;
import dev.winnow.research.FactorBuilds;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.jobs.StoreCompactionJob;
import dev.winnow.store.Database;
import dev.winnow.store.FactorStore;
import dev.winnow.store.JobKind;
import dev.winnow.store.PanelStore;

import java.util.EnumMap;
import java.util.Map;

/** The job handlers by kind. */
final class JobHandlers {
    private JobHandlers() {
    }

    /** A handler for every {@link JobKind}; IllegalStateException naming a kind without one. */
    static Map<JobKind, JobHandler> create(PanelStore panels, FactorStore factors, FactorBuilds builds, LoadingsRefresh loadingsRefresh,
                                          UploadSpool spool, Database database) {
        Map<JobKind, JobHandler> handlers = new EnumMap<>(JobKind.class);
        handlers.put(JobKind.COMPACT_STORE, new StoreCompactionJob(database));
        handlers.put(JobKind.FACTOR_BUILD, new FactorBuildJob(factors, builds));
        handlers.put(JobKind.FAMILY_BUILD, new FamilyBuildJob(factors, builds));
        handlers.put(JobKind.PANEL_UPLOAD, new PanelUploadJob(panels, factors, builds, spool,
                loadingsRefresh::afterUpload));
        handlers.put(JobKind.LOADINGS_HISTORY, new LoadingsJobs(loadingsRefresh).handler());
        handlers.put(JobKind.SERIES_UPLOAD, new SeriesUploadJob(factors, builds, spool));
        for (JobKind kind : JobKind.values()) {
            if (!handlers.containsKey(kind)) {
                throw new IllegalStateException("no handler for job kind " + kind.wireName());
            }
        }
        return handlers;
    }
}
