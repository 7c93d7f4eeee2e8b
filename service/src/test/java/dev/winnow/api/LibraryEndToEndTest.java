package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.io.InputStream;
import java.net.http.HttpRequest;
import java.time.DayOfWeek;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.TreeSet;

import static dev.winnow.api.TestServer.ADMIN;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The risk system's reads over HTTP: the aligned download of several factors checked value by value against the
 * single-factor endpoint of each, and the factor covariance of uploaded series checked against the numpy script
 * service/src/test/scripts/covariance_risk_fixture.py (fixtures/covariance_risk.json: numpy.cov for equal weights
 * without lags, the script's numpy implementation otherwise).
 */
class LibraryEndToEndTest {
    static TestServer server;
    static final ObjectMapper MAPPER = new ObjectMapper();
    static JsonNode fixture;

    @BeforeAll
    static void start() throws IOException {
        server = new TestServer();
        Random random = new Random(11);
        // two daily series with their own gaps, and one monthly series
        TreeMap<LocalDate, Double> da = new TreeMap<>();
        TreeMap<LocalDate, Double> db = new TreeMap<>();
        LocalDate d = LocalDate.of(2020, 1, 1);
        for (int t = 0; t < 120; t++) {
            if (random.nextInt(10) != 0) {
                da.put(d, Math.round(random.nextGaussian() * 1e6) / 1e8);
            }
            if (t > 3 && random.nextInt(7) != 0) {
                db.put(d, Math.round(random.nextGaussian() * 1e6) / 1e8);
            }
            d = d.getDayOfWeek() == DayOfWeek.FRIDAY ? d.plusDays(3) : d.plusDays(1);
        }
        external("da", da);
        external("db", db);
        TreeMap<LocalDate, Double> mc = new TreeMap<>();
        double[] monthly = {0.01, -0.02, 0.03, 0.005};
        for (int i = 0; i < monthly.length; i++) {
            mc.put(AnalyticsEndToEndTest.monthEnds(2019, 11, 4).get(i), monthly[i]);
        }
        external("mc", mc);

        try (InputStream in = LibraryEndToEndTest.class.getResourceAsStream("/fixtures/covariance_risk.json")) {
            fixture = MAPPER.readTree(in);
        }
        JsonNode returns = fixture.get("returns");
        List<LocalDate> months = AnalyticsEndToEndTest.monthEnds(2010, 1, returns.size());
        for (int k = 0; k < 4; k++) {
            TreeMap<LocalDate, Double> series = new TreeMap<>();
            for (int t = 0; t < returns.size(); t++) {
                series.put(months.get(t), returns.get(t).get(k).asDouble());
            }
            external("cov" + k, series);
        }
    }

    @AfterAll
    static void stop() throws IOException {
        server.close();
    }

    static void external(String name, Map<LocalDate, Double> series) {
        AnalyticsEndToEndTest.external(server, name, series);
    }

    /** Date -> value of a single-factor answer. */
    static Map<String, Double> single(String path) {
        JsonNode body = FiniteJson.ok(server, path);
        Map<String, Double> out = new HashMap<>();
        for (int i = 0; i < body.get("dates").size(); i++) {
            out.put(body.get("dates").get(i).asText(), body.get("returns").get(i).asDouble());
        }
        return out;
    }

    /** Every aligned value equals the single-factor endpoint's value at that date, or is null where it has none. */
    static void assertAlignedAgreesWithSingles(String query, List<String> names, String singleQuery, boolean inner) {
        JsonNode body = FiniteJson.ok(server, "/v1/returns?factors=" + String.join(",", names) + query);
        TreeSet<String> expectedDates = null;
        List<Map<String, Double>> singles = new ArrayList<>();
        for (String name : names) {
            Map<String, Double> s = single("/v1/factors/" + name + "/returns?" + singleQuery);
            singles.add(s);
            if (expectedDates == null) {
                expectedDates = new TreeSet<>(s.keySet());
            } else if (inner) {
                expectedDates.retainAll(s.keySet());
            } else {
                expectedDates.addAll(s.keySet());
            }
        }
        List<String> dates = new ArrayList<>();
        body.get("dates").forEach(n -> dates.add(n.asText()));
        assertEquals(new ArrayList<>(expectedDates), dates, query);
        for (int i = 0; i < names.size(); i++) {
            JsonNode column = body.get("returns").get(names.get(i));
            assertEquals(dates.size(), column.size());
            for (int t = 0; t < dates.size(); t++) {
                Double want = singles.get(i).get(dates.get(t));
                if (want == null) {
                    assertTrue(column.get(t).isNull(), names.get(i) + " at " + dates.get(t));
                } else {
                    assertEquals(want, column.get(t).asDouble(), 0.0, names.get(i) + " at " + dates.get(t) + " " + query);
                }
            }
            assertEquals(names.get(i), body.get("factors").get(i).get("name").asText());
        }
        assertEquals(inner ? "inner" : "outer", body.get("join").asText());
    }

    @Test
    void alignedDownloadEqualsTheSingleFactorEndpointsValueByValue() {
        assertAlignedAgreesWithSingles("", List.of("da", "db"), "", false);
        assertAlignedAgreesWithSingles("&join=inner", List.of("da", "db"), "", true);
        assertAlignedAgreesWithSingles("&from=2020-02-10&to=2020-04-30", List.of("db", "da"), "from=2020-02-10&to=2020-04-30", false);
        assertAlignedAgreesWithSingles("&frequency=weekly&form=cumulative", List.of("da", "db"), "frequency=weekly&form=cumulative", false);
        assertAlignedAgreesWithSingles("&frequency=monthly", List.of("da", "db", "mc"), "frequency=monthly", false);
        assertAlignedAgreesWithSingles("&frequency=monthly&join=inner", List.of("mc", "da"), "frequency=monthly", true);
        JsonNode body = FiniteJson.ok(server, "/v1/returns?factors=da,mc&frequency=monthly");
        assertEquals("monthly", body.get("frequency").asText());
        assertEquals(1, body.get("factors").get(0).get("version").asInt());
        assertTrue(body.get("factors").get(0).get("data_version").asLong() >= 1);
    }

    @Test
    void csvHasOneColumnPerFactorAndEmptyCellsForNull() {
        JsonNode json = FiniteJson.ok(server, "/v1/returns?factors=da,db");
        TestServer.Reply csv = server.get("/v1/returns?factors=da,db&format=csv");
        assertEquals(200, csv.status(), csv.body());
        assertTrue(csv.header("Content-Type").startsWith("text/csv"));
        String[] lines = csv.body().split("\n");
        assertEquals("date,da,db", lines[0]);
        assertEquals(json.get("dates").size() + 1, lines.length);
        for (int t = 0; t < json.get("dates").size(); t++) {
            String[] cells = lines[t + 1].split(",", -1);
            assertEquals(json.get("dates").get(t).asText(), cells[0]);
            for (int i = 0; i < 2; i++) {
                JsonNode v = json.get("returns").get(i == 0 ? "da" : "db").get(t);
                assertEquals(v.isNull() ? "" : String.valueOf(v.asDouble()), cells[i + 1].isEmpty() ? "" : String.valueOf(Double.parseDouble(cells[i + 1])));
            }
        }
    }

    @Test
    void mixedFrequenciesWithoutAFrequencyAreA400NamingThem() {
        TestServer.Reply r = server.get("/v1/returns?factors=da,mc");
        FiniteJson.problem(r, 400, "mixed");
        String detail = r.json().get("detail").asText();
        assertTrue(detail.contains("daily: da") && detail.contains("monthly: mc") && detail.contains("frequency=monthly"), detail);
        FiniteJson.problem(server.get("/v1/returns?factors=mc&frequency=daily"), 400, "finer");
        FiniteJson.problem(server.get("/v1/returns?factors=nope"), 400, "unknown");
        FiniteJson.problem(server.get("/v1/returns?factors=da,da"), 400, "twice");
        FiniteJson.problem(server.get("/v1/returns?factors=da&join=left"), 400, "join");
    }

    @Test
    void everyLiveFactorByDefault() {
        JsonNode body = FiniteJson.ok(server, "/v1/returns?frequency=monthly");
        List<String> names = new ArrayList<>();
        body.get("factors").forEach(f -> names.add(f.get("name").asText()));
        assertTrue(names.containsAll(List.of("cov0", "cov1", "cov2", "cov3", "da", "db", "mc")), names.toString());
    }

    @Test
    void etagAnswers304AndChangesWithAnAppend() {
        server.putJson("/v1/factors/grow", "{\"method\":\"external\"}", ADMIN);
        server.upload("/v1/factors/grow/uploads", "date,return\n2021-01-29,0.01\n2021-02-26,0.02\n");
        String path = "/v1/returns?factors=grow,mc&frequency=monthly";
        TestServer.Reply first = server.get(path);
        String etag = first.header("ETag");
        TestServer.Reply again = server.send(server.request(path, ADMIN).header("If-None-Match", etag).GET());
        assertEquals(304, again.status());
        JsonNode job = server.upload("/v1/factors/grow/uploads", "date,return\n2021-03-31,0.03\n");
        assertEquals("succeeded", job.path("state").asText());
        TestServer.Reply after = server.send(server.request(path, ADMIN).header("If-None-Match", etag).GET());
        assertEquals(200, after.status(), "the append is visible at once");
        assertNotEquals(etag, after.header("ETag"));
        assertTrue(after.body().contains("2021-03-31"), after.body());
        // the single-factor endpoint too, with no stale answer from memory
        assertTrue(server.get("/v1/factors/grow/returns").body().contains("2021-03-31"));
        // retiring drops it from the default list at once
        assertTrue(server.get("/v1/returns?frequency=monthly").body().contains("\"grow\""));
        assertEquals(204, server.delete("/v1/factors/grow", ADMIN).status());
        assertTrue(!server.get("/v1/returns?frequency=monthly").body().contains("\"grow\""));
    }

    @Test
    void gzipWhenAccepted() throws Exception {
        String path = "/v1/returns?factors=da,db";
        TestServer.Reply plain = server.get(path);
        java.net.http.HttpResponse<byte[]> zipped = java.net.http.HttpClient.newHttpClient().send(
                server.request(path, ADMIN).header("Accept-Encoding", "gzip").GET().build(),
                java.net.http.HttpResponse.BodyHandlers.ofByteArray());
        assertEquals("gzip", zipped.headers().firstValue("Content-Encoding").orElse(null));
        byte[] body = new java.util.zip.GZIPInputStream(new java.io.ByteArrayInputStream(zipped.body())).readAllBytes();
        assertEquals(plain.body(), new String(body, java.nio.charset.StandardCharsets.UTF_8));
        assertTrue(zipped.body().length < body.length / 2, "compressed");
    }

    @Test
    void covarianceAgreesWithTheNumpyScript() {
        int k = 4;
        for (JsonNode c : fixture.get("cases")) {
            String query = "/v1/covariance?factors=cov0,cov1,cov2,cov3&annualize=false&nw_lags=" + c.get("nw_lags").asInt()
                    + (c.get("half_life").isNull() ? "" : "&half_life=" + c.get("half_life").asDouble());
            JsonNode body = FiniteJson.ok(server, query);
            assertEquals(fixture.get("returns").size(), body.get("observations").asInt());
            assertEquals("monthly", body.get("frequency").asText());
            assertEquals("2010-01-31", body.get("first").asText());
            assertEquals(false, body.get("annualized").asBoolean());
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    double want = c.get("covariance").get(i).get(j).asDouble();
                    double scale = c.get("covariance").get(i).get(i).asDouble();
                    assertEquals(want, body.get("covariance").get(i).get(j).asDouble(), 1e-12 * scale, query + " " + c.get("source").asText());
                }
            }
            JsonNode annual = FiniteJson.ok(server, query.replace("annualize=false", "annualize=true"));
            assertEquals(12 * c.get("covariance").get(1).get(1).asDouble(), annual.get("covariance").get(1).get(1).asDouble(),
                    1e-11 * c.get("covariance").get(1).get(1).asDouble());
            assertEquals(Math.sqrt(12 * c.get("covariance").get(2).get(2).asDouble()), annual.get("volatility").get(2).asDouble(), 1e-10);
        }
    }

    /**
     * The last two months up to to=2010-03-31 (February and March 2010): with equal weights and n = 2 the covariance is
     * (a_2 - a_1)(b_2 - b_1) / 2 (mean in the middle, divisor n - 1 = 1), worked out here from the uploaded values.
     */
    @Test
    void windowAndToPickTheSample() {
        JsonNode r = fixture.get("returns");
        JsonNode body = FiniteJson.ok(server, "/v1/covariance?factors=cov0,cov1&to=2010-03-31&window=2&annualize=false");
        assertEquals("2010-02-28", body.get("first").asText());
        assertEquals("2010-03-31", body.get("last").asText());
        assertEquals(2, body.get("observations").asInt());
        double want = (r.get(2).get(0).asDouble() - r.get(1).get(0).asDouble()) * (r.get(2).get(1).asDouble() - r.get(1).get(1).asDouble()) / 2;
        assertEquals(want, body.get("covariance").get(0).get(1).asDouble(), 1e-15);
        TestServer.Reply csv = server.get("/v1/covariance?factors=cov0,cov1&to=2010-03-31&window=2&annualize=false&format=csv");
        String[] lines = csv.body().split("\n");
        assertEquals("cov0,cov1", lines[0]);
        assertEquals(want, Double.parseDouble(lines[1].split(",")[1]), 0.0);
        FiniteJson.problem(server.get("/v1/covariance?factors=cov0,cov1&to=2010-01-31"), 400, "one date");
        FiniteJson.problem(server.get("/v1/covariance?factors=cov0&window=3&to=2010-03-31&nw_lags=3"), 400, "lags");
        FiniteJson.problem(server.get("/v1/covariance?factors=cov0&half_life=0"), 400, "half-life");
        FiniteJson.problem(server.get("/v1/covariance"), 400, "no factors");
        FiniteJson.problem(server.get("/v1/covariance?factors=cov0,da"), 400, "mixed");
    }

    @Test
    void revokedTokenIsRefusedAtOnce() {
        JsonNode created = server.postJson("/v1/tokens", "{\"name\":\"feed\",\"scope\":\"read\"}", ADMIN).json();
        String token = created.get("token").asText();
        assertEquals(200, server.get("/v1/returns?factors=da", token).status());
        assertEquals(204, server.delete("/v1/tokens/feed", ADMIN).status());
        TestServer.assertProblem(server.get("/v1/returns?factors=da", token), 401);
    }
}
