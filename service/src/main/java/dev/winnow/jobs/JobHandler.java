package dev.winnow.jobs;

import dev.winnow.store.JobStore.JobRecord;

/** Runs one kind of job. Throwing marks the job failed; it never stops the worker. */
@FunctionalInterface
public interface JobHandler {
    JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception;

    /**
     * Called once the job's end is recorded, whether it succeeded or failed: removes what the job no longer needs
     * (its spooled upload, data it staged and did not commit). Must be safe to call more than once.
     */
    default void afterEnd(JobRecord job) throws Exception {
    }
}
