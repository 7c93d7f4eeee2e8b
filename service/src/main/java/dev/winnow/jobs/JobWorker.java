package dev.winnow.jobs;

import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.JsonText;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The one background worker: takes queued jobs in id order and runs each to the end. A job's failure is recorded
 * on the job; the worker carries on with the next one.
 */
public final class JobWorker implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(JobWorker.class);

    private final JobStore jobs;
    private final Map<String, JobHandler> handlers;
    private final Object signal = new Object();
    private final Thread thread;
    private volatile boolean running = true;

    public JobWorker(JobStore jobs, Map<String, JobHandler> handlers) {
        this.jobs = jobs;
        this.handlers = Map.copyOf(handlers);
        this.thread = new Thread(this::loop, "winnow-job-worker");
        this.thread.setDaemon(true);
    }

    /** Starts the worker thread and routes the queue's wake-ups to it. */
    public void start(JobQueue queue) {
        queue.attach(this);
        thread.start();
    }

    /** Tells the worker a job was queued. */
    public void wake() {
        synchronized (signal) {
            signal.notifyAll();
        }
    }

    private void loop() {
        while (running) {
            Optional<JobRecord> next;
            try {
                next = jobs.nextQueued();
            } catch (RuntimeException e) {
                if (!running) {
                    return;
                }
                LOG.error("could not read the job queue", e);
                next = Optional.empty();
            }
            if (next.isEmpty()) {
                synchronized (signal) {
                    try {
                        signal.wait(500);
                    } catch (InterruptedException e) {
                        return;
                    }
                }
                continue;
            }
            runOne(next.get());
        }
    }

    private void runOne(JobRecord job) {
        JobHandler handler = handlers.get(job.kind());
        ProgressReporter progress = new ProgressReporter(jobs, job.id());
        jobs.markRunning(job.id());
        JobOutcome outcome;
        try {
            if (handler == null) {
                throw new IllegalStateException("no handler for job kind '" + job.kind() + "'");
            }
            outcome = handler.run(job, progress);
        } catch (Exception | OutOfMemoryError e) {
            if (!running) {
                return; // shutting down: the job stays 'running' and is queued again at the next start
            }
            LOG.error("job {} ({}) failed", job.id(), job.kind(), e);
            outcome = JobOutcome.failure(progress.latest(), List.of(JobOutcome.error(null, null,
                    "internal error while running the job: " + e.getClass().getSimpleName() + ": " + e.getMessage())));
        }
        try {
            jobs.finish(job.id(), outcome.succeeded(), outcome.counters(),
                    outcome.errors().isEmpty() ? null : JsonText.write(outcome.errors()),
                    outcome.report().isEmpty() ? null : JsonText.write(outcome.report()));
        } catch (RuntimeException e) {
            if (!running) {
                return;
            }
            LOG.error("could not record the end of job {}; marking it failed", job.id(), e);
            jobs.finish(job.id(), false, outcome.counters(), JsonText.write(List.of(JobOutcome.error(null, null,
                    "internal error while recording the job's result: " + e.getMessage()))), null);
        }
    }

    @Override
    public void close() {
        running = false;
        wake();
        try {
            thread.join(5_000);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
