package dev.winnow.app;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.api.TestServer;
import org.junit.jupiter.api.Test;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** What `demo` does: loads the packaged scenario into an empty store, once, and every factor ends ready. */
class DemoLoaderEndToEndTest {

    @Test
    void loadsTheScenarioOnceAndEveryFactorIsReady() throws Exception {
        try (TestServer server = new TestServer()) {
            List<String> loaded = server.winnow().loadDemoIfEmpty();
            assertEquals(15, loaded.size(), loaded.toString());
            JsonNode panel = server.get("/v1/panels/demo-market").json();
            assertEquals(300, panel.path("dates").asInt(), panel.toString());
            assertEquals("monthly", panel.path("frequency").asText());
            JsonNode factors = server.get("/v1/factors").json().path("factors");
            assertEquals(15, factors.size());
            for (JsonNode f : factors) {
                assertEquals("ready", f.path("status").asText(), f.toString());
                assertTrue(f.path("observations").asInt() >= 290, f.toString());
            }
            assertTrue(server.winnow().loadDemoIfEmpty().isEmpty(), "a store with data is left alone");
            assertEquals(15, server.get("/v1/factors").json().path("factors").size());
        }
    }
}
