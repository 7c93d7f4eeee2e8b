package dev.winnow.store;

import org.flywaydb.core.Flyway;
import org.h2.jdbcx.JdbcConnectionPool;
import org.jdbi.v3.core.Jdbi;

import javax.sql.DataSource;

/**
 * The store: a pooled DataSource for the JDBC URL, migrated by Flyway from the migrations packaged in the jar.
 * H2 gets its own connection pool, which also keeps the embedded database open between requests.
 */
public final class Database implements AutoCloseable {
    private final Jdbi jdbi;
    private final JdbcConnectionPool h2Pool;

    private Database(Jdbi jdbi, JdbcConnectionPool h2Pool) {
        this.jdbi = jdbi;
        this.h2Pool = h2Pool;
    }

    public static Database open(String jdbcUrl) {
        JdbcConnectionPool pool = null;
        DataSource dataSource;
        if (jdbcUrl.startsWith("jdbc:h2:")) {
            pool = JdbcConnectionPool.create(jdbcUrl, "", "");
            pool.setMaxConnections(32);
            dataSource = pool;
        } else {
            dataSource = new DriverManagerDataSource(jdbcUrl);
        }
        Flyway.configure()
                .dataSource(dataSource)
                .locations("classpath:db/migration")
                .load()
                .migrate();
        return new Database(Jdbi.create(dataSource), pool);
    }

    public Jdbi jdbi() {
        return jdbi;
    }

    @Override
    public void close() {
        if (h2Pool != null) {
            h2Pool.dispose(); // the last connection closing closes the embedded database
        }
    }
}
