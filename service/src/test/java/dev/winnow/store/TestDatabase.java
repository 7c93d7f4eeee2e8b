package dev.winnow.store;

import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.UUID;

/**
 * The store a test runs on: an H2 file under the test's directory, or, when the environment variable
 * {@code WINNOW_TEST_DB_URL} names a PostgreSQL database, a fresh schema of its own in that database (dropped by
 * {@link #close}), so tests stay independent of each other on either store.
 */
public final class TestDatabase implements AutoCloseable {
    /** The variable naming the PostgreSQL database the suite runs against; unset or blank runs it on H2. */
    public static final String VARIABLE = "WINNOW_TEST_DB_URL";

    /**
     * The read-ahead threads of the panel stores that tests make themselves (a service wires its own): one pool for
     * the test run, as one service has one; its daemon threads end a minute after the last read.
     */
    private static final PanelReadAhead READ_AHEAD = PanelReadAhead.perProcessor();

    private final String url;
    private final String schema;

    private TestDatabase(String url, String schema) {
        this.url = url;
        this.schema = schema;
    }

    /** The PostgreSQL database under test, or null when the suite runs on H2. */
    public static String postgresUrl() {
        String url = System.getenv(VARIABLE);
        return url == null || url.isBlank() ? null : url.trim();
    }

    /** A panel store over {@code jdbi} reading ahead on the tests' shared threads. */
    public static PanelStore panels(org.jdbi.v3.core.Jdbi jdbi) {
        return new PanelStore(jdbi, READ_AHEAD);
    }

    public static boolean onPostgres() {
        return postgresUrl() != null;
    }

    /** A fresh store: a new PostgreSQL schema when the suite runs there, otherwise H2 under {@code dir}. */
    public static TestDatabase fresh(Path dir, String h2Url) {
        String base = postgresUrl();
        if (base == null) {
            return new TestDatabase(h2Url, null);
        }
        String schema = "t_" + UUID.randomUUID().toString().replace("-", "").substring(0, 20);
        execute(base, "CREATE SCHEMA " + schema);
        return new TestDatabase(base + (base.contains("?") ? "&" : "?") + "currentSchema=" + schema, schema);
    }

    /** The JDBC URL of this store. */
    public String url() {
        return url;
    }

    @Override
    public void close() {
        if (schema != null) {
            execute(postgresUrl(), "DROP SCHEMA IF EXISTS " + schema + " CASCADE");
        }
    }

    private static void execute(String url, String sql) {
        try (Connection c = DriverManager.getConnection(url); Statement s = c.createStatement()) {
            s.execute(sql);
        } catch (SQLException e) {
            throw new IllegalStateException("could not run '" + sql + "' on " + VARIABLE + ": " + e.getMessage(), e);
        }
    }
}
