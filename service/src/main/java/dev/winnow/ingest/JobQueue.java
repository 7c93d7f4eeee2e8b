package dev.winnow.ingest;

import dev.winnow.store.JobStore;

import java.util.List;
import java.util.Map;

/** Queues jobs in the store, with the resources they touch (see {@link JobResources}), and wakes the local worker. */
public final class JobQueue {
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
        List<JobStore.Resource> touched = resources == null
                ? List.of(JobStore.Resource.writes(JobStore.Resource.EVERYTHING)) : resources.of(kind, params);
        long id = jobs.enqueue(kind, JsonText.write(params), touched);
        JobWorker w = worker;
        if (w != null) {
            w.wake();
        }
        return id;
    }
}
