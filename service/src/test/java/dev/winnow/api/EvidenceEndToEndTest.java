package dev.winnow.api;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The evidence endpoints over HTTP on the real server. The library is the trial_table section of the committed
 * fixture fixtures/evidence.json (service/src/test/scripts/evidence_fixture.py): its series are uploaded as external
 * factors, and the table the server computes must equal the one statsmodels (HAC t, multipletests), scipy.stats and
 * pandas computed, to 1e-10.
 */
class EvidenceEndToEndTest {
    private static final double TOLERANCE = 1e-10;
    private static TestServer server;
    private static JsonNode fixture;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        try (InputStream in = EvidenceEndToEndTest.class.getResourceAsStream("/fixtures/evidence.json")) {
            fixture = new ObjectMapper().readTree(in).get("trial_table");
        }
        int i = 0;
        for (JsonNode trial : fixture.get("trials")) {
            String name = trial.get("name").asText();
            String theme = i++ % 2 == 0 ? "even" : "odd";
            var defined = server.putJson("/v1/factors/" + name, "{\"method\":\"external\",\"theme\":\"" + theme + "\"}", ADMIN);
            assertEquals(201, defined.status(), defined.body());
            StringBuilder csv = new StringBuilder("date,return\n");
            for (int t = 0; t < trial.get("dates").size(); t++) {
                csv.append(trial.get("dates").get(t).asText()).append(',').append(trial.get("returns").get(t).asDouble()).append('\n');
            }
            JsonNode job = server.upload("/v1/factors/" + name + "/uploads", csv.toString());
            assertEquals("succeeded", job.path("state").asText(), job.toString());
        }
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    @Test
    void tableOverHttpMatchesStatsmodelsAndScipy() {
        JsonNode table = server.get("/v1/evidence").json();
        assertEquals(fixture.get("N").asInt(), table.get("trials").asInt());
        assertEquals("monthly", table.get("basis").asText());
        assertEquals(fixture.get("V").asDouble(), table.get("sharpe_variance").asDouble(), TOLERANCE);
        assertEquals(fixture.get("SR0").asDouble(), table.get("expected_max_sharpe").asDouble(), TOLERANCE);
        Map<String, JsonNode> rows = new HashMap<>();
        table.get("factors").forEach(r -> rows.put(r.get("factor").asText(), r));
        for (JsonNode want : fixture.get("rows")) {
            String name = want.get("name").asText();
            JsonNode got = rows.get(name);
            assertEquals(want.get("n").asInt(), got.get("n").asInt(), name);
            if (!want.has("p")) {
                assertTrue(got.get("nw_t_stat").isNull() && got.get("p_bh").isNull() && got.get("passes_t3").isNull(), got.toString());
                assertFalse(got.get("note").isNull(), "a trial without statistics says why");
                continue;
            }
            for (String[] field : new String[][] {{"mean", "mean"}, {"nw_t", "nw_t_stat"}, {"p", "p_value"},
                    {"p_bonferroni", "p_bonferroni"}, {"p_holm", "p_holm"}, {"p_bh", "p_bh"}, {"p_by", "p_by"},
                    {"sharpe", "sharpe_monthly"}, {"psr", "psr"}, {"deflated_sharpe", "deflated_sharpe"}}) {
                assertEquals(want.get(field[0]).asDouble(), got.get(field[1]).asDouble(), TOLERANCE, name + " " + field[1]);
            }
            assertEquals(want.get("passes_t3").asBoolean(), got.get("passes_t3").asBoolean(), name);
        }
        JsonNode excluded = table.get("excluded");
        assertEquals(1, excluded.size(), excluded.toString());
        assertEquals("quarterly", excluded.get(0).get("factor").asText());
        assertEquals("quarterly", excluded.get(0).get("frequency").asText());
    }

    @Test
    void factorEvidenceHasEverySectionWithVerdictThresholdsAndReason() {
        JsonNode evidence = server.get("/v1/factors/planted_strong/evidence").json();
        assertEquals("monthly", evidence.get("basis").asText());
        for (String section : new String[] {"significance", "stability", "breadth", "variants", "after_costs", "rationale", "redundancy"}) {
            JsonNode s = evidence.get(section);
            assertTrue(s.get("verdict").asText().matches("holds|weak|fails|not_enough_data"), section + ": " + s);
            assertTrue(s.get("thresholds").isObject(), section);
            assertFalse(s.get("reason").asText().isBlank(), section);
        }
        // uploaded series: no panel to rebuild from, no turnover; no rationale given at definition
        assertEquals("not_enough_data", evidence.at("/breadth/verdict").asText());
        assertEquals("not_enough_data", evidence.at("/after_costs/verdict").asText());
        assertEquals("fails", evidence.at("/rationale/verdict").asText());
        assertEquals(3.0, evidence.at("/significance/thresholds/t_hurdle").asDouble());
        assertEquals(rowOf("planted_strong").get("p_bh").asDouble(), evidence.at("/significance/p_bh").asDouble(), 0.0);
    }

    @Test
    void redundancyRegressesOnTheNamedFactors() {
        JsonNode redundancy = server.get("/v1/factors/planted_strong/evidence?against=noise_a,fat_tailed").json().get("redundancy");
        assertEquals(2, redundancy.get("betas").size());
        assertEquals("noise_a", redundancy.get("against").get(0).asText());
        assertTrue(redundancy.get("n").asInt() > 36, redundancy.toString());
    }

    @Test
    void badEvidenceRequestsAreProblems() {
        assertProblem(server.get("/v1/factors/nothing_here/evidence"), 404);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?version=7"), 404);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?version=x"), 400);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?against=nothing_here"), 400);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?against=planted_strong"), 400);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?against=noise_a,noise_a"), 400);
        assertProblem(server.get("/v1/factors/planted_strong/evidence?against=quarterly"), 400);
        assertProblem(server.get("/v1/themes?threshold=1.5"), 400);
        assertProblem(server.get("/v1/themes?threshold=high"), 400);
        assertProblem(server.get("/v1/themes/no_such_theme/returns"), 404);
        assertProblem(server.get("/v1/themes/even/returns?frequency=hourly"), 400);
        assertProblem(server.get("/v1/themes/even/returns?from=2020-01-01&to=2019-01-01"), 400);
    }

    @Test
    void themesListDeclaredGroupsClustersAndExclusions() {
        JsonNode themes = server.get("/v1/themes?threshold=0.5").json();
        assertEquals(0.5, themes.get("threshold").asDouble());
        assertEquals(2, themes.get("declared").size(), themes.get("declared").toString());
        int clustered = 0;
        for (JsonNode c : themes.get("clusters")) {
            clustered += c.get("factors").size();
        }
        // too_short (2 months) and quarterly cannot be clustered
        assertEquals(fixture.get("trials").size() - 2, clustered);
        assertEquals(2, themes.get("excluded").size(), themes.get("excluded").toString());
    }

    @Test
    void themeCompositeIsServedLikeASeries() {
        var json = server.get("/v1/themes/odd/returns?frequency=monthly");
        assertEquals(200, json.status(), json.body());
        JsonNode body = json.json();
        assertEquals("monthly", body.get("frequency").asText());
        assertEquals(body.get("dates").size(), body.get("returns").size());
        var csv = server.get("/v1/themes/odd/returns?frequency=monthly&format=csv");
        assertTrue(csv.body().startsWith("date,return\n"), csv.body());
        assertEquals(body.get("dates").size() + 1, csv.body().split("\n").length);
        String etag = json.header("ETag");
        var again = server.send(server.request("/v1/themes/odd/returns?frequency=monthly", ADMIN).header("If-None-Match", etag).GET());
        assertEquals(304, again.status());
    }

    private static JsonNode rowOf(String factor) {
        for (JsonNode r : server.get("/v1/evidence").json().get("factors")) {
            if (r.get("factor").asText().equals(factor)) {
                return r;
            }
        }
        throw new AssertionError("no row for " + factor);
    }
}
