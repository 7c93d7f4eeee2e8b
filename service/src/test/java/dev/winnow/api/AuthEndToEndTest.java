package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

class AuthEndToEndTest {
    static TestServer server;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    void healthNeedsNoToken() {
        var r = server.get("/health", null);
        assertEquals(200, r.status());
        assertEquals("ok", r.json().path("status").asText());
    }

    @Test
    void missingAndUnknownTokensAre401() {
        assertProblem(server.get("/v1/panels", null), 401);
        assertProblem(server.get("/v1/panels", "wn_not-a-token"), 401);
    }

    @Test
    void tokensAreIssuedOnceListedAndRevoked() {
        var created = server.postJson("/v1/tokens", "{\"name\":\"dash\",\"scope\":\"read\"}", ADMIN);
        assertEquals(201, created.status(), created.body());
        String token = created.json().path("token").asText();
        assertTrue(token.startsWith("wn_"));

        assertEquals(200, server.get("/v1/panels", token).status());
        // read scope on a write endpoint
        assertProblem(server.postCsv("/v1/panels/p1/uploads", "date,security,return\n2020-01-31,A,0.01\n", token), 403);
        // read scope on an admin endpoint
        assertProblem(server.get("/v1/tokens", token), 403);

        JsonNode list = server.get("/v1/tokens").json().path("tokens");
        boolean listed = false;
        for (JsonNode t : list) {
            assertFalse(t.has("token"), "the list must not reveal tokens");
            assertFalse(t.has("token_hash"), "the list must not reveal hashes");
            listed |= t.path("name").asText().equals("dash") && t.path("scope").asText().equals("read");
        }
        assertTrue(listed, list.toString());

        assertProblem(server.postJson("/v1/tokens", "{\"name\":\"dash\",\"scope\":\"read\"}", ADMIN), 409);
        assertEquals(204, server.delete("/v1/tokens/dash", ADMIN).status());
        assertProblem(server.get("/v1/panels", token), 401);
        assertProblem(server.delete("/v1/tokens/dash", ADMIN), 404);
    }

    @Test
    void badTokenRequestsAre400() {
        assertProblem(server.postJson("/v1/tokens", "{\"name\":\"x\",\"scope\":\"root\"}", ADMIN), 400);
        assertProblem(server.postJson("/v1/tokens", "{\"name\":\"x\"}", ADMIN), 400);
        assertProblem(server.postJson("/v1/tokens", "{\"name\":\"x\",\"scope\":\"read\",\"extra\":1}", ADMIN), 400);
        assertProblem(server.postJson("/v1/tokens", "not json", ADMIN), 400);
        assertProblem(server.postJson("/v1/tokens", "[1,2]", ADMIN), 400);
        assertProblem(server.postJson("/v1/tokens", "{\"name\":\"bad name!\",\"scope\":\"read\"}", ADMIN), 400);
    }

    @Test
    void unknownRoutesAreProblem404() {
        assertProblem(server.get("/v1/nothing-here"), 404);
        assertProblem(server.get("/v1/jobs/999999"), 404);
        assertProblem(server.get("/v1/jobs/abc"), 404);
        assertProblem(server.delete("/v1/panels", ADMIN), 405);
    }
}
