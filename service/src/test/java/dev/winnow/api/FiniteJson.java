package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;

import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

/** Replies whose raw bodies never carry NaN or an infinity (undefined numbers must be JSON null). */
final class FiniteJson {
    private FiniteJson() {
    }

    /** GET that must answer 200 with a finite body; returns the parsed JSON. */
    static JsonNode ok(TestServer server, String path) {
        TestServer.Reply r = server.get(path);
        assertEquals(200, r.status(), path + ": " + r.body());
        assertFinite(r, path);
        return r.json();
    }

    /** A problem+json reply with the given status and a finite body (unless the request itself sent NaN, which a detail may quote). */
    static void problem(TestServer.Reply r, int status, String request) {
        assertProblem(r, status);
        if (!request.contains("NaN")) {
            assertFinite(r, request);
        }
    }

    static void assertFinite(TestServer.Reply r, String what) {
        assertFalse(r.body().contains("NaN"), what + " has NaN: " + r.body());
        assertFalse(r.body().contains("Infinity"), what + " has an infinity: " + r.body());
    }
}
