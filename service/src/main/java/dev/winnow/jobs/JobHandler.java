package dev.winnow.jobs;

import dev.winnow.store.JobStore.JobRecord;

/** Runs one kind of job. Throwing marks the job failed with the exception's message; it never stops the worker. */
@FunctionalInterface
public interface JobHandler {
    JobOutcome run(JobRecord job, ProgressReporter progress) throws Exception;
}
