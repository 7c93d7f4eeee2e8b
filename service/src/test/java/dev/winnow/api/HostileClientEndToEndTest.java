package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Issue 14, medium findings, each as a careless or hostile client would meet it: concurrent definitions, over-long
 * identifiers, labels and rationales, job errors that must not show internals, and revoking the last admin token.
 */
class HostileClientEndToEndTest {
    private static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    private static List<TestServer.Reply> concurrently(int n, java.util.function.IntFunction<TestServer.Reply> call) throws Exception {
        ExecutorService pool = Executors.newFixedThreadPool(n);
        try {
            List<Future<TestServer.Reply>> futures = new ArrayList<>();
            java.util.concurrent.CountDownLatch go = new java.util.concurrent.CountDownLatch(1);
            for (int i = 0; i < n; i++) {
                int k = i;
                futures.add(pool.submit((Callable<TestServer.Reply>) () -> {
                    go.await();
                    return call.apply(k);
                }));
            }
            go.countDown();
            List<TestServer.Reply> replies = new ArrayList<>();
            for (Future<TestServer.Reply> f : futures) {
                replies.add(f.get());
            }
            return replies;
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void twentyConcurrentDefinitionsOfOneNewNameGiveOne201AndNineteen200() throws Exception {
        List<TestServer.Reply> replies = concurrently(20, i -> server.putJson("/v1/factors/same-new",
                "{\"method\":\"external\",\"theme\":\"rates\",\"rationale\":\"one\"}", ADMIN));
        long created = replies.stream().filter(r -> r.status() == 201).count();
        for (TestServer.Reply r : replies) {
            assertTrue(r.status() == 201 || r.status() == 200, r.status() + " " + r.body());
        }
        assertEquals(1, created);
        assertEquals(1, server.get("/v1/factors/same-new").json().path("current_version").asInt());
    }

    @Test
    void twentyConcurrentDifferentDefinitionsGetVersionsWithoutGapsOrDuplicates() throws Exception {
        List<TestServer.Reply> replies = concurrently(20, i -> server.putJson("/v1/factors/many-versions",
                "{\"method\":\"external\",\"theme\":\"rates\",\"rationale\":\"take " + i + "\"}", ADMIN));
        Set<Integer> versions = new TreeSet<>();
        for (TestServer.Reply r : replies) {
            assertEquals(201, r.status(), r.body());
            versions.add(r.json().path("version").asInt());
        }
        Set<Integer> expected = new TreeSet<>();
        for (int v = 1; v <= 20; v++) {
            expected.add(v);
        }
        assertEquals(expected, versions);
    }

    @Test
    void aSecurityIdentifierOf201CharactersIsALineAndColumnErrorWithoutInternals() {
        String longId = "X".repeat(201);
        JsonNode job = server.upload("/v1/panels/long-ids/uploads", "date,security,return\n2024-01-31,OK1,0.01\n2024-01-31," + longId + ",0.02\n");
        assertEquals("failed", job.path("state").asText(), job.toString());
        JsonNode error = job.path("errors").get(0);
        assertEquals(3, error.path("line").asInt(), job.toString());
        assertEquals("security", error.path("column").asText(), job.toString());
        assertTrue(error.path("message").asText().contains("200"), job.toString());
        assertNoInternals(job.toString());
        assertEquals("succeeded", server.upload("/v1/panels/long-ids/uploads",
                "date,security,return\n2024-01-31," + "Y".repeat(200) + ",0.02\n").path("state").asText(), "200 characters fit");
    }

    @Test
    void aLabelLongerThanTheLimitIsALineAndColumnError() {
        JsonNode job = server.upload("/v1/panels/long-labels/uploads",
                "date,security,return,sector\n2024-01-31,A,0.01,tech\n2024-01-31,B,0.02," + "s".repeat(1001) + "\n");
        assertEquals("failed", job.path("state").asText(), job.toString());
        JsonNode error = job.path("errors").get(0);
        assertEquals(3, error.path("line").asInt(), job.toString());
        assertEquals("sector", error.path("column").asText(), job.toString());
    }

    @Test
    void aRationaleOf200KilobytesIsA400() {
        TestServer.Reply r = server.putJson("/v1/factors/wordy",
                "{\"method\":\"external\",\"theme\":\"rates\",\"rationale\":\"" + "why ".repeat(50_000) + "\"}", ADMIN);
        assertProblem(r, 400);
        assertTrue(r.body().contains("rationale") && r.body().contains("10000"), r.body());
        TestServer.Reply theme = server.putJson("/v1/factors/wordy",
                "{\"method\":\"external\",\"theme\":\"" + "t".repeat(201) + "\"}", ADMIN);
        assertProblem(theme, 400);
        assertEquals(404, server.get("/v1/factors/wordy").status());
    }

    @Test
    void theLastAdminTokenCannotBeRevoked() throws IOException {
        try (TestServer own = new TestServer()) {
            TestServer.Reply last = own.delete("/v1/tokens/admin", ADMIN);
            assertProblem(last, 409);
            assertEquals(200, own.get("/v1/tokens").status(), "the admin can still work");

            TestServer.Reply created = own.postJson("/v1/tokens", "{\"name\":\"second-admin\",\"scope\":\"admin\"}", ADMIN);
            assertEquals(201, created.status(), created.body());
            String second = created.json().path("token").asText();
            assertEquals(204, own.delete("/v1/tokens/admin", second).status());
            assertProblem(own.delete("/v1/tokens/second-admin", second), 409);
        }
    }

    static void assertNoInternals(String text) {
        for (String internal : List.of("SELECT", "INSERT", "UPDATE ", "statement", "arguments", "Exception", "\tat ", "jdbc", "/tmp/")) {
            assertFalse(text.contains(internal), "job error shows internals (" + internal + "): " + text);
        }
    }
}
