package dev.winnow.store;

import com.zaxxer.hikari.HikariConfig;
import com.zaxxer.hikari.HikariDataSource;
import com.zaxxer.hikari.SQLExceptionOverride;
import org.flywaydb.core.Flyway;
import org.jdbi.v3.core.Jdbi;

/**
 * The store: one HikariCP connection pool for the JDBC URL, whatever the backend (embedded H2 or PostgreSQL),
 * migrated by Flyway from the migrations packaged in the jar. The pool keeps at least one connection open, which
 * also keeps an embedded H2 database open between requests; closing the pool closes it.
 */
public final class Database implements AutoCloseable {
    /** WINNOW_DB_POOL's default. */
    public static final int DEFAULT_POOL_SIZE = 16;

    private final Jdbi jdbi;
    private final HikariDataSource pool;
    private final Dialect dialect;

    /** The backends whose SQL differs in the few places DEVELOPERS.md names. */
    public enum Dialect {
        H2, POSTGRESQL;

        static Dialect of(String jdbcUrl) {
            if (jdbcUrl.startsWith("jdbc:h2:")) {
                return H2;
            }
            if (jdbcUrl.startsWith("jdbc:postgresql:")) {
                return POSTGRESQL;
            }
            throw new IllegalArgumentException("WINNOW_DB_URL must be an H2 (jdbc:h2:...) or PostgreSQL (jdbc:postgresql:...) JDBC URL");
        }
    }

    private Database(HikariDataSource pool, Dialect dialect) {
        this.pool = pool;
        this.dialect = dialect;
        this.jdbi = Jdbi.create(pool);
    }

    /** Opens the store with the default pool size. */
    public static Database open(String jdbcUrl) {
        return open(jdbcUrl, DEFAULT_POOL_SIZE, null);
    }

    /**
     * Opens a pool of at most {@code poolSize} connections and migrates the schema.
     *
     * @param metricRegistry a Micrometer MeterRegistry for the pool's metrics, or null
     */
    public static Database open(String jdbcUrl, int poolSize, Object metricRegistry) {
        if (poolSize < 1) {
            throw new IllegalArgumentException("the connection pool needs at least one connection, got " + poolSize);
        }
        Dialect dialect = Dialect.of(jdbcUrl);
        HikariConfig config = new HikariConfig();
        config.setPoolName("winnow");
        config.setJdbcUrl(jdbcUrl);
        config.setMaximumPoolSize(poolSize);
        config.setMinimumIdle(Math.min(2, poolSize));
        config.setConnectionTimeout(30_000);
        // a pool that cannot reach its database at start-up fails the start with the driver's message
        config.setInitializationFailTimeout(1);
        if (dialect == Dialect.H2) {
            // an embedded database lives as long as a connection to it: never retire them all at once
            config.setMaxLifetime(0);
        }
        // a connection that met a storage fault (H2 closes its database when a write fails) is never handed out
        // again, so once the disk has room the next connection opens the database afresh
        config.setExceptionOverride(new SQLExceptionOverride() {
            @java.lang.Override
            public SQLExceptionOverride.Override adjudicate(java.sql.SQLException e) {
                return StorageFaults.isStorageFault(e) ? SQLExceptionOverride.Override.MUST_EVICT
                        : SQLExceptionOverride.Override.CONTINUE_EVICT;
            }
        });
        if (metricRegistry != null) {
            config.setMetricRegistry(metricRegistry);
        }
        HikariDataSource pool = new HikariDataSource(config);
        try {
            Flyway.configure()
                    .dataSource(pool)
                    .locations("classpath:db/migration")
                    .load()
                    .migrate();
        } catch (RuntimeException e) {
            pool.close();
            throw e;
        }
        return new Database(pool, dialect);
    }

    /** Whether opening failed because an embedded H2 database file is locked by another process. */
    public static boolean isEmbeddedStoreInUse(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof java.sql.SQLException sql && sql.getErrorCode() == org.h2.api.ErrorCode.DATABASE_ALREADY_OPEN_1) {
                return true;
            }
        }
        return false;
    }

    public Jdbi jdbi() {
        return jdbi;
    }

    /** What a compaction did: the store file's size before and after (null when not a local H2 file), and a note. */
    public record Compaction(Long bytesBefore, Long bytesAfter, String note) {
    }

    /**
     * Compacts an H2 store: {@code SHUTDOWN COMPACT} rewrites the file without the space that revisions, failed
     * uploads and deleted rows left, then closes the database; the pool's connections are retired and the next one
     * opens the compacted file. Requests during the compaction may answer 503. Run it from the job worker, so no job
     * runs meanwhile. PostgreSQL reclaims space with autovacuum, so nothing is done there.
     */
    public Compaction compact() throws java.sql.SQLException {
        if (dialect != Dialect.H2) {
            return new Compaction(null, null, "PostgreSQL reclaims space with autovacuum; nothing to do");
        }
        java.nio.file.Path file = H2Url.storeFile(pool.getJdbcUrl()).orElse(null);
        Long before = size(file);
        awaitIdleConnections(2_000);
        try (java.sql.Connection c = pool.getConnection(); java.sql.Statement s = c.createStatement()) {
            s.execute("SHUTDOWN COMPACT");
        } catch (java.sql.SQLException closedUnderUs) {
            if (closedUnderUs.getErrorCode() != 90098 && closedUnderUs.getErrorCode() != 90121) {
                throw closedUnderUs;
            }
        }
        if (pool.getHikariPoolMXBean() != null) {
            pool.getHikariPoolMXBean().softEvictConnections();
        }
        jdbi.withHandle(h -> h.createQuery("SELECT COUNT(*) FROM jobs").mapTo(Long.class).one());
        return new Compaction(before, size(file), "compacted");
    }

    /**
     * Waits (at most {@code maxMillis}) until no connection of the pool is in use, so that a request still finishing
     * its transaction (the compaction's own enqueue among them: the worker may see the job before the request's commit
     * returns) is not cut off by {@code SHUTDOWN COMPACT}. Requests that start later may still answer 503.
     */
    private void awaitIdleConnections(long maxMillis) {
        var bean = pool.getHikariPoolMXBean();
        long deadline = System.nanoTime() + maxMillis * 1_000_000L;
        while (bean != null && bean.getActiveConnections() > 0 && System.nanoTime() < deadline) {
            try {
                Thread.sleep(5);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
    }

    private static Long size(java.nio.file.Path file) {
        try {
            return file == null ? null : java.nio.file.Files.size(file);
        } catch (java.io.IOException e) {
            return null;
        }
    }

    /** The JDBC URL the pool connects to (for a connection of its own, such as the change feed's listener). */
    String jdbcUrl() {
        return pool.getJdbcUrl();
    }

    public Dialect dialect() {
        return dialect;
    }

    @Override
    public void close() {
        pool.close(); // the last connection closing closes an embedded database
    }
}
