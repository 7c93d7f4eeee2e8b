package dev.winnow.ingest;

import dev.winnow.store.JobStore;

import java.util.Map;

/** Queues jobs in the store and wakes the worker. */
public final class JobQueue {
    private final JobStore jobs;
    private volatile JobWorker worker;

    public JobQueue(JobStore jobs) {
        this.jobs = jobs;
    }

    void attach(JobWorker worker) {
        this.worker = worker;
    }

    public long enqueue(String kind, Map<String, Object> params) {
        long id = jobs.enqueue(kind, JsonText.write(params));
        JobWorker w = worker;
        if (w != null) {
            w.wake();
        }
        return id;
    }
}
