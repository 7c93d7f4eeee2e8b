package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.app.Config;
import dev.winnow.app.Winnow;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * Several instances on one store. On PostgreSQL: an API instance and two worker instances share the schema; on H2
 * (one process only) one instance runs three worker threads, which exercises the same claim and ordering code.
 */
class SharedStoreEndToEndTest {
    private final List<AutoCloseable> open = new ArrayList<>();
    private final HttpClient client = HttpClient.newHttpClient();

    @AfterEach
    void closeAll() throws Exception {
        for (int i = open.size() - 1; i >= 0; i--) {
            open.get(i).close();
        }
    }

    /** Another instance on the store of {@code server}, with its own data directory. */
    private Winnow peer(TestServer server, Config.Instance instance) throws IOException {
        Path dir = Files.createTempDirectory("winnow-peer");
        Winnow w = Winnow.start(new Config(0, "127.0.0.1", dir, server.dbUrl(), ADMIN).withInstance(instance));
        open.add(() -> {
            w.close();
            try (var files = Files.walk(dir)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        });
        return w;
    }

    private int status(Winnow instance, String path, String token) throws Exception {
        return client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + instance.port() + path))
                .header("Authorization", "Bearer " + token).build(), HttpResponse.BodyHandlers.discarding()).statusCode();
    }

    /** Month-end rows of 12 securities with a score, one month per append. */
    private static String month(int k, int seed) {
        LocalDate date = LocalDate.of(2020, 1, 1).plusMonths(k).withDayOfMonth(1).plusMonths(1).minusDays(1);
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score\n");
        for (int s = 0; s < 12; s++) {
            csv.append(date).append(",S").append(s).append(',').append(0.001 * (((s * 7 + k * 3 + seed) % 11) - 5))
                    .append(',').append(100 + s).append(',').append((s * 5 + k + seed) % 13).append('\n');
        }
        return csv.toString();
    }

    @Test
    void jobsOnOnePanelKeepQueueOrderUnderTwoWorkers() throws Exception {
        TestServer server;
        if (TestDatabase.onPostgres()) {
            server = new TestServer(Config.Instance.DEFAULT.withRole(Config.Role.API));
            open.add(server);
            peer(server, Config.Instance.DEFAULT.withRole(Config.Role.WORKER).withWorkerThreads(2));
            peer(server, Config.Instance.DEFAULT.withRole(Config.Role.WORKER).withWorkerThreads(2));
        } else {
            server = new TestServer(Config.Instance.DEFAULT.withWorkerThreads(3));
            open.add(server);
        }
        // queued without waiting, interleaved: appends to two panels (each must run after the one before it, or it
        // fails as a date at or before the panel's last date) and factor definitions between them
        // (a definition needs its panel's columns, so the first month of each goes in first)
        List<String> jobs = new ArrayList<>();
        for (String panel : List.of("p", "q")) {
            TestServer.Reply r = server.postCsv("/v1/panels/" + panel + "/uploads", month(0, panel.equals("p") ? 1 : 2), ADMIN);
            jobs.add(r.json().path("job").asText());
            assertEquals("succeeded", server.awaitJob(r.json().path("job").asText()).path("state").asText());
        }
        for (int k = 1; k < 6; k++) {
            for (String panel : List.of("p", "q")) {
                TestServer.Reply r = server.postCsv("/v1/panels/" + panel + "/uploads", month(k, panel.equals("p") ? 1 : 2), ADMIN);
                assertEquals(202, r.status(), r.body());
                jobs.add(r.json().path("job").asText());
                if (k == 1 || k == 3) {
                    TestServer.Reply d = server.putJson("/v1/factors/" + panel + "_score_" + k, "{\"panel\":\"" + panel
                            + "\",\"method\":\"sort\",\"signal\":\"score\",\"buckets\":2,\"theme\":\"test\",\"rationale\":\"order test\"}", ADMIN);
                    assertEquals(202, d.status(), d.body());
                    jobs.add(d.json().path("job").asText());
                }
            }
        }
        for (String job : jobs) {
            JsonNode done = server.awaitJob(job);
            assertEquals("succeeded", done.path("state").asText(), done.toString());
        }
        // every pair of jobs on one panel ran one after the other in id order, unless both only read it (builds)
        Map<Long, Map<String, Object>> rows = new java.util.TreeMap<>();
        server.winnow().jdbi().useHandle(h -> h.createQuery("SELECT j.id, r.resource, r.mode, j.started_at, j.finished_at "
                        + "FROM jobs j JOIN job_resources r ON r.job_id = j.id WHERE r.resource LIKE 'panel:%'")
                .mapToMap().forEach(m -> rows.put(((Number) m.get("id")).longValue(), m)));
        assertEquals(jobs.size(), rows.size());
        for (Map<String, Object> a : rows.values()) {
            for (Map<String, Object> b : rows.values()) {
                long ia = ((Number) a.get("id")).longValue();
                long ib = ((Number) b.get("id")).longValue();
                boolean conflict = a.get("resource").equals(b.get("resource")) && ("write".equals(a.get("mode")) || "write".equals(b.get("mode")));
                if (ia < ib && conflict) {
                    OffsetDateTime finished = time(a.get("finished_at"));
                    OffsetDateTime started = time(b.get("started_at"));
                    assertFalse(started.isBefore(finished), "job " + ib + " started before job " + ia + " on " + a.get("resource") + " finished");
                }
            }
        }
        for (String panel : List.of("p", "q")) {
            JsonNode factor = server.get("/v1/factors/" + panel + "_score_1/returns").json();
            assertEquals(5, factor.path("returns").size(), factor.toString()); // six month-ends, a return for each after the first
        }
    }

    private static OffsetDateTime time(Object value) {
        if (value instanceof OffsetDateTime t) {
            return t;
        }
        if (value instanceof java.sql.Timestamp t) {
            return t.toInstant().atOffset(java.time.ZoneOffset.UTC);
        }
        return OffsetDateTime.parse(String.valueOf(value).replace(' ', 'T'));
    }

    @Test
    void aRevokedTokenIsRefusedByEveryInstanceAtOnce() throws Exception {
        assumeTrue(TestDatabase.onPostgres(), "several instances share a store only on PostgreSQL (WINNOW_TEST_DB_URL)");
        TestServer server = new TestServer(Config.Instance.DEFAULT.withRole(Config.Role.API));
        open.add(server);
        Winnow other = peer(server, Config.Instance.DEFAULT.withRole(Config.Role.API));
        Winnow third = peer(server, Config.Instance.DEFAULT);
        TestServer.Reply created = server.postJson("/v1/tokens", "{\"name\":\"dashboards\",\"scope\":\"read\"}", ADMIN);
        assertEquals(201, created.status(), created.body());
        String token = created.json().path("token").asText();
        assertEquals(200, status(other, "/v1/panels", token), "a token made on one instance works on another at once");
        assertEquals(200, status(third, "/v1/panels", token));
        long asked = System.nanoTime();
        assertEquals(204, server.delete("/v1/tokens/dashboards", ADMIN).status());
        long answered = System.nanoTime();
        // the 204 comes only once every live instance has acknowledged the new token generation: no retries here
        assertEquals(401, server.get("/v1/panels", token).status(), "refused at once by the instance that revoked it");
        assertEquals(401, status(other, "/v1/panels", token), "refused at once by another API instance");
        assertEquals(401, status(third, "/v1/panels", token), "refused at once by an instance of role all");
        System.out.printf("revocation acknowledged by every instance within its DELETE: %.1f ms%n", (answered - asked) / 1e6);
    }

    @Test
    void aWorkerInstanceServesOnlyHealthAndMetrics() throws Exception {
        TestServer server = new TestServer(TestDatabase.onPostgres() ? Config.Instance.DEFAULT.withRole(Config.Role.API)
                : Config.Instance.DEFAULT.withRole(Config.Role.WORKER));
        open.add(server);
        Winnow worker = TestDatabase.onPostgres() ? peer(server, Config.Instance.DEFAULT.withRole(Config.Role.WORKER)) : server.winnow();
        assertEquals(200, status(worker, "/health", ADMIN));
        HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + worker.port() + "/v1/panels"))
                .header("Authorization", "Bearer " + ADMIN).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(404, r.statusCode());
        assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith("application/problem+json"), r.body());
        assertTrue(r.body().contains("WINNOW_ROLE"), r.body());
    }
}
