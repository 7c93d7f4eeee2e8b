package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.mapper.RowMapper;

import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Map;
import java.util.Optional;

/** The job queue and its progress reports. Jobs run one at a time in id order. */
public final class JobStore {
    private static final String COLUMNS = "id, kind, state, progress, rows_read, rows_accepted, rows_rejected, params, errors, report, created_at, started_at, finished_at";
    private static final RowMapper<JobRecord> MAPPER = (rs, ctx) -> new JobRecord(
            rs.getLong(1), rs.getString(2), rs.getString(3), rs.getDouble(4), rs.getLong(5), rs.getLong(6), rs.getLong(7),
            rs.getString(8), rs.getString(9), rs.getString(10),
            rs.getObject(11, OffsetDateTime.class), rs.getObject(12, OffsetDateTime.class), rs.getObject(13, OffsetDateTime.class));

    private final Jdbi jdbi;

    public JobStore(Jdbi jdbi) {
        this.jdbi = jdbi;
    }

    public record JobRecord(long id, String kind, String state, double progress, long rowsRead, long rowsAccepted,
                            long rowsRejected, String params, String errors, String report,
                            OffsetDateTime createdAt, OffsetDateTime startedAt, OffsetDateTime finishedAt) {
    }

    public record Counters(double progress, long rowsRead, long rowsAccepted, long rowsRejected) {
        public static final Counters ZERO = new Counters(0, 0, 0, 0);
    }

    public long enqueue(String kind, String paramsJson) {
        return jdbi.withHandle(h -> h.createUpdate("INSERT INTO jobs (kind, state, progress, rows_read, rows_accepted, rows_rejected, params, created_at) "
                        + "VALUES (:kind, 'queued', 0, 0, 0, 0, :params, :now)")
                .bind("kind", kind).bind("params", paramsJson).bind("now", now())
                .executeAndReturnGeneratedKeys("id").mapTo(Long.class).one());
    }

    public Optional<JobRecord> find(long id) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE id = :id")
                .bind("id", id).map(MAPPER).findOne());
    }

    public Optional<JobRecord> nextQueued() {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE state = 'queued' ORDER BY id")
                .setMaxRows(1).map(MAPPER).findFirst());
    }

    /** Queued jobs of one kind, oldest first. */
    public java.util.List<JobRecord> queued(String kind) {
        return jdbi.withHandle(h -> h.createQuery("SELECT " + COLUMNS + " FROM jobs WHERE state = 'queued' AND kind = :k ORDER BY id")
                .bind("k", kind).map(MAPPER).list());
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

    public void markRunning(long id) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE jobs SET state = 'running', started_at = :now, progress = 0 WHERE id = :id")
                .bind("id", id).bind("now", now()).execute());
    }

    public void updateProgress(long id, Counters c) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE jobs SET progress = :p, rows_read = :r, rows_accepted = :a, rows_rejected = :x WHERE id = :id")
                .bind("id", id).bind("p", c.progress()).bind("r", c.rowsRead()).bind("a", c.rowsAccepted()).bind("x", c.rowsRejected())
                .execute());
    }

    public void finish(long id, boolean succeeded, Counters c, String errorsJson, String reportJson) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE jobs SET state = :state, progress = :p, rows_read = :r, rows_accepted = :a, "
                        + "rows_rejected = :x, errors = :errors, report = :report, finished_at = :now WHERE id = :id")
                .bind("id", id).bind("state", succeeded ? "succeeded" : "failed")
                .bind("p", succeeded ? 1.0 : c.progress()).bind("r", c.rowsRead()).bind("a", c.rowsAccepted()).bind("x", c.rowsRejected())
                .bind("errors", errorsJson).bind("report", reportJson).bind("now", now())
                .execute());
    }

    /** At start-up: a job left running by a crash is queued again (its staged data was discarded), so nothing acknowledged is lost. */
    public int requeueInterrupted() {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE jobs SET state = 'queued', progress = 0, rows_read = 0, rows_accepted = 0, "
                + "rows_rejected = 0, started_at = NULL WHERE state = 'running'").execute());
    }

    private static OffsetDateTime now() {
        return OffsetDateTime.now(ZoneOffset.UTC);
    }
}
