package dev.winnow.api;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/**
 * {@code GET /v1/factors/{f}/holdings} over HTTP against the holdings of the independent pandas implementation
 * (service/src/test/scripts/signal_fixtures.py, holdings_expected.csv), in JSON and CSV; and the 400s of the sorts
 * added with recipes (within, control, rank_weighted).
 */
class HoldingsEndToEndTest {
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final double TOLERANCE = 1e-12;
    TestServer server;

    @BeforeEach
    void start() throws IOException {
        server = new TestServer();
        assertEquals("succeeded", server.upload("/v1/panels/fixture/uploads", SignalsEndToEndTest.panelPart(null, false))
                .path("state").asText());
        assertEquals(201, server.putJson("/v1/factors/f", "{\"method\":\"external\"}", ADMIN).status());
        assertEquals("succeeded", server.upload("/v1/factors/f/uploads", SignalsEndToEndTest.resource("signal_factor.csv"))
                .path("state").asText());
    }

    @AfterEach
    void stop() throws IOException {
        server.close();
    }

    private void define(String name, String json) {
        TestServer.Reply put = server.putJson("/v1/factors/" + name, json, ADMIN);
        assertEquals(202, put.status(), put.body());
        assertEquals("succeeded", server.awaitJob(put.json().path("job").asText()).path("state").asText());
    }

    private static JsonNode fixtureDefinition(String id) throws IOException {
        for (JsonNode d : MAPPER.readTree(SignalsEndToEndTest.resource("signal_definitions.json"))) {
            if (d.get("id").asText().equals(id)) {
                return d.get("definition");
            }
        }
        throw new AssertionError(id);
    }

    private static List<String[]> expected(String id, String date) {
        List<String[]> out = new ArrayList<>();
        for (String line : SignalsEndToEndTest.resource("holdings_expected.csv").split("\n")) {
            String[] cells = line.split(",", -1);
            if (cells[0].equals(id) && cells[1].equals(date)) {
                out.add(cells);
            }
        }
        return out;
    }

    @Test
    void holdingsMatchThePandasImplementationInJsonAndCsv() throws IOException {
        define("rw", fixtureDefinition("rank_weighted_bm_monthly").toString());
        define("ctl", fixtureDefinition("control_cap_c3_b3_monthly").toString());
        define("mkt", "{\"panel\":\"fixture\",\"method\":\"market\",\"weighting\":\"cap\",\"rebalance\":\"monthly\"}");
        String[][] cases = {{"rw", "rank_weighted_bm_monthly"}, {"ctl", "control_cap_c3_b3_monthly"}, {"mkt", "market_cap_monthly"}};
        for (String[] c : cases) {
            for (String date : List.of("2023-02-22", "2023-03-27", "2023-05-12")) {
                List<String[]> want = expected(c[1], date);
                assertTrue(want.size() > 5, c[1] + " " + date);
                JsonNode h = server.get("/v1/factors/" + c[0] + "/holdings?date=" + date).json();
                assertEquals(c[0], h.path("factor").asText());
                assertEquals(1, h.path("version").asInt());
                assertEquals(date, h.path("date").asText());
                assertEquals(want.get(0)[2], h.path("formation_date").asText(), h.toString());
                List<JsonNode> got = new ArrayList<>();
                h.path("legs").path("long").forEach(got::add);
                h.path("legs").path("short").forEach(got::add);
                assertEquals(want.size(), got.size(), c[0] + " " + date);
                for (String[] w : want) {
                    JsonNode p = null;
                    for (JsonNode candidate : h.path("legs").path(w[3])) {
                        if (candidate.path("security").asText().equals(w[4])) {
                            p = candidate;
                        }
                    }
                    assertTrue(p != null, "security " + w[4] + " in leg " + w[3]);
                    assertEquals(Double.parseDouble(w[5]), p.path("weight").asDouble(), TOLERANCE);
                    assertEquals(Double.parseDouble(w[6]), p.path("drifted_weight").asDouble(), TOLERANCE);
                }
            }
        }
        assertEquals(0, server.get("/v1/factors/mkt/holdings").json().path("legs").path("short").size(), "market: long leg only");
        assertEquals(server.get("/v1/panels/fixture").json().path("last_date").asText(),
                server.get("/v1/factors/rw/holdings").json().path("date").asText(), "the date defaults to the last date");

        TestServer.Reply csv = server.get("/v1/factors/rw/holdings?date=2023-03-27&format=csv");
        assertEquals(200, csv.status());
        String[] lines = csv.body().split("\n");
        assertEquals("leg,security,weight,drifted_weight", lines[0]);
        assertEquals(expected("rank_weighted_bm_monthly", "2023-03-27").size(), lines.length - 1);
        assertTrue(lines[1].startsWith("long,"), lines[1]);
    }

    @Test
    void holdingsProblems() {
        define("mkt", "{\"panel\":\"fixture\",\"method\":\"market\",\"rebalance\":\"monthly\"}");
        assertProblem(server.get("/v1/factors/f/holdings"), 409);
        assertProblem(server.get("/v1/factors/mkt/holdings?date=2023-01-25"), 400);
        assertProblem(server.get("/v1/factors/mkt/holdings?date=2020-01-01"), 400);
        assertProblem(server.get("/v1/factors/mkt/holdings?date=soon"), 400);
        assertProblem(server.get("/v1/factors/none/holdings"), 404);
        assertProblem(server.get("/v1/factors/mkt/holdings?version=9"), 404);
    }

    private void assertRefused(String json, String expected) {
        TestServer.Reply r = server.putJson("/v1/factors/bad", json, ADMIN);
        assertProblem(r, 400);
        assertTrue(r.body().contains(expected), json + " -> " + r.body());
    }

    @Test
    void sortOptionsThatDoNotFitAreRefused() {
        ObjectNode base = MAPPER.createObjectNode().put("panel", "fixture").put("method", "sort").put("signal", "bm");
        assertRefused(base.deepCopy().put("within", "sector").set("breakpoints",
                MAPPER.createObjectNode().put("column", "listing").put("equals", "main")).toString(),
                "'within' and 'breakpoints' exclude one another");
        assertRefused(base.deepCopy().put("within", "sector").set("control",
                MAPPER.createObjectNode().put("signal", "score").put("buckets", 2)).toString(),
                "'within' and 'control' exclude one another");
        assertRefused(base.deepCopy().<ObjectNode>set("control", MAPPER.createObjectNode().put("signal", "score").put("buckets", 2))
                .set("breakpoints", MAPPER.createObjectNode().put("column", "listing").put("equals", "main")).toString(),
                "'control' and 'breakpoints' exclude one another");
        assertRefused(base.deepCopy().put("within", "region").toString(), "within column 'region' is not a label column");
        assertRefused(base.deepCopy().put("within", "bm").toString(), "within column 'bm' is not a label column");
        assertRefused(base.deepCopy().set("control", MAPPER.createObjectNode().put("signal", "score").put("buckets", 11)).toString(),
                "control.buckets must be between 2 and 10");
        assertRefused(base.deepCopy().set("control", MAPPER.createObjectNode().put("signal", "nope").put("buckets", 3)).toString(),
                "control.signal: no column 'nope'");
        assertRefused(base.deepCopy().set("control", MAPPER.createObjectNode().put("signal", "score")).toString(),
                "control must be {\\\"signal\\\"");
        assertRefused(base.deepCopy().put("method", "size_sort").put("within", "sector").toString(), "'within' applies to method sort only");
        assertRefused(base.deepCopy().put("method", "rank_weighted").put("buckets", 5).toString(), "'buckets' applies to method sort only");
        assertRefused(base.deepCopy().put("method", "rank_weighted").put("weighting", "cap").toString(),
                "'weighting' does not apply to method rank_weighted");
        assertRefused(base.deepCopy().put("method", "rank_weighted").set("breakpoints",
                MAPPER.createObjectNode().put("column", "listing").put("equals", "main")).toString(),
                "'breakpoints' does not apply to method rank_weighted");
        assertRefused(base.deepCopy().put("method", "rank_weighted").put("within", "sector").toString(),
                "'within' applies to method sort only");
        assertRefused("{\"panel\":\"fixture\",\"method\":\"rank_weighted\"}", "signal is required for method rank_weighted");
    }
}
