package dev.winnow.store;

import org.postgresql.PGConnection;
import org.postgresql.PGNotification;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.UUID;
import java.util.concurrent.atomic.AtomicLongArray;

/**
 * The change feed of instances sharing one PostgreSQL store. {@link #committed} bumps the local counter and sends
 * {@code NOTIFY winnow_changes} (through {@code pg_notify}, the one PostgreSQL-only statement, used only here) with
 * the topic; a listener thread on a connection of its own ({@code LISTEN winnow_changes}) bumps this instance's
 * counter for every notification another instance sent. {@link #version} stays a memory read.
 *
 * <p>Latency: PostgreSQL hands a notification to every listening session when the sending transaction commits;
 * the listener waits on its socket and wakes at once, so another instance sees a commit within its round trip to
 * the server (DEVELOPERS.md gives the figures measured here). When the listener loses its
 * connection it reconnects, and bumps every topic on reconnecting, since notifications sent meanwhile are lost:
 * caches then reload rather than serve what they held.
 */
public final class PostgresChangeFeed implements ChangeFeed, AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(PostgresChangeFeed.class);
    private static final String CHANNEL = "winnow_changes";

    private final AtomicLongArray versions = new AtomicLongArray(Topic.values().length);
    private final Database database;
    private final String self = UUID.randomUUID().toString();
    private final Thread listener;
    private volatile boolean running = true;
    private volatile Connection connection;

    private PostgresChangeFeed(Database database) {
        this.database = database;
        this.listener = new Thread(this::listen, "winnow-change-feed");
        this.listener.setDaemon(true);
    }

    /** Starts listening; returns once the first LISTEN is in place (or failed, then the thread keeps trying). */
    public static PostgresChangeFeed start(Database database) {
        PostgresChangeFeed feed = new PostgresChangeFeed(database);
        try {
            feed.connection = feed.connect();
        } catch (SQLException e) {
            LOG.warn("the change feed cannot listen yet ({}); it keeps trying", e.getMessage());
        }
        feed.listener.start();
        return feed;
    }

    @Override
    public long version(Topic topic) {
        return versions.get(topic.ordinal());
    }

    @Override
    public void committed(Topic topic) {
        versions.incrementAndGet(topic.ordinal());
        try {
            database.jdbi().useHandle(h -> h.createQuery("SELECT pg_notify(:c, :p)")
                    .bind("c", CHANNEL).bind("p", topic.name() + " " + self).mapTo(String.class).findFirst());
        } catch (RuntimeException e) {
            // the store is down: the commit already happened, and the others' listeners reconnect (and reload) with it
            LOG.warn("could not tell the other instances about a {} commit: {}", topic, e.getMessage());
        }
    }

    private Connection connect() throws SQLException {
        Connection c = DriverManager.getConnection(database.jdbcUrl());
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
                    LOG.info("the change feed listens again");
                }
                PGNotification[] notes = connection.unwrap(PGConnection.class).getNotifications(1_000);
                pause = 200;
                if (notes == null) {
                    continue;
                }
                for (PGNotification n : notes) {
                    String[] parts = n.getParameter().split(" ", 2);
                    if (parts.length == 2 && parts[1].equals(self)) {
                        continue; // our own commit, counted when it was made
                    }
                    try {
                        versions.incrementAndGet(Topic.valueOf(parts[0]).ordinal());
                    } catch (IllegalArgumentException unknownTopic) {
                        bumpAll(); // a newer instance's topic: reload everything rather than guess
                    }
                }
            } catch (SQLException e) {
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

    @Override
    public void close() {
        running = false;
        closeQuietly();
        listener.interrupt();
    }
}
