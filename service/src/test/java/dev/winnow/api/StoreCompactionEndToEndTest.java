package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.store.TestDatabase;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Issue 14: the store never shrank after revisions and failed uploads. POST /v1/admin/compact runs a job that
 * compacts an H2 store (smaller file, same data, service carries on); on PostgreSQL it says autovacuum does it.
 */
class StoreCompactionEndToEndTest {

    @Test
    void compactionGivesBackTheSpaceOfRevisionsAndTheServiceCarriesOn() throws Exception {
        try (TestServer server = new TestServer()) {
            String panel = panel(300, 60);
            assertEquals("succeeded", server.upload("/v1/panels/p/uploads", panel).path("state").asText());
            for (int i = 0; i < 4; i++) {
                assertEquals("succeeded", server.upload("/v1/panels/p/uploads?mode=revise", panel).path("state").asText());
            }
            long rows = server.get("/v1/panels/p").json().path("rows").asLong();

            String writer = server.postJson("/v1/tokens", "{\"name\":\"writer\",\"scope\":\"write\"}", ADMIN).json().path("token").asText();
            TestServer.assertProblem(server.postJson("/v1/admin/compact", "{}", writer), 403);

            TestServer.Reply accepted = server.postJson("/v1/admin/compact", "{}", ADMIN);
            assertEquals(202, accepted.status(), accepted.body());
            JsonNode job = server.awaitJob(accepted.json().path("job").asText());
            assertEquals("succeeded", job.path("state").asText(), job.toString());
            JsonNode report = job.path("report");
            if (TestDatabase.onPostgres()) {
                assertTrue(report.path("note").asText().contains("autovacuum"), report.toString());
            } else {
                long before = report.path("store_bytes_before").asLong();
                long after = report.path("store_bytes_after").asLong();
                assertTrue(after > 0 && after < before, "compaction shrinks the store: " + report);
                System.out.println("store compaction: " + before + " -> " + after + " bytes");
            }
            assertEquals(rows, server.get("/v1/panels/p").json().path("rows").asLong());
            assertEquals("succeeded", server.upload("/v1/panels/q/uploads", panel(3, 2)).path("state").asText());
            assertEquals(200, server.get("/health", null).status());
        }
    }

    private static String panel(int securities, int dates) {
        StringBuilder csv = new StringBuilder("date,security,return,market_cap,score\n");
        LocalDate d = LocalDate.of(2020, 1, 1);
        for (int t = 0; t < dates; t++, d = d.plusDays(1)) {
            for (int s = 0; s < securities; s++) {
                csv.append(d).append(",S").append(s).append(',').append(0.001 * ((s + t) % 7 - 3)).append(',')
                        .append(100 + s).append(',').append(Math.sin(s * 0.7 + t)).append('\n');
            }
        }
        return csv.toString();
    }
}
