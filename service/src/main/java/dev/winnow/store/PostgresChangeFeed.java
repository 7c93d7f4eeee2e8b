package dev.winnow.store;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.PGNotification;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.util.HashMap;
import java.util.Map;
import java.util.Properties;
import java.util.UUID;
import java.util.concurrent.atomic.AtomicLongArray;

/**
 * The change feed of instances sharing one PostgreSQL store, with acknowledged generations, so that a change is
 * in effect on every live instance when the request or job that made it answers.
 *
 * <p><b>Generations.</b> Each topic has a generation in {@code change_generations}. {@link #committed} (called by a
 * store after its transaction committed) bumps it, sends {@code NOTIFY winnow_changes} (through {@code pg_notify},
 * PostgreSQL-only like this class), and then waits until every live instance has acknowledged it in
 * {@code instance_generations}.
 *
 * <p><b>Applying.</b> An instance applies a generation by bumping its local counter for the topic (which
 * {@link #version} returns, so the caches reload on their next read) and then writing the generation as applied.
 * It learns of generations two ways: a listener thread on a connection of its own ({@code LISTEN}; a notification
 * wakes it within its round trip to the server, and it then reads the generations from the table, since the
 * channel is shared by every schema of the database), and a heartbeat every {@link #HEARTBEAT} that reads every
 * generation from the table (the full check that recovers a lost notification or a dropped LISTEN connection) and
 * writes {@code seen_at}. A bump that could not be written (the store failed right after a commit) is retried by the
 * heartbeat, so no commit stays unannounced.
 *
 * <p><b>Live instances.</b> The writer waits for the instances whose {@code seen_at} is within {@link #LEASE} of
 * the store's clock, at most {@code LEASE + HEARTBEAT}. An instance outside the lease (stopped, partitioned, dead)
 * is not waited for, and it fences itself: {@link #version} on an instance whose last successful check began more
 * than {@code LEASE} ago checks the generations synchronously first (a store round trip, and a 503 when the store
 * cannot be reached), so it never answers from caches that may miss a change it was not waited for. Both sides
 * measure the lease from a check's start (the store's clock stamps {@code seen_at} after it), so the instance fences
 * itself no later than the writer stops waiting for it. On a healthy instance {@link #version} stays a memory read.
 */
public final class PostgresChangeFeed implements ChangeFeed, AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(PostgresChangeFeed.class);
    private static final String CHANNEL = "winnow_changes";
    /** How often every instance checks the generations and renews its row. */
    public static final Duration HEARTBEAT = Duration.ofSeconds(1);
    /** How long an instance counts as live after its last check; also how stale its own check may get before it fences. */
    public static final Duration LEASE = Duration.ofSeconds(5);
    private static final long POLL_MS = 3;

    private final Database database;
    private final String self = UUID.randomUUID().toString();
    /** The counters {@link #version} answers: bumped for every generation applied and every own commit. */
    private final AtomicLongArray versions = new AtomicLongArray(Topic.values().length);
    /** The highest generation of each topic applied here. */
    private final AtomicLongArray applied = new AtomicLongArray(Topic.values().length);
    /** Topics whose generation bump failed after a commit, retried by the heartbeat. */
    private final AtomicLongArray unannounced = new AtomicLongArray(Topic.values().length);
    private final Object syncLock = new Object();
    private final Thread listener;
    private final Thread heartbeat;
    private volatile boolean running = true;
    private volatile Connection connection;
    /** System.nanoTime() at the start of the last check of the generations that succeeded. */
    private volatile long lastCheckStart;

    private PostgresChangeFeed(Database database) {
        this.database = database;
        this.listener = new Thread(this::listen, "winnow-change-feed");
        this.listener.setDaemon(true);
        this.heartbeat = new Thread(this::beat, "winnow-change-heartbeat");
        this.heartbeat.setDaemon(true);
    }

    /**
     * Registers this instance (applied: the current generations, since its caches are empty) and starts listening
     * and heartbeating; returns once the first LISTEN is in place (or failed, then the thread keeps trying).
     */
    public static PostgresChangeFeed start(Database database) {
        PostgresChangeFeed feed = new PostgresChangeFeed(database);
        feed.lastCheckStart = System.nanoTime() - LEASE.toNanos() - 1;
        try {
            feed.connection = feed.connect();
        } catch (SQLException e) {
            LOG.warn("the change feed cannot listen yet ({}); it keeps trying", e.getMessage());
        }
        try {
            feed.check();
        } catch (RuntimeException e) {
            LOG.warn("the change feed cannot read the generations yet ({}); it keeps trying", e.getMessage());
        }
        feed.listener.start();
        feed.heartbeat.start();
        return feed;
    }

    /** This instance's id in {@code instance_generations}. */
    public String instanceId() {
        return self;
    }

    @Override
    public long version(Topic topic) {
        if (System.nanoTime() - lastCheckStart > LEASE.toNanos()) {
            synchronized (syncLock) {
                if (System.nanoTime() - lastCheckStart > LEASE.toNanos()) {
                    check(); // outside the lease the writers no longer wait for us: look before answering (503 if we cannot)
                }
            }
        }
        return versions.get(topic.ordinal());
    }

    @Override
    public void committed(Topic topic) {
        versions.incrementAndGet(topic.ordinal());
        long generation;
        try {
            generation = bump(topic);
        } catch (RuntimeException e) {
            // the commit happened; the heartbeat bumps the generation once the store answers again
            unannounced.set(topic.ordinal(), 1);
            LOG.warn("could not announce a {} commit to the other instances yet ({}); the heartbeat retries", topic, e.getMessage());
            return;
        }
        awaitAcknowledged(topic, generation);
    }

    /** Bumps the topic's generation, notifies, and records it as applied here; returns the new generation. */
    private long bump(Topic topic) {
        long generation = database.jdbi().inTransaction(h -> {
            h.createUpdate("UPDATE change_generations SET generation = generation + 1 WHERE topic = :t").bind("t", topic.name()).execute();
            long g = h.createQuery("SELECT generation FROM change_generations WHERE topic = :t").bind("t", topic.name()).mapTo(Long.class).one();
            h.createQuery("SELECT pg_notify(:c, :p)").bind("c", CHANNEL).bind("p", topic.name() + " " + self)
                    .mapTo(String.class).findFirst();
            return g;
        });
        applied.accumulateAndGet(topic.ordinal(), generation, Math::max);
        acknowledge();
        return generation;
    }

    /**
     * Waits until every instance seen within the lease has applied {@code generation} of {@code topic}, at most
     * LEASE + HEARTBEAT (by then a live instance has checked by heartbeat, and a silent one is out of the lease).
     */
    private void awaitAcknowledged(Topic topic, long generation) {
        String column = column(topic);
        long deadline = System.nanoTime() + LEASE.plus(HEARTBEAT).toNanos();
        int behind = -1;
        while (System.nanoTime() < deadline) {
            try {
                behind = database.jdbi().withHandle(h -> h.createQuery("SELECT COUNT(*) FROM instance_generations WHERE "
                                + column + " < :g AND seen_at > CURRENT_TIMESTAMP - CAST(:lease AS INTERVAL)")
                        .bind("g", generation).bind("lease", LEASE.toMillis() + " milliseconds").mapTo(Integer.class).one());
            } catch (RuntimeException e) {
                LOG.warn("could not read the instances' acknowledgements of {} generation {}: {}", topic, generation, e.getMessage());
                return;
            }
            if (behind == 0) {
                return;
            }
            try {
                Thread.sleep(POLL_MS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
        LOG.warn("{} instance(s) seen within the lease did not acknowledge {} generation {} in {} ms", behind, topic, generation,
                LEASE.plus(HEARTBEAT).toMillis());
    }

    private static String column(Topic topic) {
        return switch (topic) {
            case FACTORS -> "factors_applied";
            case TOKENS -> "tokens_applied";
        };
    }

    /**
     * The full check: retries unannounced bumps, reads every generation, applies the newer ones and renews this
     * instance's row. Throws when the store cannot be reached.
     */
    private void check() {
        long start = System.nanoTime();
        for (Topic t : Topic.values()) {
            if (unannounced.compareAndSet(t.ordinal(), 1, 0)) {
                try {
                    bump(t);
                } catch (RuntimeException e) {
                    unannounced.set(t.ordinal(), 1);
                    throw e;
                }
            }
        }
        Map<String, Long> generations = new HashMap<>();
        database.jdbi().useHandle(h -> h.createQuery("SELECT topic, generation FROM change_generations")
                .map((rs, ctx) -> Map.entry(rs.getString(1), rs.getLong(2))).forEach(e -> generations.put(e.getKey(), e.getValue())));
        for (Topic t : Topic.values()) {
            Long g = generations.get(t.name());
            if (g != null) {
                apply(t, g);
            }
        }
        acknowledge();
        lastCheckStart = start;
    }

    /** Makes the caches of {@code topic} reload if {@code generation} is newer than what was applied here. */
    private boolean apply(Topic topic, long generation) {
        if (generation <= applied.get(topic.ordinal())) {
            return false;
        }
        // the counter first: any acknowledgement (another thread may write one at any moment) that includes this
        // generation must come after the caches were told to reload
        versions.incrementAndGet(topic.ordinal());
        applied.accumulateAndGet(topic.ordinal(), generation, Math::max);
        return true;
    }

    /** Writes what this instance has applied, and that it is alive, into its row (inserting it if missing). */
    private void acknowledge() {
        database.jdbi().useHandle(h -> {
            int updated = h.createUpdate("UPDATE instance_generations SET seen_at = CURRENT_TIMESTAMP, factors_applied = :f, "
                    + "tokens_applied = :t WHERE instance_id = :i").bind("f", applied.get(Topic.FACTORS.ordinal()))
                    .bind("t", applied.get(Topic.TOKENS.ordinal())).bind("i", self).execute();
            if (updated == 0) {
                insertSelf(h);
            }
        });
    }

    private void insertSelf(Handle h) {
        h.createUpdate("INSERT INTO instance_generations (instance_id, started_at, seen_at, factors_applied, tokens_applied) "
                        + "VALUES (:i, CURRENT_TIMESTAMP, CURRENT_TIMESTAMP, :f, :t)")
                .bind("i", self).bind("f", applied.get(Topic.FACTORS.ordinal())).bind("t", applied.get(Topic.TOKENS.ordinal())).execute();
    }

    private void beat() {
        long sweep = 0;
        while (running) {
            try {
                Thread.sleep(HEARTBEAT.toMillis());
            } catch (InterruptedException stop) {
                return;
            }
            try {
                synchronized (syncLock) {
                    check();
                }
                if (++sweep % 60 == 0) {
                    // rows of instances gone for many leases (killed without leaving): nobody waits for them anyway
                    database.jdbi().useHandle(h -> h.createUpdate("DELETE FROM instance_generations WHERE seen_at < "
                            + "CURRENT_TIMESTAMP - CAST(:gone AS INTERVAL)").bind("gone", LEASE.multipliedBy(20).toMillis() + " milliseconds").execute());
                }
            } catch (RuntimeException e) {
                if (running) {
                    LOG.warn("the change feed's heartbeat failed ({}); retrying", e.getMessage());
                }
            }
        }
    }

    private Connection connect() throws SQLException {
        Properties props = new Properties();
        props.setProperty("ApplicationName", "winnow-listen " + self);
        Connection c = DriverManager.getConnection(database.jdbcUrl(), props);
        try (Statement s = c.createStatement()) {
            s.execute("LISTEN " + CHANNEL);
        }
        return c;
    }

    private void listen() {
        long pause = 200;
        while (running) {
            try {
                if (connection == null || connection.isClosed()) {
                    connection = connect();
                    bumpAll(); // whatever was sent while nobody listened is unknown: reload everything
                    synchronized (syncLock) {
                        check(); // and apply what the generations say right away, rather than at the next heartbeat
                    }
                    LOG.info("the change feed listens again");
                }
                PGNotification[] notes = connection.unwrap(PGConnection.class).getNotifications(1_000);
                pause = 200;
                if (notes == null) {
                    continue;
                }
                boolean others = false;
                for (PGNotification n : notes) {
                    others |= !n.getParameter().endsWith(" " + self); // our own commits were applied when made
                }
                if (others) {
                    // the table, not the payload, says what to apply: the channel is per database, and instances on
                    // other schemas of it notify too
                    synchronized (syncLock) {
                        check();
                    }
                }
            } catch (SQLException | RuntimeException e) {
                if (!running) {
                    return;
                }
                LOG.warn("the change feed lost its connection ({}); reconnecting", e.getMessage());
                closeQuietly();
                try {
                    Thread.sleep(pause);
                } catch (InterruptedException stop) {
                    return;
                }
                pause = Math.min(5_000, pause * 2);
            }
        }
    }

    private void bumpAll() {
        for (Topic t : Topic.values()) {
            versions.incrementAndGet(t.ordinal());
        }
    }

    private void closeQuietly() {
        Connection c = connection;
        connection = null;
        if (c != null) {
            try {
                c.close();
            } catch (SQLException ignored) {
                // closing a broken connection
            }
        }
    }

    /** Stops listening and leaves: the row goes, so no writer waits for an instance that shut down. */
    @Override
    public void close() {
        running = false;
        listener.interrupt();
        heartbeat.interrupt();
        closeQuietly();
        try {
            database.jdbi().useHandle(h -> h.createUpdate("DELETE FROM instance_generations WHERE instance_id = :i").bind("i", self).execute());
        } catch (RuntimeException e) {
            LOG.warn("could not remove this instance from instance_generations ({}); it ages out of the lease", e.getMessage());
        }
    }
}
