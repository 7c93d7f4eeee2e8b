package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.app.Config;
import dev.winnow.app.Winnow;
import dev.winnow.store.PostgresChangeFeed;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * Acknowledged change generations on PostgreSQL (store.PostgresChangeFeed): a change is in effect on every live
 * instance when the request or job that made it answers, also after the instances' LISTEN connections were dropped
 * (no notification reaches them), and an instance that stopped answering is waited for at most a lease and refuses
 * to answer from its caches when it resumes until it has checked the generations again.
 */
class InstanceGenerationsEndToEndTest {
    private final List<AutoCloseable> open = new ArrayList<>();
    private final HttpClient client = HttpClient.newHttpClient();
    private TestServer server;

    @BeforeEach
    void start() throws IOException {
        assumeTrue(TestDatabase.onPostgres(), "several instances share a store only on PostgreSQL (WINNOW_TEST_DB_URL)");
        server = new TestServer(Config.Instance.DEFAULT);
        open.add(server);
    }

    @AfterEach
    void closeAll() throws Exception {
        for (int i = open.size() - 1; i >= 0; i--) {
            open.get(i).close();
        }
    }

    private Winnow peer() throws IOException {
        Path dir = Files.createTempDirectory("winnow-peer");
        Winnow w = Winnow.start(new Config(0, "127.0.0.1", dir, server.dbUrl(), ADMIN).withInstance(Config.Instance.DEFAULT.withRole(Config.Role.API)));
        open.add(() -> {
            w.close();
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        });
        return w;
    }

    private HttpResponse<String> get(int port, String path, String token) throws Exception {
        return get(URI.create("http://127.0.0.1:" + port + path), token);
    }

    private HttpResponse<String> get(URI uri, String token) throws Exception {
        return client.send(HttpRequest.newBuilder(uri).header("Authorization", "Bearer " + token).build(), HttpResponse.BodyHandlers.ofString());
    }

    private static JsonNode json(String body) throws IOException {
        return new com.fasterxml.jackson.databind.ObjectMapper().readTree(body);
    }

    private String newToken(String name) {
        TestServer.Reply created = server.postJson("/v1/tokens", "{\"name\":\"" + name + "\",\"scope\":\"read\"}", ADMIN);
        assertEquals(201, created.status(), created.body());
        return created.json().path("token").asText();
    }

    /** Ends every LISTEN session of this database's change feeds (the instances' connections drop, notifications are lost). */
    private int dropListeners() throws Exception {
        try (Connection c = DriverManager.getConnection(TestDatabase.postgresUrl()); Statement s = c.createStatement();
             ResultSet rs = s.executeQuery("SELECT COUNT(pg_terminate_backend(pid)) FROM pg_stat_activity "
                     + "WHERE application_name LIKE 'winnow-listen %' AND pid <> pg_backend_pid()")) {
            rs.next();
            return rs.getInt(1);
        }
    }

    @Test
    void changesAreInEffectEverywhereWhenAnsweredEvenWithTheListenersDropped() throws Exception {
        Winnow a = peer();
        Winnow b = peer();
        String token = newToken("dashboards");
        TreeMap<java.time.LocalDate, Double> first = new TreeMap<>(Map.of(java.time.LocalDate.of(2021, 1, 29), 0.01,
                java.time.LocalDate.of(2021, 2, 26), -0.02));
        AnalyticsEndToEndTest.external(server, "carry", first);
        for (Winnow w : List.of(a, b)) {
            assertEquals(200, get(w.port(), "/v1/panels", token).statusCode());
            assertEquals(2, json(get(w.port(), "/v1/factors/carry/returns", ADMIN).body()).get("dates").size(), "cached on every instance");
        }
        assertTrue(dropListeners() >= 3, "every instance listens on its own connection");

        long asked = System.nanoTime();
        assertEquals(204, server.delete("/v1/tokens/dashboards", ADMIN).status());
        long answered = System.nanoTime();
        for (Winnow w : List.of(a, b)) {
            assertEquals(401, get(w.port(), "/v1/panels", token).statusCode(), "refused at once without a notification");
        }
        JsonNode job = server.upload("/v1/factors/carry/uploads", "date,return\n2021-03-31,0.005\n");
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        for (Winnow w : List.of(a, b)) {
            JsonNode series = json(get(w.port(), "/v1/factors/carry/returns", ADMIN).body());
            assertEquals(3, series.get("dates").size(), "the append is served by every instance once its job succeeded");
        }
        System.out.printf("revocation with every LISTEN connection dropped acknowledged within its DELETE: %.1f ms%n",
                (answered - asked) / 1e6);
    }

    /**
     * A stopped instance (SIGSTOP: alive to the operating system, silent to the store) holds a revocation up for at
     * most a lease plus a heartbeat; resumed (SIGCONT), it refuses the token on its very first answer.
     */
    @Test
    void aStoppedInstanceIsWaitedForAtMostALeaseAndRefusesOnResuming() throws Exception {
        String token = newToken("kiosk");
        try (ChildService child = new ChildService("256m", Map.of("WINNOW_DB_URL", server.dbUrl(), "WINNOW_ROLE", "api",
                "WINNOW_ADMIN_TOKEN", ADMIN))) {
            assertEquals(200, get(child.uri("/v1/panels"), token).statusCode());
            child.signal("STOP");
            try {
                long asked = System.nanoTime();
                assertEquals(204, server.delete("/v1/tokens/kiosk", ADMIN).status());
                double waited = (System.nanoTime() - asked) / 1e9;
                double bound = PostgresChangeFeed.LEASE.plus(PostgresChangeFeed.HEARTBEAT).toMillis() / 1e3;
                assertTrue(waited <= bound + 5, "waited " + waited + " s for a stopped instance; at most the lease and a heartbeat (+ slack)");
                System.out.printf("revocation with one instance stopped answered after %.2f s (bound %.0f s)%n", waited, bound);
            } finally {
                child.signal("CONT");
            }
            assertEquals(401, get(child.uri("/v1/panels"), token).statusCode(),
                    "the resumed instance checks the generations before answering from its caches");
        }
    }

    /**
     * A commit whose announcement fails (the generations table cannot be written at that moment) stands, and the
     * heartbeat of the instance that made it announces it once the store answers again: the other instance then
     * refuses the revoked token. The failure is made in the store itself, by renaming the table away for a moment.
     * Without the retry the other instance would accept the token until some later token change.
     */
    @Test
    void aCommitWhoseAnnouncementFailedIsAnnouncedByTheHeartbeat() throws Exception {
        Winnow b = peer();
        String token = newToken("wallboard");
        assertEquals(200, get(b.port(), "/v1/panels", token).statusCode(), "cached on the other instance");
        try (Connection c = DriverManager.getConnection(server.dbUrl()); Statement s = c.createStatement()) {
            s.execute("ALTER TABLE change_generations RENAME TO change_generations_away");
            try {
                assertEquals(204, server.delete("/v1/tokens/wallboard", ADMIN).status(), "the revocation commits");
            } finally {
                s.execute("ALTER TABLE change_generations_away RENAME TO change_generations");
            }
        }
        long back = System.nanoTime();
        long deadline = back + PostgresChangeFeed.LEASE.plus(PostgresChangeFeed.HEARTBEAT).toNanos() + 5_000_000_000L;
        int status = 200;
        while (System.nanoTime() < deadline && (status = get(b.port(), "/v1/panels", token).statusCode()) != 401) {
            Thread.sleep(50);
        }
        assertEquals(401, status, "the other instance refuses the token once the heartbeat has announced the revocation");
        System.out.printf("revocation announced by the heartbeat %.2f s after the store answered again%n", (System.nanoTime() - back) / 1e9);
    }

    @Test
    void anInstanceThatShutsDownLeavesTheTable() throws Exception {
        Path dir = Files.createTempDirectory("winnow-peer");
        open.add(() -> {
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        });
        Winnow a = Winnow.start(new Config(0, "127.0.0.1", dir, server.dbUrl(), ADMIN).withInstance(Config.Instance.DEFAULT.withRole(Config.Role.API)));
        int before = rows();
        a.close();
        assertEquals(before - 1, rows(), "a closed instance removes its row, so no writer waits for it");
    }

    private int rows() throws Exception {
        try (Connection c = DriverManager.getConnection(server.dbUrl()); Statement s = c.createStatement();
             ResultSet rs = s.executeQuery("SELECT COUNT(*) FROM instance_generations")) {
            rs.next();
            return rs.getInt(1);
        }
    }
}
