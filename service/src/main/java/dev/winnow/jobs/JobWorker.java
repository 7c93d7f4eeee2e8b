package dev.winnow.jobs;

import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.StorageFaults;
import dev.winnow.store.JsonText;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The one background worker: takes queued jobs in id order and runs each to the end. A job's failure is recorded
 * on the job; the worker carries on with the next one.
 *
 * <p>Nothing a job or the store throws ends the worker. A job that fails on a storage fault (a full disk, a store
 * that closed itself) is failed with an error that says so; while the store cannot even record that, the worker
 * waits ({@link State#WAITING_FOR_STORE}) and tries again with a growing pause, so it records the failure and runs
 * the next job once the storage is back. Job errors never carry exception messages of the store or the JVM (SQL,
 * bound values, paths): those go to the log, the job gets a sentence and its id as the reference.
 */
public final class JobWorker implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(JobWorker.class);
    private static final long FIRST_PAUSE_MILLIS = 200;
    private static final long LONGEST_PAUSE_MILLIS = 5_000;

    /** What the worker is doing, for /health. */
    public enum State {
        IDLE, RUNNING, WAITING_FOR_STORE, STOPPED, DEAD
    }

    private final JobStore jobs;
    private final Map<String, JobHandler> handlers;
    private final Object signal = new Object();
    private final Thread thread;
    private volatile boolean running = true;
    private volatile State state = State.IDLE;

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

    /** The worker's state; {@link State#DEAD} when its thread ended without being closed. */
    public State state() {
        if (running && thread.getState() == Thread.State.TERMINATED) {
            return State.DEAD;
        }
        return running ? state : State.STOPPED;
    }

    private void loop() {
        long pause = FIRST_PAUSE_MILLIS;
        while (running) {
            try {
                Optional<JobRecord> next = jobs.nextQueued();
                if (state == State.WAITING_FOR_STORE) {
                    LOG.info("the store answers again; the worker carries on");
                }
                pause = FIRST_PAUSE_MILLIS;
                if (next.isEmpty()) {
                    state = State.IDLE;
                    await(500);
                    continue;
                }
                state = State.RUNNING;
                runOne(next.get());
                state = State.IDLE;
            } catch (InterruptedException e) {
                return;
            } catch (Throwable e) {
                if (!running) {
                    return;
                }
                if (state != State.WAITING_FOR_STORE) {
                    LOG.error("the job queue cannot be read; the worker waits for the store", e);
                }
                state = State.WAITING_FOR_STORE;
                try {
                    await(pause);
                } catch (InterruptedException stop) {
                    return;
                }
                pause = Math.min(LONGEST_PAUSE_MILLIS, pause * 2);
            }
        }
    }

    private void await(long millis) throws InterruptedException {
        synchronized (signal) {
            signal.wait(millis);
        }
    }

    private void runOne(JobRecord job) throws InterruptedException {
        JobHandler handler = handlers.get(job.kind());
        ProgressReporter progress = new ProgressReporter(jobs, job.id());
        jobs.markRunning(job.id()); // throws when the store is down: the job stays queued and the loop waits
        JobOutcome outcome;
        try {
            if (handler == null) {
                throw new IllegalStateException("no handler for job kind '" + job.kind() + "'");
            }
            outcome = handler.run(job, progress);
        } catch (Throwable e) {
            if (!running) {
                return; // shutting down: the job stays 'running' and is queued again at the next start
            }
            LOG.error("job {} ({}) failed", job.id(), job.kind(), e);
            outcome = JobOutcome.failure(progress.latest(), List.of(JobOutcome.error(null, null, describe(job, e))));
        }
        record(job, outcome);
        try {
            if (handler != null) {
                handler.afterEnd(job);
            }
        } catch (Throwable e) {
            LOG.warn("job {} ({}): clean-up after its end failed; what is left is removed at the next start", job.id(), job.kind(), e);
        }
    }

    /** Records the job's end, waiting for the store while it cannot be written. */
    private void record(JobRecord job, JobOutcome outcome) throws InterruptedException {
        long pause = FIRST_PAUSE_MILLIS;
        while (running) {
            try {
                jobs.finish(job.id(), outcome.succeeded(), outcome.counters(),
                        outcome.errors().isEmpty() ? null : JsonText.write(outcome.errors()),
                        outcome.report().isEmpty() ? null : JsonText.write(outcome.report()));
                if (state == State.WAITING_FOR_STORE) {
                    LOG.info("recorded the end of job {} once the store answered again", job.id());
                    state = State.RUNNING;
                }
                return;
            } catch (Throwable e) {
                if (!running) {
                    return;
                }
                if (state != State.WAITING_FOR_STORE) {
                    LOG.error("could not record the end of job {}; the worker waits for the store", job.id(), e);
                }
                state = State.WAITING_FOR_STORE;
                await(pause);
                pause = Math.min(LONGEST_PAUSE_MILLIS, pause * 2);
            }
        }
    }

    /** The job's error text: what went wrong in words, never the exception's own message from the store or the JVM. */
    static String describe(JobRecord job, Throwable e) {
        if (StorageFaults.isDiskFull(e)) {
            return "the disk holding the store is full, so the job stopped; nothing of it was kept. Ask the operator to "
                    + "free space on the data directory, then send the upload or definition again (job " + job.id() + ")";
        }
        if (StorageFaults.isStorageFault(e)) {
            return "the store could not be written, so the job stopped; nothing of it was kept. Ask the operator to "
                    + "check the data directory's disk, then try again (job " + job.id() + ", details in the server log)";
        }
        if (e instanceof OutOfMemoryError) {
            return "the job needed more memory than the server has; nothing of it was kept. Split the upload into "
                    + "smaller ones or ask the operator to give the service more memory (job " + job.id() + ")";
        }
        if ((e instanceof IllegalArgumentException || e instanceof IllegalStateException) && e.getCause() == null
                && e.getMessage() != null && e.getMessage().length() <= 500) {
            return "the job could not be completed: " + e.getMessage(); // our own checks, written for the client
        }
        return "internal error while running the job; nothing of it was kept and the error was logged on the server "
                + "(job " + job.id() + ")";
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
