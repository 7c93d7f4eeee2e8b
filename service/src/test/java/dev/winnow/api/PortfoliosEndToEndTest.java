package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Stored bucket portfolios over HTTP: every bucket of sort factors and the six of a size_sort factor against the
 * independent pandas construction (scripts/cross_section_panel_fixtures.py, which holds each bucket by the rules of
 * scripts/construction_fixtures.py), portfolio names in correlations and model tests, monotonicity in the evidence,
 * and the errors. Appends and revisions are compared with a full build in AppendAndRevisionEndToEndTest.
 */
class PortfoliosEndToEndTest {
    static TestServer server;
    static JsonNode expected;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        expected = CrossSectionEndToEndTest.readJson("xsection_expected.json").get("portfolios");
        JsonNode job = server.upload("/v1/panels/xs/uploads", CrossSectionEndToEndTest.readText("xsection_panel.csv"));
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        List<String> names = new ArrayList<>();
        expected.fieldNames().forEachRemaining(names::add);
        defineReferenceFactors(server, expected, names);
    }

    /**
     * Defines and builds on panel "xs" each named factor of the fixture's reference definitions, and an external
     * factor "cash" (which has no portfolios).
     */
    static void defineReferenceFactors(TestServer server, JsonNode expected, List<String> names) {
        for (String name : names) {
            ObjectNode def = ((ObjectNode) expected.get(name).get("definition")).deepCopy();
            def.put("panel", "xs").put("theme", "test").put("rationale", "reference portfolios");
            TestServer.Reply put = server.putJson("/v1/factors/" + name, def.toString(), ADMIN);
            assertEquals(202, put.status(), put.body());
            JsonNode built = server.awaitJob(put.json().path("job").asText());
            assertEquals("succeeded", built.path("state").asText(), built.toString());
        }
        TestServer.Reply put = server.putJson("/v1/factors/cash", "{\"method\":\"external\"}", ADMIN);
        assertEquals(201, put.status(), put.body());
        assertEquals("succeeded", server.upload("/v1/factors/cash/uploads", "date,return\n2010-02-28,0.001\n2010-03-31,0.001\n")
                .path("state").asText());
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    // Source: the independent pandas construction (construction_fixtures.py's rules), to 1e-12.
    @Test
    void everyBucketMatchesThePandasConstruction() {
        for (Iterator<Map.Entry<String, JsonNode>> it = expected.fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> e = it.next();
            JsonNode r = FiniteJson.ok(server, "/v1/factors/" + e.getKey() + "/portfolios");
            JsonNode want = e.getValue().get("portfolios");
            List<String> names = new ArrayList<>();
            want.fieldNames().forEachRemaining(names::add);
            assertEquals(names.toString(), listOf(r.get("portfolios")).toString(), e.getKey());
            assertEquals("monthly", r.get("frequency").asText());
            List<String> dates = listOf(r.get("dates"));
            int checked = 0;
            for (String name : names) {
                JsonNode series = want.get(name);
                JsonNode got = r.get("returns").get(name);
                assertEquals(dates.size(), got.size());
                for (int t = 0; t < dates.size(); t++) {
                    JsonNode w = series.get(dates.get(t));
                    if (w == null) {
                        assertTrue(got.get(t).isNull(), e.getKey() + ":" + name + " " + dates.get(t) + " should have no return");
                    } else {
                        assertEquals(w.asDouble(), got.get(t).asDouble(), 1e-12, e.getKey() + ":" + name + " " + dates.get(t));
                        checked++;
                    }
                }
                assertEquals(series.size(), (int) java.util.stream.StreamSupport.stream(got.spliterator(), false)
                        .filter(x -> !x.isNull()).count(), e.getKey() + ":" + name);
            }
            assertTrue(checked > 30 * names.size(), e.getKey() + " checked only " + checked);
        }
    }

    /** The long and short legs of a sort are its top and bottom buckets (hand rule 7): the same numbers, to the bit. */
    @Test
    void legsAreTheExtremeBuckets() {
        JsonNode p = FiniteJson.ok(server, "/v1/factors/value_q5/portfolios");
        JsonNode longLeg = FiniteJson.ok(server, "/v1/factors/value_q5/returns?leg=long");
        List<String> dates = listOf(p.get("dates"));
        for (int t = 0; t < longLeg.get("dates").size(); t++) {
            int at = dates.indexOf(longLeg.get("dates").get(t).asText());
            assertEquals(longLeg.get("returns").get(t).asDouble(), p.get("returns").get("5").get(at).asDouble(), 0.0);
        }
        JsonNode shortLmh = FiniteJson.ok(server, "/v1/factors/noise_t3/returns?leg=short");
        JsonNode q = FiniteJson.ok(server, "/v1/factors/noise_t3/portfolios");
        List<String> qDates = listOf(q.get("dates"));
        int at = qDates.indexOf(shortLmh.get("dates").get(0).asText());
        assertEquals(shortLmh.get("returns").get(0).asDouble(), q.get("returns").get("3").get(at).asDouble(), 0.0);
    }

    @Test
    void csvQuarterlyAndCumulativeForms() {
        TestServer.Reply csv = server.get("/v1/factors/value_2x3/portfolios?format=csv");
        assertEquals(200, csv.status(), csv.body());
        assertEquals("date,small_low,small_mid,small_high,big_low,big_mid,big_high", csv.body().split("\n")[0]);
        JsonNode quarterly = FiniteJson.ok(server, "/v1/factors/value_q5/portfolios?frequency=quarterly&from=2011-01-01&to=2011-12-31");
        assertEquals(4, quarterly.get("dates").size());
        // hand rule: a quarter compounds its three months
        JsonNode monthly = FiniteJson.ok(server, "/v1/factors/value_q5/portfolios?from=2011-01-01&to=2011-03-31");
        double compounded = 1;
        for (JsonNode r : monthly.get("returns").get("1")) {
            compounded *= 1 + r.asDouble();
        }
        assertEquals(compounded - 1, quarterly.get("returns").get("1").get(0).asDouble(), 1e-14);
        JsonNode cumulative = FiniteJson.ok(server, "/v1/factors/value_q5/portfolios?from=2011-01-01&to=2011-03-31&form=cumulative");
        assertEquals(compounded - 1, cumulative.get("returns").get("1").get(2).asDouble(), 1e-14);
    }

    @Test
    void portfolioNamesWorkInCorrelationsAndModelTests() {
        JsonNode c = FiniteJson.ok(server, "/v1/correlations?factors=value_q5:1,value_q5:5,value_2x3:big_high");
        assertEquals(3, c.get("matrix").size());
        JsonNode m = FiniteJson.ok(server, "/v1/model-tests?factors=value_q5&assets=value_q5:1,value_q5:3,value_2x3:small_high");
        assertEquals(3, m.get("regressions").size());
        assertEquals("value_q5:3", m.get("regressions").get(1).get("asset").asText());
        for (String bad : new String[] {"/v1/correlations?factors=value_q5:1,value_q5:9", "/v1/correlations?factors=value_q5:1,cash:1",
                "/v1/model-tests?factors=value_q5&assets=nope:1", "/v1/model-tests?factors=value_q5&assets=value_2x3:small_huge"}) {
            FiniteJson.problem(server.get(bad), 400, bad);
        }
        TestServer.Reply nine = server.get("/v1/correlations?factors=value_q5:1,value_q5:9");
        assertTrue(nine.json().get("detail").asText().contains("1, 2, 3, 4, 5"), nine.body());
    }

    @Test
    void otherMethodsAnswer409AndUnknownFactors404() {
        TestServer.Reply r = server.get("/v1/factors/cash/portfolios");
        FiniteJson.problem(r, 409, "external");
        assertTrue(r.json().get("detail").asText().contains("sort"), r.body());
        FiniteJson.problem(server.get("/v1/factors/nope/portfolios"), 404, "unknown");
        FiniteJson.problem(server.get("/v1/factors/value_q5/portfolios?version=7"), 404, "version");
        FiniteJson.problem(server.get("/v1/factors/value_q5/portfolios?frequency=daily"), 400, "finer");
    }

    /** Monotonicity on the monthly basis: bucket means equal the means of the reference buckets (pandas). */
    @Test
    void monotonicitySectionReadsTheBuckets() {
        JsonNode mono = FiniteJson.ok(server, "/v1/factors/value_q5/evidence").get("monotonicity");
        JsonNode want = expected.get("value_q5").get("portfolios");
        assertEquals(5, mono.get("buckets").size());
        assertEquals(4, mono.get("steps").size());
        for (int j = 0; j < 5; j++) {
            double sum = 0;
            int n = 0;
            for (JsonNode v : want.get(String.valueOf(j + 1))) {
                sum += v.asDouble();
                n++;
            }
            assertEquals(n, mono.get("buckets").get(j).get("n").asInt());
            assertEquals(sum / n, mono.get("buckets").get(j).get("mean").asDouble(), 1e-14);
        }
        assertEquals(0.8, mono.get("thresholds").get("min_rank_correlation").asDouble());
        assertTrue(List.of("holds", "weak", "fails").contains(mono.get("verdict").asText()), mono.toString());
        assertEquals("not_enough_data", FiniteJson.ok(server, "/v1/factors/value_2x3/evidence").get("monotonicity").get("verdict").asText());
    }

    private static List<String> listOf(JsonNode array) {
        List<String> out = new ArrayList<>();
        array.forEach(n -> out.add(n.asText()));
        return out;
    }
}
