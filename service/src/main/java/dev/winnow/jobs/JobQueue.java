package dev.winnow.jobs;

import dev.winnow.research.WorkQueue;
import dev.winnow.store.JobStore;

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

    public long enqueue(JobParams params) {
        java.util.List<JobStore.Resource> touched = resources == null
                ? java.util.List.of(JobStore.Resource.writes(JobStore.Resource.EVERYTHING)) : resources.of(params);
        long id = jobs.enqueue(params.kind(), params.json(), touched);
        JobWorker w = worker;
        if (w != null) {
            w.wake();
        }
        return id;
    }

    @Override
    public long queueFactorBuild(String factor, int version) {
        return enqueue(new JobParams.FactorBuild(factor, version));
    }

    @Override
    public long queueFamilyBuild(String family, java.util.List<WorkQueue.FactorVersion> versions) {
        return enqueue(new JobParams.FamilyBuild(family,
                versions.stream().map(v -> new JobParams.FamilyBuild.Member(v.factor(), v.version())).toList()));
    }

    @Override
    public long queueLoadingsHistory(String panel, long panelId) {
        return enqueue(new JobParams.LoadingsHistory(panel, panelId));
    }
}
