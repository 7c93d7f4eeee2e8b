package dev.winnow.store;

import org.jdbi.v3.core.Handle;

/**
 * The lease under which the current thread runs a job, if any. Every transaction that applies a job's result
 * (committing an upload, storing a build or a series, storing loadings) first calls {@link #hold}: it locks the
 * job's row and checks that this worker still holds the lease. A worker whose lease expired (it stalled, and
 * another worker claimed the job) therefore cannot apply the job a second time, and a worker that claims an
 * expired job waits for a commit in progress to end before it looks at what was committed.
 */
public final class JobLease {
    private static final ThreadLocal<JobLease> CURRENT = new ThreadLocal<>();

    private final long jobId;
    private final String owner;

    JobLease(long jobId, String owner) {
        this.jobId = jobId;
        this.owner = owner;
    }

    /** Thrown into a transaction of a worker that no longer holds its job's lease; the transaction rolls back. */
    public static final class LeaseLostException extends RuntimeException {
        LeaseLostException(long jobId) {
            super("job " + jobId + " was claimed by another worker after this worker's lease expired");
        }
    }

    /** Runs {@code body} on this thread under the lease of job {@code jobId} held by {@code owner}. */
    public static <X extends Exception> void runUnder(long jobId, String owner, ThrowingRunnable<X> body) throws X {
        JobLease previous = CURRENT.get();
        CURRENT.set(new JobLease(jobId, owner));
        try {
            body.run();
        } finally {
            CURRENT.set(previous);
        }
    }

    @FunctionalInterface
    public interface ThrowingRunnable<X extends Exception> {
        void run() throws X;
    }

    /**
     * Inside a transaction: locks the current job's row and fails with {@link LeaseLostException} when this worker
     * no longer holds its lease. Does nothing outside a job (API requests, tests of the stores).
     */
    static void hold(Handle h) {
        JobLease lease = CURRENT.get();
        if (lease == null) {
            return;
        }
        boolean held = h.createQuery("SELECT id FROM jobs WHERE id = :id AND lease_owner = :owner AND state = 'running' FOR UPDATE")
                .bind("id", lease.jobId).bind("owner", lease.owner).mapTo(Long.class).findOne().isPresent();
        if (!held) {
            throw new LeaseLostException(lease.jobId);
        }
    }
}
