package dev.winnow.jobs;

import dev.winnow.store.JobLease;
import dev.winnow.store.JobStore;
import dev.winnow.store.JobStore.JobRecord;
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
 * job any more ({@link JobLease}).
 */
public final class JobWorker implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(JobWorker.class);
    private static final long IDLE_POLL_MS = 500;

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

    /** Told when a job ends (for metrics). */
    @FunctionalInterface
    public interface JobObserver {
        void finished(JobRecord job, JobOutcome outcome, long nanos);
    }

    private final JobStore jobs;
    private final Map<String, JobHandler> handlers;
    private final Settings settings;
    private final JobObserver observer;
    private final Object signal = new Object();
    private final List<Thread> threads = new ArrayList<>();
    private final Map<Long, Boolean> runningHere = new ConcurrentHashMap<>();
    private final ScheduledExecutorService renewer;
    private volatile boolean running = true;

    public JobWorker(JobStore jobs, Map<String, JobHandler> handlers, Settings settings, JobObserver observer) {
        this.jobs = jobs;
        this.handlers = Map.copyOf(handlers);
        this.settings = settings;
        this.observer = observer == null ? (job, outcome, nanos) -> { } : observer;
        for (int i = 0; i < settings.threads(); i++) {
            Thread t = new Thread(this::loop, "winnow-job-worker-" + (i + 1));
            t.setDaemon(true);
            threads.add(t);
        }
        this.renewer = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "winnow-job-leases");
            t.setDaemon(true);
            return t;
        });
    }

    /** Starts the worker threads and routes the queue's wake-ups to them. */
    public void start(JobQueue queue) {
        queue.attach(this);
        long period = Math.max(1000, settings.leaseSeconds() * 1000L / 3);
        renewer.scheduleWithFixedDelay(this::renewLeases, period, period, TimeUnit.MILLISECONDS);
        threads.forEach(Thread::start);
    }

    /** Tells the worker a job was queued. */
    public void wake() {
        synchronized (signal) {
            signal.notifyAll();
        }
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

    private void loop() {
        while (running) {
            Optional<JobRecord> next;
            try {
                next = jobs.claim(settings.owner(), settings.leaseSeconds());
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
                        signal.wait(IDLE_POLL_MS);
                    } catch (InterruptedException e) {
                        return;
                    }
                }
                continue;
            }
            JobRecord job = next.get();
            runningHere.put(job.id(), Boolean.TRUE);
            try {
                jobs.runUnderLease(job.id(), settings.owner(), () -> runOne(job));
            } finally {
                runningHere.remove(job.id());
            }
            wake(); // a job that waited for this one may run now
        }
    }

    private void runOne(JobRecord job) {
        long started = System.nanoTime();
        JobHandler handler = handlers.get(job.kind());
        ProgressReporter progress = new ProgressReporter(jobs, job.id());
        JobOutcome outcome;
        try {
            if (handler == null) {
                throw new IllegalStateException("no handler for job kind '" + job.kind() + "'");
            }
            outcome = handler.run(job, progress);
        } catch (JobLease.LeaseLostException e) {
            LOG.warn("job {} ({}): {}; leaving it to that worker", job.id(), job.kind(), e.getMessage());
            return;
        } catch (Exception | OutOfMemoryError e) {
            if (!running) {
                return; // shutting down: the job stays 'running' until it is queued again (H2) or its lease expires
            }
            LOG.error("job {} ({}) failed", job.id(), job.kind(), e);
            outcome = JobOutcome.failure(progress.latest(), List.of(JobOutcome.error(null, null,
                    "internal error while running the job: " + e.getClass().getSimpleName() + ": " + e.getMessage())));
        }
        try {
            boolean recorded = jobs.finish(job.id(), settings.owner(), outcome.succeeded(), outcome.counters(),
                    outcome.errors().isEmpty() ? null : JsonText.write(outcome.errors()),
                    outcome.report().isEmpty() ? null : JsonText.write(outcome.report()));
            if (recorded) {
                observer.finished(job, outcome, System.nanoTime() - started);
            } else {
                LOG.warn("job {} ({}) was claimed by another worker meanwhile; its end is theirs to record", job.id(), job.kind());
            }
        } catch (RuntimeException e) {
            if (!running) {
                return;
            }
            LOG.error("could not record the end of job {}; marking it failed", job.id(), e);
            jobs.finish(job.id(), settings.owner(), false, outcome.counters(), JsonText.write(List.of(JobOutcome.error(null, null,
                    "internal error while recording the job's result: " + e.getMessage()))), null);
        }
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
