package dev.winnow.app;

import dev.winnow.api.TestServer;
import dev.winnow.store.FactorStore;
import dev.winnow.store.PanelStore;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A definition stored by a process that died before it queued the build (the two are separate writes) is built after
 * the next start instead of staying 'building' for ever.
 */
class OrphanedBuildRecoveryTest {

    @Test
    void aVersionLeftBuildingWithoutAJobIsBuiltAfterARestart() throws Exception {
        try (TestServer server = new TestServer()) {
            server.upload("/v1/panels/p/uploads", "date,security,return,score\n"
                    + "2020-01-31,A,0.01,1\n2020-01-31,B,0.02,2\n2020-02-29,A,0.03,1\n2020-02-29,B,-0.01,2\n");
            long panelId = new PanelStore(server.winnow().jdbi()).find("p").orElseThrow().id();
            // what a crash right after the definition's commit leaves behind: the version, and no job
            new FactorStore(server.winnow().jdbi()).define("orphan",
                    "{\"method\":\"sort\",\"panel\":\"p\",\"signal\":\"score\",\"buckets\":2}", "sort", panelId);
            assertEquals("building", server.get("/v1/factors/orphan").json().path("status").asText());

            server.restart();
            long deadline = System.nanoTime() + 30_000_000_000L;
            String status = "building";
            while (status.equals("building") && System.nanoTime() < deadline) {
                Thread.sleep(20);
                status = server.get("/v1/factors/orphan").json().path("status").asText();
            }
            assertEquals("ready", status);
            // formation 2020-01-31: A (score 1) short, B (score 2) long; February: -0.01 - 0.03
            assertEquals(-0.04, server.get("/v1/factors/orphan/returns").json().path("returns").get(0).asDouble(), 1e-15);
        }
    }
}
