package dev.winnow.jobs;

import dev.winnow.research.WorkQueue;
import dev.winnow.store.JobStore;
import dev.winnow.store.JsonText;

import java.util.LinkedHashMap;
import java.util.Map;

/** Queues jobs in the store, with the resources they touch (see {@link JobResources}), and wakes the local worker. */
public final class JobQueue implements WorkQueue {
    private final JobStore jobs;
    private final JobResources resources;
    private volatile JobWorker worker;

    /** A queue whose jobs each touch everything, so they run strictly one after another in queue order. */
    public JobQueue(JobStore jobs) {
        this(jobs, null);
    }

    public JobQueue(JobStore jobs, JobResources resources) {
        this.jobs = jobs;
        this.resources = resources;
    }

    void attach(JobWorker worker) {
        this.worker = worker;
    }

    public long enqueue(String kind, Map<String, Object> params) {
        java.util.List<JobStore.Resource> touched = resources == null
                ? java.util.List.of(JobStore.Resource.writes(JobStore.Resource.EVERYTHING)) : resources.of(kind, params);
        long id = jobs.enqueue(kind, JsonText.write(params), touched);
        JobWorker w = worker;
        if (w != null) {
            w.wake();
        }
        return id;
    }

    @Override
    public long queueFactorBuild(String factor, int version) {
        Map<String, Object> params = new LinkedHashMap<>();
        params.put("factor", factor);
        params.put("version", version);
        return enqueue(JobKinds.FACTOR_BUILD, params);
    }

    @Override
    public long queueFamilyBuild(String family, java.util.List<Map<String, Object>> versions) {
        Map<String, Object> params = new LinkedHashMap<>();
        params.put("family", family);
        params.put("versions", versions);
        return enqueue(JobKinds.FAMILY_BUILD, params);
    }

    @Override
    public long queueLoadingsHistory(String panel, long panelId) {
        return enqueue(LoadingsJobs.KIND, LoadingsJobs.params(panel, panelId));
    }
}
