package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Map;
import java.util.Optional;

/**
 * The job queue shared by every instance on the store, with its progress reports. Ids are handed out in the order
 * jobs become visible ({@code job_queue_order}); a worker {@link #claim claims} the oldest queued job whose
 * resources no earlier unfinished job holds in a conflicting mode, and holds it under a lease it renews while the
 * job runs. A job whose lease expired (its worker died) is claimed again by another worker.
 */
public final class JobStore {
    private static final String COLUMNS = "id, kind, state, progress, rows_read, rows_accepted, rows_rejected, params, errors, report, created_at, started_at, finished_at";
    private static final RowMapper<JobRecord> MAPPER = (rs, ctx) -> new JobRecord(
            rs.getLong(1), JobKind.fromWire(rs.getString(2)), JobState.fromWire(rs.getString(3)), rs.getDouble(4), rs.getLong(5), rs.getLong(6), rs.getLong(7),
            rs.getString(8), rs.getString(9), rs.getString(10),
            rs.getObject(11, OffsetDateTime.class), rs.getObject(12, OffsetDateTime.class), rs.getObject(13, OffsetDateTime.class));

    private final Jdbi jdbi;

    public JobStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    public record JobRecord(long id, JobKind kind, JobState state, double progress, long rowsRead, long rowsAccepted,
                            long rowsRejected, String params, String errors, String report,
                            OffsetDateTime createdAt, OffsetDateTime startedAt, OffsetDateTime finishedAt) {
    }

    public record Counters(double progress, long rowsRead, long rowsAccepted, long rowsRejected) {
        public static final Counters ZERO = new Counters(0, 0, 0, 0);
    }

    /** Something a job reads or writes: {@code panel:<name>}, {@code factor:<name>}, or {@link #EVERYTHING}. */
    public record Resource(String name, boolean write) {
        public static final String EVERYTHING = "*";

        public static Resource reads(String name) {
            return new Resource(name, false);
        }

        public static Resource writes(String name) {
            return new Resource(name, true);
        }
    }

    /** Queues a job that touches everything (it keeps its order against every other job). */
    public long enqueue(JobKind kind, String paramsJson) {
        return enqueue(kind, paramsJson, java.util.List.of(Resource.writes(Resource.EVERYTHING)));
    }

    /**
     * Queues a job with the resources it reads and writes. The enqueue locks the one row of {@code job_queue_order}
     * first, so concurrent enqueues (from any instance) commit in id order and no job ever becomes visible behind
     * a later one that already started.
     */
    public long enqueue(JobKind kind, String paramsJson, java.util.List<Resource> resources) {
        if (resources.isEmpty()) {
            throw new IllegalArgumentException("a job needs at least one resource");
        }
        return jdbi.inTransaction(h -> {
            h.createUpdate("UPDATE job_queue_order SET last = last + 1 WHERE id = 1").execute();
            long id = h.createUpdate("INSERT INTO jobs (kind, state, progress, rows_read, rows_accepted, rows_rejected, params, created_at) "
                            + "VALUES (:kind, 'queued', 0, 0, 0, 0, :params, :now)")
                    .bind("kind", kind.wireName()).bind("params", paramsJson).bind("now", now())
                    .executeAndReturnGeneratedKeys("id").mapTo(Long.class).one();
            java.util.Map<String, Boolean> merged = new java.util.TreeMap<>();
            for (Resource r : resources) {
                merged.merge(r.name(), r.write(), Boolean::logicalOr);
            }
            var batch = h.prepareBatch("INSERT INTO job_resources (job_id, resource, mode) VALUES (:j, :r, :m)");
            merged.forEach((name, write) -> batch.bind("j", id).bind("r", name).bind("m", write ? "write" : "read").add());
            batch.execute();
            return id;
        });
    }

    /**
     * A queued job (or a running one whose lease expired before now) that no earlier unfinished job blocks: an
     * earlier job blocks it when they share a resource (or either touches everything) and either writes it.
     */
    private static final String CLAIMABLE = "SELECT j.id FROM jobs j WHERE (j.state = 'queued' OR (j.state = 'running' AND j.lease_until < CURRENT_TIMESTAMP)) "
            + "AND NOT EXISTS (SELECT 1 FROM job_resources rj JOIN job_resources re ON (re.resource = rj.resource OR re.resource = '*' OR rj.resource = '*') "
            + "AND (re.mode = 'write' OR rj.mode = 'write') JOIN jobs e ON e.id = re.job_id "
            + "WHERE rj.job_id = j.id AND e.id < j.id AND e.state IN ('queued', 'running')) "
            + "ORDER BY j.id FETCH FIRST 1 ROWS ONLY FOR UPDATE SKIP LOCKED";

    /**
     * Claims the next runnable job for {@code owner} with a lease of {@code leaseSeconds}: {@code SELECT ... FOR
     * UPDATE SKIP LOCKED} (the same statement on H2 and PostgreSQL), so two workers never claim the same job and a
     * worker skips a job another is claiming instead of waiting for it. Returns the job as claimed.
     */
    public Optional<JobRecord> claim(String owner, int leaseSeconds) {
        return jdbi.inTransaction(h -> {
            Optional<Long> id = h.createQuery(CLAIMABLE).mapTo(Long.class).findFirst();
            if (id.isEmpty()) {
                return Optional.<JobRecord>empty();
            }
            h.createUpdate("UPDATE jobs SET state = 'running', lease_owner = :o, lease_until = CURRENT_TIMESTAMP + CAST(:s AS INTEGER) * INTERVAL '1' SECOND, "
                            + "attempts = attempts + 1, started_at = :now, progress = 0, rows_read = 0, rows_accepted = 0, rows_rejected = 0, "
                            + "errors = NULL, report = NULL WHERE id = :id")
                    .bind("o", owner).bind("s", leaseSeconds).bind("now", now()).bind("id", id.get()).execute();
            return h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE id = :id").bind("id", id.get()).map(MAPPER).findOne();
        });
    }

    /** Extends the lease of a job {@code owner} runs; false when the lease was lost (another worker claimed the job). */
    public boolean renew(long id, String owner, int leaseSeconds) {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE jobs SET lease_until = CURRENT_TIMESTAMP + CAST(:s AS INTEGER) * INTERVAL '1' SECOND "
                        + "WHERE id = :id AND lease_owner = :o AND state = 'running'")
                .bind("s", leaseSeconds).bind("id", id).bind("o", owner).execute()) == 1;
    }

    /** How many claims a job took and which worker recorded its end (null while unfinished). */
    public record Claims(int attempts, String finishedBy) {
    }

    public Optional<Claims> claims(long id) {
        return jdbi.withHandle(h -> h.createQuery("SELECT attempts, finished_by FROM jobs WHERE id = :id").bind("id", id)
                .map((rs, ctx) -> new Claims(rs.getInt(1), rs.getString(2))).findOne());
    }

    public Optional<JobRecord> find(long id) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE id = :id")
                .bind("id", id).map(MAPPER).findOne());
    }

    /** Queued and running jobs of one kind, oldest first. */
    public java.util.List<JobRecord> unfinished(JobKind kind) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE state IN ('queued', 'running') AND kind = :k ORDER BY id")
                .bind("k", kind.wireName()).map(MAPPER).list());
    }

    /** Jobs waiting and running, for /health. */
    public record QueueCounts(long queued, long running) {
    }

    public QueueCounts queueCounts() {
        return jdbi.withHandle(h -> {
            long[] counts = new long[2];
            h.createQuery("SELECT state, COUNT(*) FROM jobs WHERE state IN ('queued', 'running') GROUP BY state")
                    .map((rs, ctx) -> Map.entry(rs.getString(1), rs.getLong(2)))
                    .forEach(e -> counts[e.getKey().equals("queued") ? 0 : 1] = e.getValue());
            return new QueueCounts(counts[0], counts[1]);
        });
    }

    public void updateProgress(long id, Counters c) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE jobs SET progress = :p, rows_read = :r, rows_accepted = :a, rows_rejected = :x WHERE id = :id")
                .bind("id", id).bind("p", c.progress()).bind("r", c.rowsRead()).bind("a", c.rowsAccepted()).bind("x", c.rowsRejected())
                .execute());
    }

    /**
     * Records the end of a job {@code owner} holds; false (and nothing recorded) when another worker claimed it
     * after this worker's lease expired.
     */
    public boolean finish(long id, String owner, boolean succeeded, Counters c, String errorsJson, String reportJson) {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE jobs SET state = :state, progress = :p, rows_read = :r, rows_accepted = :a, "
                        + "rows_rejected = :x, errors = :errors, report = :report, finished_at = :now, finished_by = :o, lease_until = NULL "
                        + "WHERE id = :id AND lease_owner = :o AND state = 'running'")
                .bind("id", id).bind("o", owner).bind("state", (succeeded ? JobState.SUCCEEDED : JobState.FAILED).wireName())
                .bind("p", succeeded ? 1.0 : c.progress()).bind("r", c.rowsRead()).bind("a", c.rowsAccepted()).bind("x", c.rowsRejected())
                .bind("errors", errorsJson).bind("report", reportJson).bind("now", now())
                .execute()) == 1;
    }

    /**
     * At the start of the only process on an embedded store: a job left running by a crash is queued again at once
     * (its staged data is discarded when it runs again), so nothing acknowledged is lost. On a shared store other
     * instances' running jobs are left alone; a dead worker's jobs come back when their leases expire.
     */
    public int requeueInterrupted() {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE jobs SET state = 'queued', progress = 0, rows_read = 0, rows_accepted = 0, "
                + "rows_rejected = 0, started_at = NULL, lease_owner = NULL, lease_until = NULL WHERE state = 'running'").execute());
    }

    /** Runs {@code body} on this thread under the lease of a job {@code owner} claimed (see {@link JobLease}). */
    public <X extends Exception> void runUnderLease(long id, String owner, JobLease.ThrowingRunnable<X> body) throws X {
        JobLease.runUnder(id, owner, body);
    }

    private static OffsetDateTime now() {
        return OffsetDateTime.now(ZoneOffset.UTC);
    }
}
