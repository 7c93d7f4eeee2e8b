package dev.winnow.api;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import dev.winnow.app.seed.SeedDataFolder;
import java.io.IOException;
import java.net.http.HttpRequest;
import java.nio.file.Files;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * A variant family of 12 momentum recipes on the demo panel, end to end over HTTP: one job builds them, each is the
 * factor family-n in product order, every version is a trial in /v1/evidence with its family, the summary matches a
 * recomputation from the evidence rows, each variant's series equals the same definition built on its own, a
 * re-declaration reuses unchanged variants and retires dropped ones, and every 400.
 */
class FamiliesEndToEndTest {
    private static TestServer server;
    private static final String BASE = "{\"panel\":\"demo-market\",\"method\":\"sort\",\"rebalance\":\"monthly\","
            + "\"signal\":{\"trailing_return\":{\"periods\":11,\"skip\":1}}}";
    private static final String VARY = "{\"signal.trailing_return.periods\":[5,8,11],\"signal.trailing_return.skip\":[0,1],"
            + "\"buckets\":[5,10]}";

    @BeforeAll
    static void loadTheDemoPanel() throws IOException {
        server = new TestServer();
        byte[] panel = Files.readAllBytes(SeedDataFolder.locate().resolve("demo-market.csv.gz"));
        var upload = server.send(server.request("/v1/panels/demo-market/uploads", ADMIN).header("Content-Type", "text/csv")
                .header("Content-Encoding", "gzip").POST(HttpRequest.BodyPublishers.ofByteArray(panel)));
        assertEquals("succeeded", server.awaitJob(upload.json().path("job").asText()).path("state").asText());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    private static Map<String, JsonNode> evidenceRows() {
        Map<String, JsonNode> rows = new HashMap<>();
        for (JsonNode r : server.get("/v1/evidence").json().path("factors")) {
            rows.put(r.path("factor").asText() + "#" + r.path("version").asInt(), r);
        }
        return rows;
    }

    @Test
    void aFamilyOfTwelveIsBuiltCountedSummarisedAndRedeclared() {
        TestServer.Reply put = server.putJson("/v1/families/mom", "{\"base\":" + BASE + ",\"vary\":" + VARY
                + ",\"theme\":\"momentum\",\"rationale\":\"every lookback counted\"}", ADMIN);
        assertEquals(202, put.status(), put.body());
        assertEquals(12, put.json().path("variants").asInt());
        assertEquals(12, put.json().path("new_versions").asInt());
        JsonNode job = server.awaitJob(put.json().path("job").asText());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        assertEquals(1.0, job.path("progress").asDouble());

        JsonNode family = server.get("/v1/families/mom").json();
        assertEquals("mom", family.path("family").asText());
        assertEquals(put.json().path("job").asText(), family.path("job").asText());
        JsonNode variants = family.path("variants");
        assertEquals(12, variants.size());
        // product order, the first listed path slowest: (5,0,5), (5,0,10), (5,1,5), ...
        assertEquals("mom-1", variants.get(0).path("factor").asText());
        assertEquals("{\"signal.trailing_return.periods\":5,\"signal.trailing_return.skip\":0,\"buckets\":5}",
                variants.get(0).path("parameters").toString());
        assertEquals("{\"signal.trailing_return.periods\":5,\"signal.trailing_return.skip\":1,\"buckets\":10}",
                variants.get(3).path("parameters").toString());
        assertEquals("{\"signal.trailing_return.periods\":11,\"signal.trailing_return.skip\":1,\"buckets\":10}",
                variants.get(11).path("parameters").toString());
        JsonNode definition = server.get("/v1/factors/mom-4").json().path("definition");
        assertEquals("{\"trailing_return\":{\"periods\":5,\"skip\":1}}", definition.path("signal").toString());
        assertEquals(10, definition.path("buckets").asInt());
        assertEquals("momentum", definition.path("theme").asText());

        // every variant is a trial with its family; the summary recomputed from the evidence rows
        JsonNode table = server.get("/v1/evidence").json();
        assertEquals(12, table.path("trials").asInt());
        Map<String, JsonNode> rows = evidenceRows();
        List<Double> t = new ArrayList<>();
        String best = null;
        double bestT = Double.NEGATIVE_INFINITY;
        for (JsonNode v : variants) {
            assertEquals("ready", v.path("status").asText());
            JsonNode row = rows.get(v.path("factor").asText() + "#1");
            assertEquals("mom", row.path("family").asText());
            assertEquals(row.path("nw_t_stat").asDouble(), v.path("nw_t_stat").asDouble(), 0.0);
            assertEquals(row.path("mean").asDouble(), v.path("mean").asDouble(), 0.0);
            assertEquals(row.path("p_value").asDouble(), v.path("p_value").asDouble(), 0.0);
            assertEquals(row.path("sharpe_monthly").asDouble(), v.path("sharpe_monthly").asDouble(), 0.0);
            assertEquals(row.path("n").asInt(), v.path("n").asInt());
            double ti = row.path("nw_t_stat").asDouble();
            t.add(ti);
            if (ti > bestT) {
                bestT = ti;
                best = v.path("factor").asText();
            }
        }
        double[] sorted = t.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        JsonNode summary = family.path("summary");
        assertEquals(12, summary.path("variants").asInt());
        assertEquals(12, summary.path("ready").asInt());
        assertEquals((sorted[5] + sorted[6]) / 2, summary.path("median_nw_t").asDouble(), 1e-12);
        assertEquals(sorted[0], summary.path("min_nw_t").asDouble(), 0.0);
        assertEquals(sorted[11], summary.path("max_nw_t").asDouble(), 0.0);
        assertEquals(Arrays.stream(sorted).filter(x -> x > 0).count() / 12.0, summary.path("positive_share").asDouble(), 1e-15);
        assertEquals(Arrays.stream(sorted).filter(x -> x > 2).count() / 12.0, summary.path("significant_share").asDouble(), 1e-15);
        assertEquals(best, summary.path("best").path("factor").asText());
        JsonNode bestRow = rows.get(best + "#1");
        assertEquals(bestRow.path("p_holm").asDouble(), summary.path("best").path("p_holm").asDouble(), 0.0);
        assertEquals(bestRow.path("p_bh").asDouble(), summary.path("best").path("p_bh").asDouble(), 0.0);
        assertEquals(bestRow.path("deflated_sharpe").asDouble(), summary.path("best").path("deflated_sharpe").asDouble(), 0.0);

        // the family's members are each other's variants in the evidence
        JsonNode members = server.get("/v1/factors/mom-1/evidence").json().path("variants").path("members");
        assertEquals(12, members.size(), members.toString());

        // the shared pass gives each variant the series of the same definition built alone
        TestServer.Reply alone = server.putJson("/v1/factors/alone", definition.toString(), ADMIN);
        assertEquals("succeeded", server.awaitJob(alone.json().path("job").asText()).path("state").asText());
        assertTrue(server.get("/v1/factors/alone/returns").json().path("returns")
                .equals(server.get("/v1/factors/mom-4/returns").json().path("returns")), "the same returns");
        assertTrue(server.get("/v1/factors/alone/turnover").json().path("turnover")
                .equals(server.get("/v1/factors/mom-4/turnover").json().path("turnover")), "the same turnover");

        // the same declaration again: nothing new; fewer values: new versions where the definition changed, the rest retired
        TestServer.Reply same = server.putJson("/v1/families/mom", "{\"base\":" + BASE + ",\"vary\":" + VARY
                + ",\"theme\":\"momentum\",\"rationale\":\"every lookback counted\"}", ADMIN);
        assertEquals(200, same.status(), same.body());
        assertNull(same.json().path("job").textValue());
        assertEquals(13, server.get("/v1/evidence").json().path("trials").asInt());
        TestServer.Reply fewer = server.putJson("/v1/families/mom", "{\"base\":" + BASE
                + ",\"vary\":{\"signal.trailing_return.periods\":[5,8,11],\"signal.trailing_return.skip\":[0,1]},"
                + "\"theme\":\"momentum\",\"rationale\":\"every lookback counted\"}", ADMIN);
        assertEquals(202, fewer.status(), fewer.body());
        assertEquals(6, fewer.json().path("variants").asInt());
        assertEquals(5, fewer.json().path("new_versions").asInt(), "mom-1 (5, 0, buckets left at the default 5) has the "
                + "construction key of its earlier version (5, 0, buckets 5), so it is reused");
        server.awaitJob(fewer.json().path("job").asText());
        assertEquals(6, server.get("/v1/families/mom").json().path("variants").size());
        assertEquals(13 + 5, server.get("/v1/evidence").json().path("trials").asInt(), "retired variants remain trials");
        assertTrue(server.get("/v1/factors").json().toString().contains("\"mom-6\""));
        assertTrue(!server.get("/v1/factors").json().toString().contains("\"mom-7\""), "dropped variants are retired");
        assertEquals(1, server.get("/v1/families").json().path("families").size());

        assertEquals(204, server.delete("/v1/families/mom", ADMIN).status());
        assertProblem(server.get("/v1/families/mom"), 404);
        assertEquals(18, server.get("/v1/evidence").json().path("trials").asInt());
        assertTrue(!server.get("/v1/factors").json().toString().contains("\"mom-1\""));
    }

    private static void assertRefused(String name, String body, String expected) {
        TestServer.Reply r = server.putJson("/v1/families/" + name, body, ADMIN);
        assertProblem(r, 400);
        assertTrue(r.body().contains(expected), body + " -> " + r.body());
    }

    @Test
    void invalidFamiliesAreRefusedWhole() {
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"signal.trailing_return.periods\":[5,0]}}",
                "variant 2 (signal.trailing_return.periods=0): signal.trailing_return.periods: must be a whole number from 1");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"buckets\":[2,3,4,5,6,7,8,9,10,11,12,13,14,15,16],"
                + "\"lag\":[1,2,3,4,5,6,7,8,9,10,11,12,13,14]}}", "the family has 210 variants; at most 200");
        assertRefused("bad", "{\"base\":{\"panel\":\"demo-market\",\"method\":\"sort\",\"signal\":\"book_to_price\"},"
                + "\"vary\":{\"signal.trailing_return.periods\":[5]}}", "the base has no object at 'signal'");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"signal.combine[1].weight\":[5]}}", "the base has no array at 'signal.combine'");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"buckets\":[]}}", "vary.buckets must be a non-empty array");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{}}", "vary is required");
        assertRefused("bad", "{\"vary\":{\"buckets\":[3]}}", "base is required");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"buckets\":[3]},\"owner\":\"me\"}", "unknown field 'owner'");
        assertRefused("bad", "{\"base\":" + BASE + ",\"vary\":{\"a..b\":[3]}}", "is not a dotted path");
        assertRefused("bad", "{\"base\":{\"method\":\"external\"},\"vary\":{\"theme\":[\"a\",\"b\"]}}", "method external cannot vary");
        assertEquals(0, server.get("/v1/families").json().path("families").size(), "nothing of a refused family is kept");
        assertProblem(server.get("/v1/families/bad"), 404);
        assertProblem(server.delete("/v1/families/bad", ADMIN), 404);
    }
}
