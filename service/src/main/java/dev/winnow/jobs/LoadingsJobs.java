package dev.winnow.jobs;

import dev.winnow.research.LoadingsHistory;
import dev.winnow.research.LoadingsRefresh;
import dev.winnow.store.JobStore.Counters;

import java.util.function.DoubleConsumer;

/** The background job that computes and stores a panel's loadings for its whole history. */
public final class LoadingsJobs {
    private final LoadingsRefresh refresh;

    public LoadingsJobs(LoadingsRefresh refresh) {
        this.refresh = refresh;
    }

    /**
     * Computes and stores the loadings of every grid date with the panel's config (the window slides over the panel
     * once), replacing whatever was stored. {@code progress} receives the share done, from 0 to 1.
     *
     * @return a report: dates computed, factors, window, min_obs and the date range
     * @throws IllegalStateException when the panel has no config or a configured factor is not ready
     */
    public LoadingsHistory computeHistory(long panelId, DoubleConsumer progress) {
        return refresh.computeHistory(panelId, progress);
    }

    /** The handler to register for {@link dev.winnow.store.JobKind#LOADINGS_HISTORY}. */
    public JobHandler handler() {
        return (job, progress) -> {
            long panelId = JobParams.of(job, JobParams.LoadingsHistory.class).panelId();
            LoadingsHistory history = computeHistory(panelId, progress::report);
            long dates = history.computedDates();
            return JobOutcome.success(new Counters(1.0, dates, dates, 0), new JobReports.LoadingsHistoryComputed(history));
        };
    }
}
