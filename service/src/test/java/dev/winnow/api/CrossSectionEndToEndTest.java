package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.Iterator;
import java.util.Map;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Fama-MacBeth regressions, model tests and the live record over HTTP on the real server. Expected values come from
 * service/src/test/scripts/cross_section_panel_fixtures.py (numpy lstsq per period, statsmodels HAC, scipy) and
 * cross_sectional_fixtures.py (the GRS reference: numpy on the formula, scipy's F distribution, statsmodels OLS and
 * HAC), never from Winnow's own output.
 */
class CrossSectionEndToEndTest {
    static TestServer server;
    static JsonNode expected;
    static JsonNode grs;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        expected = readJson("xsection_expected.json");
        grs = readJson("grs.json");
        JsonNode job = server.upload("/v1/panels/xs/uploads", readText("xsection_panel.csv"));
        assertEquals("succeeded", job.path("state").asText(), job.toString());
        // test assets and factors of the GRS reference as monthly external series; asset a_i is uploaded as its
        // excess return plus a risk-free series, so that risk_free=rf gives back the reference's excess returns
        double[] rf = new double[grs.get("assets").get(0).size()];
        for (int t = 0; t < rf.length; t++) {
            rf[t] = 0.001 + 0.00001 * (t % 7);
        }
        external("rf", rf, null);
        for (int i = 0; i < grs.get("assets").size(); i++) {
            external("asset" + i, doubles(grs.get("assets").get(i)), rf);
        }
        for (int j = 0; j < grs.get("factors").size(); j++) {
            external("f" + j, doubles(grs.get("factors").get(j)), null);
        }
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    // Source: numpy.linalg.lstsq per period, statsmodels HAC (use_correction=False) for the NW t, scipy.stats.norm.
    @Test
    void famaMacBethMatchesNumpyAndStatsmodels() {
        check("plain", "{\"panel\":\"xs\",\"signals\":{\"value\":\"value\",\"noise\":\"noise\"}}");
        check("cap_std_lag2", "{\"panel\":\"xs\",\"signals\":{\"value\":\"value\",\"mom\":\"momentum\",\"noise\":\"noise\"},"
                + "\"lag\":2,\"standardize\":true,\"weighting\":\"cap\",\"universe\":{\"labels\":{\"sector\":{\"exclude\":[\"C\"]}}},"
                + "\"from\":\"2011-06-01\",\"to\":\"2013-12-31\"}");
    }

    private static void check(String id, String body) {
        JsonNode e = expected.get("fama_macbeth").get(id);
        TestServer.Reply reply = server.postJson("/v1/fama-macbeth", body, ADMIN);
        assertEquals(200, reply.status(), reply.body());
        FiniteJson.assertFinite(reply, id);
        JsonNode r = reply.json();
        assertEquals("xs", r.get("panel").asText());
        assertEquals(e.get("periods").asInt(), r.get("periods").asInt(), id);
        assertEquals(e.get("skipped").asInt(), r.get("skipped").asInt(), id);
        assertEquals(e.get("dates").get(0).asText(), r.get("first").asText(), id);
        assertEquals(e.get("dates").get(e.get("dates").size() - 1).asText(), r.get("last").asText(), id);
        assertEquals(e.get("dates"), r.get("series").get("dates"), id);
        assertEquals(e.get("mean_r_squared").asDouble(), r.get("mean_r_squared").asDouble(), 1e-12, id);
        assertEquals(e.get("mean_securities").asDouble(), r.get("mean_securities").asDouble(), 1e-12, id);
        for (Iterator<Map.Entry<String, JsonNode>> it = e.get("slopes").fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> s = it.next();
            JsonNode got = r.get("series").get("slopes").get(s.getKey());
            for (int t = 0; t < s.getValue().size(); t++) {
                assertEquals(s.getValue().get(t).asDouble(), got.get(t).asDouble(), 1e-12, id + " " + s.getKey() + " #" + t);
            }
        }
        for (int j = 0; j < e.get("coefficients").size(); j++) {
            JsonNode ec = e.get("coefficients").get(j);
            JsonNode rc = r.get("coefficients").get(j);
            assertEquals(ec.get("name").asText(), rc.get("name").asText());
            for (String f : new String[] {"mean", "stdev", "t_stat", "nw_t_stat", "p_value"}) {
                assertEquals(ec.get(f).asDouble(), rc.get(f).asDouble(), 1e-9 * (1 + Math.abs(ec.get(f).asDouble())), id + " " + f);
            }
            assertEquals(ec.get("nw_lags").asInt(), rc.get("nw_lags").asInt());
        }
        // the planted characteristic is significant, the noise is not (known truth of the generated panel)
        assertTrue(r.get("coefficients").get(1).get("nw_t_stat").asDouble() > 3, r.toString());
        // CSV: date,intercept,<names>, the same slopes
        TestServer.Reply csv = server.send(server.request("/v1/fama-macbeth", ADMIN).header("Content-Type", "application/json")
                .header("Accept", "text/csv").POST(java.net.http.HttpRequest.BodyPublishers.ofString(body)));
        assertEquals(200, csv.status(), csv.body());
        String[] lines = csv.body().split("\n");
        StringBuilder header = new StringBuilder("date");
        e.get("slopes").fieldNames().forEachRemaining(n -> header.append(',').append(n));
        assertEquals(header.toString(), lines[0]);
        assertEquals(e.get("periods").asInt() + 1, lines.length);
        String[] first = lines[1].split(",");
        assertEquals(e.get("dates").get(0).asText(), first[0]);
        assertEquals(e.get("slopes").get("intercept").get(0).asDouble(), Double.parseDouble(first[1]), 1e-12);
    }

    /** A recipe signal: 2 x value has, period by period, half the slope of value and the same intercept (OLS algebra). */
    @Test
    void famaMacBethTakesSignalRecipes() {
        JsonNode plain = server.postJson("/v1/fama-macbeth", "{\"panel\":\"xs\",\"signals\":{\"value\":\"value\",\"noise\":\"noise\"}}", ADMIN).json();
        TestServer.Reply reply = server.postJson("/v1/fama-macbeth", "{\"panel\":\"xs\",\"signals\":{\"value\":"
                + "{\"combine\":[{\"weight\":2,\"of\":\"value\"}]},\"noise\":\"noise\"}}", ADMIN);
        assertEquals(200, reply.status(), reply.body());
        JsonNode doubled = reply.json();
        JsonNode a = plain.get("series").get("slopes");
        JsonNode b = doubled.get("series").get("slopes");
        assertEquals(a.get("value").size(), b.get("value").size());
        for (int t = 0; t < a.get("value").size(); t++) {
            assertEquals(a.get("value").get(t).asDouble() / 2, b.get("value").get(t).asDouble(), 1e-12);
            assertEquals(a.get("intercept").get(t).asDouble(), b.get("intercept").get(t).asDouble(), 1e-12);
        }
        FiniteJson.problem(server.postJson("/v1/fama-macbeth", "{\"panel\":\"xs\",\"signals\":{\"v\":{\"log\":\"book_equity\"}}}", ADMIN), 400, "recipe");
        FiniteJson.problem(server.postJson("/v1/fama-macbeth", "{\"panel\":\"xs\",\"signals\":{\"v\":{\"sqrt\":\"value\"}}}", ADMIN), 400, "recipe");
    }

    // Source: scipy.stats.spearmanr / pearsonr per date on the securities with both (cross_section_panel_fixtures.py),
    // summaries with numpy and statsmodels HAC.
    @Test
    void informationCoefficientsMatchScipy() {
        define("ic_value", "{\"panel\":\"xs\",\"method\":\"sort\",\"signal\":\"value\",\"buckets\":3}");
        define("ic_noise", "{\"panel\":\"xs\",\"method\":\"sort\",\"signal\":\"noise\",\"lag\":2,\"weighting\":\"cap\","
                + "\"universe\":{\"labels\":{\"sector\":{\"exclude\":[\"A\"]}}}}");
        checkIc("spearman", "/v1/factors/ic_value/ic?horizons=1,2,3&min_securities=10");
        checkIc("pearson_lag2_exclude", "/v1/factors/ic_noise/ic?horizons=1,6&method=pearson&min_securities=20");
        // known truth of the generated panel: value predicts next month's return, noise does not
        JsonNode value = FiniteJson.ok(server, "/v1/factors/ic_value/ic").get("summary").get(0);
        assertTrue(value.get("t_stat").asDouble() > 3, value.toString());
        JsonNode noise = FiniteJson.ok(server, "/v1/factors/ic_noise/ic?method=pearson").get("summary").get(0);
        assertTrue(Math.abs(noise.get("mean").asDouble()) < 2 * noise.get("stdev").asDouble() / Math.sqrt(noise.get("n").asInt()), noise.toString());
        TestServer.Reply csv = server.get("/v1/factors/ic_value/ic?horizons=1,3&format=csv");
        assertEquals("date,ic_1,ic_3", csv.body().split("\n")[0]);
        for (String bad : new String[] {"/v1/factors/ic_value/ic?horizons=0", "/v1/factors/ic_value/ic?horizons=61",
                "/v1/factors/ic_value/ic?horizons=1,1", "/v1/factors/ic_value/ic?horizons=x", "/v1/factors/ic_value/ic?min_securities=2",
                "/v1/factors/ic_value/ic?method=kendall"}) {
            FiniteJson.problem(server.get(bad), 400, bad);
        }
        // the factor is named in the path: unknown is a 404
        FiniteJson.problem(server.get("/v1/factors/nope/ic"), 404, "unknown");
        FiniteJson.problem(server.get("/v1/factors/f0/ic"), 409, "external");
    }

    private static void checkIc(String id, String path) {
        JsonNode e = expected.get("ic").get(id);
        JsonNode r = FiniteJson.ok(server, path);
        assertEquals(e.get("dates"), r.get("dates"), id);
        for (Iterator<Map.Entry<String, JsonNode>> it = e.get("ic").fields(); it.hasNext(); ) {
            Map.Entry<String, JsonNode> h = it.next();
            JsonNode got = r.get("ic").get(h.getKey());
            for (int t = 0; t < h.getValue().size(); t++) {
                JsonNode want = h.getValue().get(t);
                if (want.isNull()) {
                    assertTrue(got.get(t).isNull(), id + " h=" + h.getKey() + " #" + t + " should be null");
                } else {
                    assertEquals(want.asDouble(), got.get(t).asDouble(), 1e-12, id + " h=" + h.getKey() + " #" + t);
                }
            }
        }
        for (int k = 0; k < e.get("summary").size(); k++) {
            JsonNode es = e.get("summary").get(k);
            JsonNode rs = r.get("summary").get(k);
            assertEquals(es.get("horizon").asInt(), rs.get("horizon").asInt());
            assertEquals(es.get("n").asInt(), rs.get("n").asInt(), id);
            assertEquals(es.get("nw_lags").asInt(), rs.get("nw_lags").asInt(), id);
            for (String f : new String[] {"mean", "stdev", "ic_ir", "t_stat", "nw_t_stat", "share_positive"}) {
                assertEquals(es.get(f).asDouble(), rs.get(f).asDouble(), 1e-9, id + " " + f);
            }
        }
    }

    private static void define(String name, String body) {
        TestServer.Reply put = server.putJson("/v1/factors/" + name, body, ADMIN);
        assertEquals(202, put.status(), put.body());
        JsonNode job = server.awaitJob(put.json().path("job").asText());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }

    @Test
    void famaMacBethNeedsReadScopeOnlyAndRejectsBadRequests() {
        TestServer.Reply token = server.postJson("/v1/tokens", "{\"name\":\"fm-reader\",\"scope\":\"read\"}", ADMIN);
        String reader = token.json().get("token").asText();
        assertEquals(200, server.postJson("/v1/fama-macbeth", "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"}}", reader).status());
        String[] bad = {
            "{\"panel\":\"nope\",\"signals\":{\"v\":\"value\"}}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"book_equity\"}}",
            "{\"panel\":\"xs\",\"signals\":{}}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"},\"weighting\":\"huge\"}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"},\"lag\":0}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"},\"universe\":{\"labels\":{\"colour\":{\"include\":[\"x\"]}}}}",
            "{\"panel\":\"xs\",\"signals\":{\"intercept\":\"value\"}}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"},\"extra\":1}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"sector\"}}",
            "{\"panel\":\"xs\",\"signals\":{\"v\":\"value\"},\"from\":\"2014-01-01\",\"to\":\"2012-01-01\"}",
        };
        for (String body : bad) {
            FiniteJson.problem(server.postJson("/v1/fama-macbeth", body, ADMIN), 400, body);
        }
    }

    // Source: cross_sectional_fixtures.py: GRS by numpy on the formula of Gibbons, Ross and Shanken (1989) with
    // scipy.stats.f.sf; per-asset alpha, OLS t, betas, R^2 from statsmodels OLS; alpha NW t from statsmodels HAC.
    @Test
    void modelTestMatchesTheGrsReference() {
        JsonNode r = FiniteJson.ok(server, "/v1/model-tests?factors=f0,f1,f2&assets=asset0,asset1,asset2,asset3,asset4,asset5&risk_free=rf");
        assertEquals(grs.get("assets").get(0).size(), r.get("months").asInt());
        assertEquals(grs.get("grs").asDouble(), r.get("grs").asDouble(), 1e-9);
        assertEquals(grs.get("p_value").asDouble(), r.get("p_value").asDouble(), 1e-9);
        assertEquals(grs.get("mean_abs_alpha").asDouble(), r.get("mean_abs_alpha").asDouble(), 1e-12);
        assertEquals(grs.get("mean_r_squared").asDouble(), r.get("mean_r_squared").asDouble(), 1e-10);
        assertEquals(monthEnd(0).toString(), r.get("first").asText());
        for (int i = 0; i < 6; i++) {
            JsonNode e = grs.get("regressions").get(i);
            JsonNode a = r.get("regressions").get(i);
            assertEquals("asset" + i, a.get("asset").asText());
            assertEquals(e.get("alpha").asDouble(), a.get("alpha").asDouble(), 1e-12);
            assertEquals(e.get("alpha_t").asDouble(), a.get("alpha_t").asDouble(), 1e-8);
            assertEquals(e.get("alpha_nw_t").asDouble(), a.get("alpha_nw_t").asDouble(), 1e-8);
            assertEquals(e.get("betas").get(1).asDouble(), a.get("betas").get("f1").asDouble(), 1e-10);
            assertEquals(e.get("residual_vol").asDouble(), a.get("residual_vol").asDouble(), 1e-12);
        }
    }

    @Test
    void modelTestErrorsAre400sThatSayWhatToFix() {
        String[] bad = {
            "/v1/model-tests?factors=f0&assets=nope",
            "/v1/model-tests?factors=f0",
            "/v1/model-tests?assets=asset0",
            "/v1/model-tests?factors=f0,f0&assets=asset0",
            "/v1/model-tests?factors=f0&assets=f0",
            "/v1/model-tests?factors=f0,f1&assets=asset0&from=2100-01-01",
            "/v1/model-tests?factors=f0,f1&assets=asset0,asset1,asset2&to=" + monthEnd(4),
            "/v1/model-tests?factors=f0,f1,f0copy&assets=asset0",
            "/v1/model-tests?factors=f0&assets=asset0&risk_free=nope",
        };
        external("f0copy", doubles(grs.get("factors").get(0)), null);
        for (String path : bad) {
            FiniteJson.problem(server.get(path), 400, path);
        }
        TestServer.Reply few = server.get("/v1/model-tests?factors=f0,f1&assets=asset0,asset1,asset2&to=" + monthEnd(4));
        assertTrue(few.json().get("detail").asText().contains("more than N + L = 5"), few.body());
        TestServer.Reply singular = server.get("/v1/model-tests?factors=f0,f1,f0copy&assets=asset0");
        assertTrue(singular.json().get("detail").asText().contains("drop one of the factors"), singular.body());
    }

    /** Hand-checked: series uploaded today have no month ending after today, so the live record is empty. */
    @Test
    void liveRecordCountsMonthsAfterTheRecordedDefinition() {
        JsonNode live = FiniteJson.ok(server, "/v1/factors/f0/evidence").get("live");
        assertEquals(0, live.get("after").get("n").asInt());
        assertEquals(grs.get("factors").get(0).size(), live.get("before").get("n").asInt());
        assertEquals("not_enough_data", live.get("verdict").asText());
        assertEquals(12, live.get("thresholds").get("min_live_months").asInt());
        assertTrue(live.get("defined_at").asText().startsWith(LocalDate.now(java.time.ZoneOffset.UTC).toString().substring(0, 4)));
    }

    static LocalDate monthEnd(int t) {
        return YearMonth.of(2000, 1).plusMonths(t).atEndOfMonth();
    }

    static void external(String name, double[] values, double[] plus) {
        TestServer.Reply put = server.putJson("/v1/factors/" + name,
                "{\"method\":\"external\",\"theme\":\"test\",\"rationale\":\"reference series\"}", ADMIN);
        assertEquals(201, put.status(), put.body());
        StringBuilder csv = new StringBuilder("date,return\n");
        for (int t = 0; t < values.length; t++) {
            csv.append(monthEnd(t)).append(',').append(plus == null ? values[t] : values[t] + plus[t]).append('\n');
        }
        JsonNode job = server.upload("/v1/factors/" + name + "/uploads", csv.toString());
        assertEquals("succeeded", job.path("state").asText(), job.toString());
    }

    static double[] doubles(JsonNode array) {
        double[] out = new double[array.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = array.get(i).asDouble();
        }
        return out;
    }

    static String readText(String name) throws IOException {
        try (InputStream in = CrossSectionEndToEndTest.class.getResourceAsStream("/fixtures/" + name)) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
    }

    static JsonNode readJson(String name) throws IOException {
        return new ObjectMapper().readTree(readText(name));
    }
}
