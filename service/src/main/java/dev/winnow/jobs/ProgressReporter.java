package dev.winnow.jobs;

import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.Counters;

/** Writes a running job's progress to the store, at most a few times a second. */
public final class ProgressReporter {
    private static final long INTERVAL_NANOS = 200_000_000L;

    private final JobStore jobs;
    private final long jobId;
    private long lastWrite;
    private Counters latest = Counters.ZERO;

    ProgressReporter(JobStore jobs, long jobId) {
        this.jobs = jobs;
        this.jobId = jobId;
    }

    public void report(Counters counters) {
        latest = counters;
        long now = System.nanoTime();
        if (now - lastWrite >= INTERVAL_NANOS) {
            lastWrite = now;
            jobs.updateProgress(jobId, counters);
        }
    }

    public void report(double progress) {
        report(new Counters(Math.max(0, Math.min(1, progress)), latest.rowsRead(), latest.rowsAccepted(), latest.rowsRejected()));
    }

    public Counters latest() {
        return latest;
    }
}
