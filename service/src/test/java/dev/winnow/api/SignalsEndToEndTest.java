package dev.winnow.api;

import static dev.winnow.api.TestServer.ADMIN;
import static dev.winnow.api.TestServer.assertProblem;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/**
 * Signal recipes over HTTP, against the fixtures of service/src/test/scripts/signal_fixtures.py (an independent
 * pandas/numpy/scipy implementation of the recipe rules): {@code GET /v1/panels/{panel}/signals} in JSON and CSV, a
 * factor on a recipe built and then extended by appends to the same series as the script's full build, recipe
 * spellings that make the same version, and every 400 a recipe can earn, with its path.
 */
class SignalsEndToEndTest {
    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final double TOLERANCE = 1e-12;
    TestServer server;

    @BeforeEach
    void start() throws IOException {
        server = new TestServer();
    }

    @AfterEach
    void stop() throws IOException {
        server.close();
    }

    static String resource(String name) {
        try (InputStream in = SignalsEndToEndTest.class.getResourceAsStream("/fixtures/" + name)) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new AssertionError(e);
        }
    }

    /**
     * The fixture panel's header plus its rows whose date is before (or, with after, on or after) the cut. A market
     * cap of 0 (which uploads refuse) is sent as an empty cell: every recipe and factor these tests use treats both
     * as missing (log and ratio of a cap of 0 are missing, and eligibility needs a positive cap).
     */
    static String panelPart(String cut, boolean after) {
        String[] lines = resource("construction_panel.csv").split("\n");
        StringBuilder sb = new StringBuilder(lines[0]).append('\n');
        for (int i = 1; i < lines.length; i++) {
            String[] cells = lines[i].split(",", -1);
            if (cells[3].equals("0")) {
                cells[3] = "";
            }
            if (cut == null || (lines[i].substring(0, 10).compareTo(cut) >= 0) == after) {
                sb.append(String.join(",", cells)).append('\n');
            }
        }
        return sb.toString();
    }

    private void loadPanelAndFactor() {
        assertEquals("succeeded", server.upload("/v1/panels/fixture/uploads", panelPart(null, false)).path("state").asText());
        loadFactor();
    }

    private void loadFactor() {
        assertEquals(201, server.putJson("/v1/factors/f", "{\"method\":\"external\",\"theme\":\"test\",\"rationale\":\"fixture\"}", ADMIN).status());
        assertEquals("succeeded", server.upload("/v1/factors/f/uploads", resource("signal_factor.csv")).path("state").asText());
    }

    private static String encode(String text) {
        return URLEncoder.encode(text, StandardCharsets.UTF_8);
    }

    /** date -> security -> value text, for one fixture recipe. */
    private static Map<String, Map<String, String>> expected(String id) {
        Map<String, Map<String, String>> out = new HashMap<>();
        for (String line : resource("signal_values.csv").split("\n")) {
            String[] cells = line.split(",", -1);
            if (cells[0].equals(id)) {
                out.computeIfAbsent(cells[1], k -> new HashMap<>()).put(cells[2], cells[3]);
            }
        }
        return out;
    }

    private static JsonNode fixtureRecipe(String id) throws IOException {
        for (JsonNode r : MAPPER.readTree(resource("signal_recipes.json"))) {
            if (r.get("id").asText().equals(id)) {
                return r;
            }
        }
        throw new AssertionError("no fixture recipe " + id);
    }

    @Test
    void signalsShowWhatARecipeComputesInJsonAndCsv() throws IOException {
        loadPanelAndFactor();
        for (String id : List.of("nested_value_momentum", "low_beta", "neutral_value", "trailing_mean_of_rank")) {
            JsonNode recipe = fixtureRecipe(id);
            Map<String, Map<String, String>> want = expected(id);
            List<String> dates = new ArrayList<>(new java.util.TreeSet<>(want.keySet()));
            for (String date : List.of(dates.get(15), dates.get(dates.size() - 1))) {
                TestServer.Reply r = server.get("/v1/panels/fixture/signals?signal=" + encode(recipe.get("signal").toString())
                        + "&date=" + date);
                assertEquals(200, r.status(), r.body());
                JsonNode body = r.json();
                assertEquals("fixture", body.path("panel").asText());
                assertEquals(date, body.path("date").asText());
                assertEquals(recipe.get("canonical").toString(), body.path("signal").toString());
                Map<String, String> atDate = want.get(date);
                assertEquals(atDate.size(), body.path("securities").size(), id + " " + date);
                for (JsonNode s : body.path("securities")) {
                    String cell = atDate.get(s.path("security").asText());
                    if (cell.isEmpty()) {
                        assertTrue(s.path("value").isNull(), id + " " + date + " " + s);
                    } else {
                        assertEquals(Double.parseDouble(cell), s.path("value").asDouble(), TOLERANCE, id + " " + date + " " + s);
                    }
                }
            }
        }
        JsonNode last = server.get("/v1/panels/fixture/signals?signal=bm").json();
        assertEquals(server.get("/v1/panels/fixture").json().path("last_date").asText(), last.path("date").asText(),
                "the date defaults to the panel's last date");
        assertEquals("{\"column\":\"bm\"}", last.path("signal").toString());

        String csvDate = new java.util.TreeSet<>(expected("rank_bm").keySet()).first();
        TestServer.Reply csv = server.send(server.request("/v1/panels/fixture/signals?signal=" + encode("{\"rank\":\"bm\"}")
                + "&date=" + csvDate, ADMIN).header("Accept", "text/csv").GET());
        assertEquals(200, csv.status(), csv.body());
        assertTrue(csv.header("Content-Type").startsWith("text/csv"), csv.header("Content-Type"));
        String[] lines = csv.body().split("\n");
        assertEquals("security,value", lines[0]);
        Map<String, String> want = expected("rank_bm").get(csvDate);
        assertEquals(want.size(), lines.length - 1);
        for (int i = 1; i < lines.length; i++) {
            String[] cells = lines[i].split(",", -1);
            String cell = want.get(cells[0]);
            if (cell.isEmpty()) {
                assertEquals("", cells[1], lines[i]);
            } else {
                assertEquals(Double.parseDouble(cell), Double.parseDouble(cells[1]), TOLERANCE, lines[i]);
            }
        }
    }

    @Test
    void aRecipeFactorExtendedByAppendsEqualsTheFullBuildOfTheScript() throws IOException {
        assertEquals("succeeded", server.upload("/v1/panels/fixture/uploads", panelPart("2023-03-20", false)).path("state").asText());
        loadFactor();
        JsonNode definitions = MAPPER.readTree(resource("signal_definitions.json"));
        Map<String, JsonNode> byId = new LinkedHashMap<>();
        definitions.forEach(d -> byId.put(d.get("id").asText(), d.get("definition")));
        for (String id : List.of("sort_low_beta_every_lmh", "sort_momentum_monthly", "size_sort_composite")) {
            TestServer.Reply put = server.putJson("/v1/factors/" + id.replace('_', '-'), withText(byId.get(id)), ADMIN);
            assertEquals(202, put.status(), put.body());
            assertEquals("succeeded", server.awaitJob(put.json().path("job").asText()).path("state").asText());
        }
        assertEquals("succeeded", server.upload("/v1/panels/fixture/uploads", panelPart("2023-03-20", true)).path("state").asText());
        for (String id : List.of("sort_low_beta_every_lmh", "sort_momentum_monthly", "size_sort_composite")) {
            JsonNode returns = server.get("/v1/factors/" + id.replace('_', '-') + "/returns").json();
            List<String[]> want = new ArrayList<>();
            for (String line : resource("signal_expected.csv").split("\n")) {
                String[] cells = line.split(",", -1);
                if (cells[0].equals(id) && cells[1].equals("obs")) {
                    want.add(cells);
                }
            }
            assertEquals(want.size(), returns.path("dates").size(), id + ": " + returns);
            for (int i = 0; i < want.size(); i++) {
                assertEquals(want.get(i)[2], returns.path("dates").get(i).asText(), id);
                assertEquals(Double.parseDouble(want.get(i)[3]), returns.path("returns").get(i).asDouble(), TOLERANCE, id + " " + want.get(i)[2]);
            }
        }
    }

    @Test
    void aBetaOnAFactorOfTheSamePanelIsExtendedAfterItAndEqualsAFreshBuild() {
        assertEquals("succeeded", server.upload("/v1/panels/fixture/uploads", panelPart("2023-03-20", false)).path("state").asText());
        String market = "{\"panel\":\"fixture\",\"method\":\"market\",\"theme\":\"t\",\"rationale\":\"r\"}";
        server.awaitJob(server.putJson("/v1/factors/zz-market", market, ADMIN).json().path("job").asText());
        String lowBeta = "{\"panel\":\"fixture\",\"method\":\"sort\",\"direction\":\"low_minus_high\",\"theme\":\"t\","
                + "\"rationale\":\"r\",\"signal\":{\"trailing_beta\":{\"against\":\"zz-market\",\"periods\":15}}}";
        // named to sort before its dependency, so only dependency ordering makes the append use the extended market
        server.awaitJob(server.putJson("/v1/factors/aa-low-beta", lowBeta, ADMIN).json().path("job").asText());
        JsonNode append = server.upload("/v1/panels/fixture/uploads", panelPart("2023-03-20", true));
        assertEquals("succeeded", append.path("state").asText(), append.toString());
        JsonNode factors = append.path("report").path("factors");
        assertEquals("zz-market", factors.get(0).path("factor").asText(), factors.toString());
        TestServer.Reply fresh = server.putJson("/v1/factors/fresh-low-beta", lowBeta, ADMIN);
        assertEquals("succeeded", server.awaitJob(fresh.json().path("job").asText()).path("state").asText());
        JsonNode extended = server.get("/v1/factors/aa-low-beta/returns").json();
        JsonNode rebuilt = server.get("/v1/factors/fresh-low-beta/returns").json();
        assertTrue(rebuilt.path("dates").size() > 40, rebuilt.toString());
        assertEquals(rebuilt.path("dates"), extended.path("dates"));
        assertEquals(rebuilt.path("returns"), extended.path("returns"), "an append gives the bits of a full build");

        // a new version of the market factor rebuilds the low-beta factor that reads it
        TestServer.Reply redefined = server.putJson("/v1/factors/zz-market", market.replace("\"market\",", "\"market\",\"weighting\":\"equal\","), ADMIN);
        JsonNode job = server.awaitJob(redefined.json().path("job").asText());
        assertTrue(job.path("report").path("dependents").toString().contains("aa-low-beta"), job.toString());
        assertTrue(!server.get("/v1/factors/aa-low-beta/returns").json().path("returns").equals(extended.path("returns")),
                "the dependent was rebuilt on the new market returns");
    }

    private static String withText(JsonNode definition) {
        return ((com.fasterxml.jackson.databind.node.ObjectNode) definition.deepCopy()).put("theme", "test")
                .put("rationale", "fixture").toString();
    }

    @Test
    void theSameRecipeSpelledDifferentlyIsTheSameVersionAndAChangedParameterANewOne() {
        loadPanelAndFactor();
        String shortForm = "{\"panel\":\"fixture\",\"method\":\"sort\",\"theme\":\"t\",\"rationale\":\"r\","
                + "\"signal\":{\"rank\":{\"trailing_return\":{\"periods\":10}}}}";
        String longForm = "{\"panel\":\"fixture\",\"method\":\"sort\",\"theme\":\"t\",\"rationale\":\"r\","
                + "\"signal\":{\"rank\":{\"of\":{\"trailing_return\":{\"skip\":0,\"periods\":10}}}}}";
        TestServer.Reply first = server.putJson("/v1/factors/mom", shortForm, ADMIN);
        assertEquals(202, first.status(), first.body());
        server.awaitJob(first.json().path("job").asText());
        TestServer.Reply again = server.putJson("/v1/factors/mom", longForm, ADMIN);
        assertEquals(200, again.status(), again.body());
        assertEquals(1, again.json().path("version").asInt());
        TestServer.Reply changed = server.putJson("/v1/factors/mom", longForm.replace("\"periods\":10", "\"periods\":11"), ADMIN);
        assertEquals(202, changed.status(), changed.body());
        assertEquals(2, changed.json().path("version").asInt());
        JsonNode stored = server.get("/v1/factors/mom?version=1").json();
        assertEquals("{\"rank\":{\"of\":{\"trailing_return\":{\"periods\":10,\"skip\":0}}}}",
                stored.path("definition").path("signal").toString(), stored.toString());
    }

    private void assertDefinitionError(String signal, String expected) {
        String body = "{\"panel\":\"fixture\",\"method\":\"sort\",\"theme\":\"t\",\"rationale\":\"r\",\"signal\":" + signal + "}";
        TestServer.Reply r = server.putJson("/v1/factors/bad", body, ADMIN);
        assertProblem(r, 400);
        assertTrue(r.json().path("errors").toString().contains(expected), signal + " -> " + r.body());
    }

    @Test
    void everyRecipeProblemIsA400WithItsPath() {
        loadPanelAndFactor();
        assertDefinitionError("{\"combine\":[{\"weight\":1,\"of\":\"bm\"},{\"weight\":2,\"of\":{\"ratio\":[\"book_equty\",\"bm\"]}}]}",
                "signal.combine[1].of.ratio[0]: no column 'book_equty' in panel fixture; numeric columns are return, market_cap, bm, score");
        assertDefinitionError("{\"momentum\":{\"periods\":3}}", "signal: unknown operation 'momentum'");
        assertDefinitionError("{\"rank\":{\"of\":\"bm\",\"within\":\"region\"}}", "signal.rank.within: no label column 'region' in panel fixture");
        assertDefinitionError("\"sector\"", "signal: column 'sector' of panel fixture holds labels, not numbers");
        assertDefinitionError("{\"lag\":{\"of\":\"bm\",\"periods\":0}}", "signal.lag.periods: must be a whole number from 1 to 1300");
        assertDefinitionError("{\"lag\":{\"of\":\"bm\",\"periods\":\"3\"}}", "signal.lag.periods: must be a whole number");
        assertDefinitionError("{\"trailing_stdev\":{\"of\":\"bm\",\"periods\":1}}", "signal.trailing_stdev.periods: must be a whole number from 2");
        assertDefinitionError("{\"trailing_return\":{\"periods\":12,\"skip\":-1}}", "signal.trailing_return.skip");
        assertDefinitionError("{\"trailing_return\":{\"periods\":12,\"gap\":1}}", "signal.trailing_return.gap: unknown parameter");
        assertDefinitionError("{\"trailing_beta\":{\"against\":\"f\",\"periods\":10,\"min_periods\":2}}", "signal.trailing_beta.min_periods");
        assertDefinitionError("{\"trailing_beta\":{\"against\":\"nope\",\"periods\":10}}", "signal.trailing_beta.against: no factor 'nope'");
        assertDefinitionError("{\"trailing_beta\":{\"against\":\"bad\",\"periods\":10}}", "signal.trailing_beta.against: a factor cannot read its own returns");
        assertDefinitionError("{\"winsorize\":{\"of\":\"bm\",\"lower\":0.9,\"upper\":0.1}}", "signal.winsorize: needs 0 <= lower < upper <= 1");
        assertDefinitionError("{\"combine\":[]}", "signal.combine: must be an array of 1 to 20 terms");
        assertDefinitionError("{\"ratio\":[\"bm\"]}", "signal.ratio: must be an array of two signals");
        assertDefinitionError("{\"demean\":{\"of\":\"bm\"}}", "signal.demean.within: is required");
        assertDefinitionError("{\"log\":\"bm\",\"rank\":\"bm\"}", "signal: a signal is a column name or an object with exactly one key");
        assertDefinitionError("{\"trailing_return\":{\"periods\":1300,\"skip\":100}}", "signal: the recipe reads 1399 grid dates back; at most 1300");

        TestServer.Reply bad = server.get("/v1/panels/fixture/signals?signal=" + encode("{\"zscore\":{\"of\":\"bm\",\"within\":\"nope\"}}"));
        assertProblem(bad, 400);
        assertTrue(bad.body().contains("signal.zscore.within: no label column 'nope'"), bad.body());
        assertProblem(server.get("/v1/panels/fixture/signals?signal=" + encode("{\"rank\":")), 400);
        assertProblem(server.get("/v1/panels/fixture/signals"), 400);
        assertProblem(server.get("/v1/panels/fixture/signals?signal=bm&date=2023-01-01"), 400);
        assertProblem(server.get("/v1/panels/fixture/signals?signal=bm&date=yesterday"), 400);
        assertProblem(server.get("/v1/panels/nowhere/signals?signal=bm"), 404);
    }

    @Test
    void aFactorCannotReadItselfThroughOthers() {
        loadPanelAndFactor();
        String a = "{\"panel\":\"fixture\",\"method\":\"sort\",\"theme\":\"t\",\"rationale\":\"r\","
                + "\"signal\":{\"trailing_beta\":{\"against\":\"f\",\"periods\":10}}}";
        server.awaitJob(server.putJson("/v1/factors/a", a, ADMIN).json().path("job").asText());
        String b = a.replace("\"f\"", "\"a\"");
        server.awaitJob(server.putJson("/v1/factors/b", b, ADMIN).json().path("job").asText());
        TestServer.Reply cycle = server.putJson("/v1/factors/a", a.replace("\"f\"", "\"b\""), ADMIN);
        assertProblem(cycle, 400);
        assertTrue(cycle.body().contains("signal.trailing_beta.against: factor 'b' reads 'a' itself"), cycle.body());
        TestServer.Reply throughRiskFree = server.putJson("/v1/factors/a", "{\"panel\":\"fixture\",\"method\":\"market\","
                + "\"risk_free\":\"b\",\"theme\":\"t\",\"rationale\":\"r\"}", ADMIN);
        assertProblem(throughRiskFree, 400);
        assertTrue(throughRiskFree.body().contains("risk_free: factor 'b' reads 'a' itself"), throughRiskFree.body());
    }
}
