package dev.winnow.app;

import dev.winnow.api.TestServer;
import dev.winnow.store.FactorStore;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A definition stored by a process that died before it queued the build (the two are separate writes) is built after
 * the next start instead of staying 'building' for ever.
 */
class OrphanedBuildRecoveryTest {

    @Test
    void leftoversOfACrashAreRepairedAtTheNextStart() throws Exception {
        try (TestServer server = new TestServer()) {
            server.upload("/v1/panels/p/uploads", "date,security,return,score\n"
                    + "2020-01-31,A,0.01,1\n2020-01-31,B,0.02,2\n2020-02-29,A,0.03,1\n2020-02-29,B,-0.01,2\n");
            long panelId = TestDatabase.panels(server.winnow().jdbi()).find("p").orElseThrow().id();
            // what a crash right after the definition's commit leaves behind: the version, and no job
            new FactorStore(server.winnow().jdbi()).define("orphan",
                    "{\"method\":\"sort\",\"panel\":\"p\",\"signal\":\"score\",\"buckets\":2}", dev.winnow.construct.FactorDefinition.Method.SORT, panelId);
            assertEquals("building", server.get("/v1/factors/orphan").json().path("status").asText());

            // and a body spooled by an upload that died before its job was queued (never acknowledged)
            java.nio.file.Path stray = server.dataDir().resolve("spool").resolve("stray.upload");
            java.nio.file.Files.createDirectories(stray.getParent());
            java.nio.file.Files.writeString(stray, "date,security,return\n");

            server.restart();
            org.junit.jupiter.api.Assertions.assertFalse(java.nio.file.Files.exists(stray), "the unacknowledged spool file is removed");
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
