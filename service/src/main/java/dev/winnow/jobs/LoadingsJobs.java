package dev.winnow.jobs;

import dev.winnow.research.LoadingsRefresh;
import dev.winnow.store.JobStore.Counters;
import dev.winnow.store.JsonText;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.function.DoubleConsumer;

/** The background job that computes and stores a panel's loadings for its whole history. */
public final class LoadingsJobs {
    /** Job kind of a history computation; params {"panel": name, "panel_id": id}. */
    public static final String KIND = "loadings_history";

    private final LoadingsRefresh refresh;

    public LoadingsJobs(LoadingsRefresh refresh) {
        this.refresh = refresh;
    }

    /** The job parameters for a panel. */
    public static Map<String, Object> params(String panelName, long panelId) {
        Map<String, Object> params = new LinkedHashMap<>();
        params.put("panel", panelName);
        params.put("panel_id", panelId);
        return params;
    }

    /**
     * Computes and stores the loadings of every grid date with the panel's config (the window slides over the panel
     * once), replacing whatever was stored. {@code progress} receives the share done, from 0 to 1.
     *
     * @return a report: dates computed, factors, window, min_obs and the date range
     * @throws IllegalStateException when the panel has no config or a configured factor is not ready
     */
    public Map<String, Object> computeHistory(long panelId, DoubleConsumer progress) {
        return refresh.computeHistory(panelId, progress);
    }

    /** The handler to register for {@link #KIND}. */
    public JobHandler handler() {
        return (job, progress) -> {
            Object panelId = JsonText.readMap(job.params()).get("panel_id");
            if (!(panelId instanceof Number id)) {
                throw new IllegalArgumentException("job parameters lack a numeric panel_id: " + job.params());
            }
            Map<String, Object> report = computeHistory(id.longValue(), progress::report);
            long dates = ((Number) report.get("computed_dates")).longValue();
            return JobOutcome.success(new Counters(1.0, dates, dates, 0), report);
        };
    }
}
