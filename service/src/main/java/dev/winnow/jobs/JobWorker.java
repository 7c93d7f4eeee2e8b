package dev.winnow.jobs;

import dev.winnow.store.JobLease;
import dev.winnow.store.JobKind;
import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
import dev.winnow.store.StorageFaults;
import dev.winnow.store.JsonText;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;

/**
 * The background worker of one instance: {@code threads} threads, each claiming the next runnable job from the
 * shared queue ({@link JobStore#claim}) and running it to the end under a lease that a timer renews every third
 * of its length. A job's failure is recorded on the job; the thread carries on with the next one. A worker that
 * loses a lease (it stalled longer than the lease and another worker claimed the job) cannot apply or record the
 * job any more ({@link JobLease}), and leaves its clean-up to the worker that holds it now.
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

    private static final long IDLE_POLL_MILLIS = 500;

    /** What the worker is doing, for /health. */
    public enum State {
        IDLE, RUNNING, WAITING_FOR_STORE, STOPPED, DEAD
    }

    /**
     * @param owner        this worker's name in the job table (unique per process)
     * @param threads      jobs run at once (WINNOW_WORKER_THREADS)
     * @param leaseSeconds lease length (WINNOW_JOB_LEASE_S)
     */
    public record Settings(String owner, int threads, int leaseSeconds) {
        public Settings {
            if (threads < 1 || leaseSeconds < 3) {
                throw new IllegalArgumentException("a worker needs at least one thread and a lease of at least 3 seconds");
            }
        }
    }

    /** Told when a job's end is recorded (for metrics). */
    @FunctionalInterface
    public interface JobObserver {
        void finished(JobRecord job, JobOutcome outcome, long nanos);
    }

    private final JobStore jobs;
    private final Map<JobKind, JobHandler> handlers;
    private final Settings settings;
    private final JobObserver observer;
    private final Object signal = new Object();
    private final List<Thread> threads = new ArrayList<>();
    private final Map<Thread, State> states = new ConcurrentHashMap<>();
    private final Map<Long, Boolean> runningHere = new ConcurrentHashMap<>();
    private final ScheduledExecutorService renewer;
    private volatile boolean running = true;

    public JobWorker(JobStore jobs, Map<JobKind, JobHandler> handlers, Settings settings, JobObserver observer) {
        this.jobs = jobs;
        this.handlers = Map.copyOf(handlers);
        this.settings = settings;
        this.observer = observer == null ? (job, outcome, nanos) -> { } : observer;
        for (int i = 0; i < settings.threads(); i++) {
            Thread t = new Thread(this::loop, "winnow-job-worker-" + (i + 1));
            t.setDaemon(true);
            threads.add(t);
            states.put(t, State.IDLE);
        }
        this.renewer = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "winnow-job-leases");
            t.setDaemon(true);
            return t;
        });
    }

    /** Starts the worker threads and the lease timer, and routes the queue's wake-ups to them. */
    public void start(JobQueue queue) {
        queue.attach(this);
        long period = Math.max(1000, settings.leaseSeconds() * 1000L / 3);
        renewer.scheduleWithFixedDelay(this::renewLeases, period, period, TimeUnit.MILLISECONDS);
        threads.forEach(Thread::start);
    }

    private void renewLeases() {
        for (Long id : runningHere.keySet()) {
            try {
                if (!jobs.renew(id, settings.owner(), settings.leaseSeconds())) {
                    LOG.warn("lost the lease of job {}: another worker claimed it; this run will not be applied", id);
                    runningHere.remove(id);
                }
            } catch (RuntimeException e) {
                LOG.warn("could not renew the lease of job {}: {}", id, e.getMessage());
            }
        }
    }

    private State state(State s) {
        states.put(Thread.currentThread(), s);
        return s;
    }

    private State myState() {
        return states.getOrDefault(Thread.currentThread(), State.IDLE);
    }

    /** Tells the worker a job was queued. */
    public void wake() {
        synchronized (signal) {
            signal.notifyAll();
        }
    }

    /**
     * The worker's state: {@link State#DEAD} when a thread ended without being closed, else waiting for the store
     * when a thread is, else running when a thread runs a job, else idle.
     */
    public State state() {
        if (!running) {
            return State.STOPPED;
        }
        if (threads.stream().anyMatch(t -> t.getState() == Thread.State.TERMINATED)) {
            return State.DEAD;
        }
        if (states.containsValue(State.WAITING_FOR_STORE)) {
            return State.WAITING_FOR_STORE;
        }
        return states.containsValue(State.RUNNING) ? State.RUNNING : State.IDLE;
    }

    private void loop() {
        long pause = FIRST_PAUSE_MILLIS;
        while (running) {
            try {
                // throws when the store is down: nothing is claimed and the loop waits
                Optional<JobRecord> next = jobs.claim(settings.owner(), settings.leaseSeconds());
                if (myState() == State.WAITING_FOR_STORE) {
                    LOG.info("the store answers again; the worker carries on");
                }
                pause = FIRST_PAUSE_MILLIS;
                if (next.isEmpty()) {
                    state(State.IDLE);
                    await(IDLE_POLL_MILLIS);
                    continue;
                }
                state(State.RUNNING);
                JobRecord job = next.get();
                runningHere.put(job.id(), Boolean.TRUE);
                try {
                    jobs.runUnderLease(job.id(), settings.owner(), () -> runOne(job));
                } finally {
                    runningHere.remove(job.id());
                }
                state(State.IDLE);
                wake(); // a job that waited for this one may run now
            } catch (InterruptedException e) {
                return;
            } catch (Throwable e) {
                if (!running) {
                    return;
                }
                if (myState() != State.WAITING_FOR_STORE) {
                    LOG.error("the job queue cannot be read; the worker waits for the store", e);
                }
                state(State.WAITING_FOR_STORE);
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
        long started = System.nanoTime();
        JobHandler handler = handlers.get(job.kind());
        ProgressReporter progress = new ProgressReporter(jobs, job.id());
        JobOutcome outcome;
        try {
            if (handler == null) {
                throw new IllegalStateException("no handler for job kind '" + job.kind().wireName() + "'");
            }
            outcome = handler.run(job, progress);
        } catch (JobLease.LeaseLostException e) {
            LOG.warn("job {} ({}): {}; leaving it to that worker", job.id(), job.kind(), e.getMessage());
            return;
        } catch (Throwable e) {
            if (!running) {
                return; // shutting down: the job stays 'running' until it is queued again (H2) or its lease expires
            }
            LOG.error("job {} ({}) failed", job.id(), job.kind(), e);
            outcome = JobOutcome.failure(progress.latest(), describe(job, e));
        }
        if (!record(job, outcome)) {
            LOG.warn("job {} ({}) was claimed by another worker meanwhile; its end and clean-up are theirs", job.id(), job.kind());
            return;
        }
        observer.finished(job, outcome, System.nanoTime() - started);
        try {
            if (handler != null) {
                handler.afterEnd(job);
            }
        } catch (Throwable e) {
            LOG.warn("job {} ({}): clean-up after its end failed; what is left is removed at the next start", job.id(), job.kind(), e);
        }
    }

    /**
     * Records the job's end, waiting for the store while it cannot be written; false when this worker no longer
     * holds the job (another claimed it after this worker's lease expired) or the worker is closing.
     */
    private boolean record(JobRecord job, JobOutcome outcome) throws InterruptedException {
        long pause = FIRST_PAUSE_MILLIS;
        while (running) {
            try {
                boolean recorded = jobs.finish(job.id(), settings.owner(), outcome.succeeded(), outcome.counters(),
                        outcome.errors().isEmpty() ? null : JsonText.write(outcome.errors()),
                        outcome.report() == null ? null : JsonText.write(outcome.report()));
                if (myState() == State.WAITING_FOR_STORE) {
                    LOG.info("recorded the end of job {} once the store answered again", job.id());
                    state(State.RUNNING);
                }
                return recorded;
            } catch (Throwable e) {
                if (!running) {
                    return false;
                }
                if (myState() != State.WAITING_FOR_STORE) {
                    LOG.error("could not record the end of job {}; the worker waits for the store", job.id(), e);
                }
                state(State.WAITING_FOR_STORE);
                await(pause);
                pause = Math.min(LONGEST_PAUSE_MILLIS, pause * 2);
            }
        }
        return false;
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
        renewer.shutdownNow();
        for (Thread t : threads) {
            try {
                t.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
    }
}
